/**
 * Will a fuse or breaker open on the units' energizing inrush? Inrush is taken as 12 × the
 * full-load current for 0.1 s (common practice, see protection.ts); the full-load current
 * through a device is that of the unit primaries on its far side at their rated current and
 * unity power factor, added as phasors along the voltages the wiring puts on them (two delta
 * windings on one line give √3 × one, as a balanced delta does).
 *
 * With every fuse and breaker open the network falls into islands (joined by wires only);
 * each pole joins two of them. Where the poles make a tree out from the supply (as a radial
 * feeder does) one pass gives each pole's far side: its subtree. Where they make a loop (two
 * banks tied together) each device's far side is found by joining every other pole.
 */
import { nominalPotentialsOf } from './bank-check'
import type { Topology } from './network'
import { curveOf, INRUSH_MULTIPLE, INRUSH_SECONDS, operatingTime } from './protection'
import type { EnergizingCaution } from './types'

/** Above this many devices the check is skipped where the devices make a loop (one regrouping per device). */
export const INRUSH_DEVICE_LIMIT = 200

interface Primary {
  unit: string
  a: number
  b: number
  re: number
  im: number
}

export function inrushCautions(topo: Topology, hz: number): EnergizingCaution[] {
  if (topo.units.length === 0 || topo.poles.length === 0) return []
  const devices = topo.circuit.components.filter((c) => c.kind === 'fuse' || (c.kind === 'breaker' && c.trips))
  if (devices.length === 0) return []
  const at = nominalPotentialsOf(topo)
  // with every fuse and breaker open, each node (wires already joined) is an island of its
  // own; ground is island nodeCount
  const count = topo.nodeCount + 1
  const islandOf = (node: number) => (node < 0 ? topo.nodeCount : node)
  const poleA = topo.poles.map((p) => islandOf(p.a))
  const poleB = topo.poles.map((p) => islandOf(p.b))
  const lineIslands = topo.phases.map((p) => islandOf(p.line))
  const primaries: Primary[] = []
  for (const u of topo.units) {
    const w = u.windings[0]!
    const a = at(w.a)
    const b = at(w.b)
    if (!a || !b) continue
    const d0 = a[0] - b[0]
    const d1 = a[1] - b[1]
    const size = Math.hypot(d0, d1)
    if (size === 0) continue
    primaries.push({ unit: u.id, a: islandOf(w.a), b: islandOf(w.b), re: (w.ratedAmps * d0) / size, im: (w.ratedAmps * d1) / size })
  }
  const far = farSides(count, poleA, poleB, lineIslands, primaries, topo, devices.length)
  if (!far) return []
  const polesOf = new Map<string, number[]>()
  topo.poles.forEach((pole, k) => {
    const list = polesOf.get(pole.device)
    if (list) list.push(k)
    else polesOf.set(pole.device, [k])
  })
  const cautions: EnergizingCaution[] = []
  for (const device of devices) {
    if (device.kind !== 'fuse' && device.kind !== 'breaker') continue
    let worstAmps = 0
    let worstPole: ReturnType<FarSide> = null
    for (const k of polesOf.get(device.id) ?? []) {
      const f = far(k)
      if (!f) continue
      const amps = INRUSH_MULTIPLE * Math.hypot(f.re, f.im)
      if (amps > worstAmps) {
        worstAmps = amps
        worstPole = f
      }
    }
    if (worstAmps === 0 || !worstPole) continue
    const op = operatingTime(curveOf(device), device.amps, worstAmps, hz)
    if (!op || op.seconds > INRUSH_SECONDS) continue
    const worst = { amps: worstAmps, units: (worstPole as NonNullable<ReturnType<FarSide>>).units() }
    const what = device.kind === 'fuse' ? `${device.curve} fuse` : 'breaker'
    cautions.push({
      code: 'inrush',
      severity: 'caution',
      units: [device.id, ...worst.units],
      amps: Math.round(worst.amps * 10) / 10,
      seconds: Math.round(op.seconds * 1e4) / 1e4,
      message:
        `${device.id} (${device.amps} A ${what}) may open on energizing: the inrush of ${worst.units.join(', ')} is about ${worst.amps.toFixed(0)} A ` +
        `(12 × full-load for 0.1 s, a rule of thumb) and it would ${device.kind === 'fuse' ? 'blow' : 'trip'} in about ${(op.seconds * 1000).toFixed(0)} ms. ` +
        `A time-delay fuse sized by NEC 450.3(B) rides through inrush; check the device's class and rating against the maker's curve.`,
    })
  }
  return cautions
}

type FarSide = (pole: number) => { re: number; im: number; units: () => string[] } | null

/** For each pole, the full-load current phasor of the primaries beyond it, or null when it has no far side. */
function farSides(count: number, poleA: number[], poleB: number[], lines: number[], primaries: Primary[], topo: Topology, deviceCount: number): FarSide | null {
  // islands' own contributions: + where a primary's H1 end is, − where its H2 end is
  const ownRe = new Array<number>(count).fill(0)
  const ownIm = new Array<number>(count).fill(0)
  for (const p of primaries) {
    ownRe[p.a]! += p.re
    ownIm[p.a]! += p.im
    ownRe[p.b]! -= p.re
    ownIm[p.b]! -= p.im
  }
  // the poles at each island, as one list (CSR): adjStart[i] .. adjStart[i + 1]
  const adjStart = new Array<number>(count + 1).fill(0)
  for (let k = 0; k < poleA.length; k++) {
    if (poleA[k] === poleB[k]) continue
    adjStart[poleA[k]! + 1]!++
    adjStart[poleB[k]! + 1]!++
  }
  for (let i = 0; i < count; i++) adjStart[i + 1]! += adjStart[i]!
  const fill = adjStart.slice(0, count)
  const adjacent = new Array<number>(adjStart[count]!)
  for (let k = 0; k < poleA.length; k++) {
    if (poleA[k] === poleB[k]) continue
    adjacent[fill[poleA[k]!]!++] = k
    adjacent[fill[poleB[k]!]!++] = k
  }
  // breadth first from the supply's islands: each reached island's pole to its parent
  const parentPole = new Array<number>(count).fill(-2)
  const order: number[] = []
  for (const l of lines) {
    if (parentPole[l] !== -2) continue
    parentPole[l] = -1
    order.push(l)
  }
  let loop = false
  for (let q = 0; q < order.length && !loop; q++) {
    const i = order[q]!
    for (let e = adjStart[i]!; e < adjStart[i + 1]!; e++) {
      const k = adjacent[e]!
      if (k === parentPole[i]) continue
      const j = poleA[k] === i ? poleB[k]! : poleA[k]!
      if (parentPole[j] !== -2) {
        loop = true
        break
      }
      parentPole[j] = k
      order.push(j)
    }
  }
  if (loop) return deviceCount <= INRUSH_DEVICE_LIMIT ? regroupedFarSides(count, poleA, poleB, lines, primaries, topo) : null
  const sumRe = ownRe
  const sumIm = ownIm
  for (let q = order.length - 1; q >= 0; q--) {
    const i = order[q]!
    const k = parentPole[i]!
    if (k < 0) continue
    const parent = poleA[k] === i ? poleB[k]! : poleA[k]!
    sumRe[parent]! += sumRe[i]!
    sumIm[parent]! += sumIm[i]!
  }
  /** the islands below `child` in the tree: those whose chain of parents reaches it */
  const below = (child: number) => {
    const inside = new Set<number>([child])
    for (const i of order) {
      const k = parentPole[i]!
      if (k < 0) continue
      const parent = poleA[k] === i ? poleB[k]! : poleA[k]!
      if (inside.has(parent)) inside.add(i)
    }
    return inside
  }
  const childOf = (k: number): number | null => {
    const a = poleA[k]!
    const b = poleB[k]!
    if (parentPole[b] === k) return b
    if (parentPole[a] === k) return a
    return null
  }
  return (k) => {
    const child = childOf(k)
    if (child === null) return null
    return {
      re: sumRe[child]!,
      im: sumIm[child]!,
      units: () => {
        const inside = below(child)
        return primaries.filter((p) => inside.has(p.a) !== inside.has(p.b)).map((p) => p.unit)
      },
    }
  }
}

/** The far side of each pole with every other device's poles closed: where devices make a loop. */
function regroupedFarSides(count: number, poleA: number[], poleB: number[], lines: number[], primaries: Primary[], topo: Topology): FarSide {
  const parent = new Array<number>(count)
  const find = (x: number): number => {
    while (parent[x] !== x) x = parent[x] = parent[parent[x]!]!
    return x
  }
  return (k) => {
    const device = topo.poles[k]!.device
    for (let i = 0; i < count; i++) parent[i] = i
    for (let j = 0; j < poleA.length; j++) if (topo.poles[j]!.device !== device) parent[find(poleA[j]!)] = find(poleB[j]!)
    const fed = new Set(lines.map(find))
    const sides = [poleA[k]!, poleB[k]!].map(find).filter((g) => !fed.has(g))
    if (sides.length !== 1) return null
    const side = sides[0]!
    let re = 0
    let im = 0
    const units: string[] = []
    for (const p of primaries) {
      const sign = (find(p.a) === side ? 1 : 0) - (find(p.b) === side ? 1 : 0)
      if (sign === 0) continue
      re += sign * p.re
      im += sign * p.im
      units.push(p.unit)
    }
    return { re, im, units: () => units }
  }
}
