/**
 * Whether the bank the wiring makes is a proper three-phase connection, read from the wiring
 * alone (energized or not): each unit's secondary is given the direction its primary's
 * supply lines would give it, and the units of each delta, wye, open delta or open wye must
 * then make a three-phase set: around a delta the coils cancel, out of a wye star point they
 * cancel, and the two units of an open connection stand 120° apart. A unit that would make
 * it right if turned round is named as reversed; a unit whose coils are not joined, or whose
 * secondary is off on its own, is named as open.
 */
import type { BankEdge, SideGraph } from './bank'
import { classifyGroup, contactMerge, unitCoilMode } from './bank'
import type { Topology } from './network'
import type { BankProblem } from './types'

type C = [number, number]
const addc = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]]
const sub = (a: C, b: C): C => [a[0] - b[0], a[1] - b[1]]
const scale = (a: C, k: number): C => [a[0] * k, a[1] * k]
const abs = (a: C) => Math.hypot(a[0], a[1])

/** a set that cancels to within this share of one unit's voltage counts as cancelling */
const CANCEL = 0.05
/** how close to the expected spread the two units of an open connection must be */
const OPEN_SPREAD = 0.1

/** The nominal potential of each node as the supply would drive it, through every contact closed. */
function nominalPotentials(topo: Topology): (node: number) => C | null {
  const all = contactMerge(topo, new Set())
  const potential = new Map<number, C>()
  for (const p of topo.phases) {
    potential.set(all(p.line), [p.emf.re, p.emf.im])
    potential.set(all(p.star), [0, 0])
  }
  // an ungrounded star point of two or more primaries sits at the middle of the supply
  const starCount = new Map<number, number>()
  for (const u of topo.units) for (const n of [u.windings[0]!.a, u.windings[0]!.b]) starCount.set(all(n), (starCount.get(all(n)) ?? 0) + 1)
  return (node) => {
    const m = all(node)
    return potential.get(m) ?? ((starCount.get(m) ?? 0) >= 2 ? [0, 0] : null)
  }
}

/** nominalPotentials, worked out once per topology (they depend on the wiring alone). */
export function nominalPotentialsOf(topo: Topology): (node: number) => C | null {
  return (topo.nominalCache ??= nominalPotentials(topo)) as (node: number) => C | null
}

/**
 * The open-circuit EMF of each secondary edge (dot minus undot) as the supply's EMFs and the
 * wiring put it, or null when its unit is not fed: what the unit drives whatever the load or
 * a fault does to its terminal voltages.
 */
export function edgeDirections(topo: Topology): (e: BankEdge) => C | null {
  const at = nominalPotentialsOf(topo)
  return (e) => {
    const unit = topo.unitById.get(e.unit)!
    const primary = unit.windings[0]!
    const a = at(primary.a)
    const b = at(primary.b)
    if (!a || !b) return null
    const perTurn = scale(sub(a, b), 1 / primary.turns)
    if (abs(perTurn) === 0) return null
    return scale(perTurn, e.windings.reduce((s, w) => s + unit.windings[w]!.turns, 0))
  }
}

/** Each edge of a group with the sign that walks it around the delta or out of the star point. */
function orientedSet(group: BankEdge[], merge: (n: number) => number, kind: string): { edge: BankEdge; sign: 1 | -1 }[] | null {
  const degree = new Map<number, number>()
  for (const e of group) for (const n of [merge(e.from), merge(e.to)]) degree.set(n, (degree.get(n) ?? 0) + 1)
  if (kind === 'wye' || kind === 'open-wye') {
    const centre = [...degree].find(([, d]) => d === group.length)?.[0]
    if (centre === undefined) return null
    // outward from the star point: V(outer) − V(centre)
    return group.map((edge) => ({ edge, sign: merge(edge.to) === centre ? 1 : -1 }))
  }
  // a delta, closed or with one corner open, or an open delta: walk it end to end
  let at = [...degree].find(([, d]) => d === 1)?.[0] ?? merge(group[0]!.from)
  const left = [...group]
  const path: { edge: BankEdge; sign: 1 | -1 }[] = []
  while (left.length) {
    const i = left.findIndex((e) => merge(e.from) === at || merge(e.to) === at)
    if (i < 0) return null
    const edge = left.splice(i, 1)[0]!
    const sign = merge(edge.from) === at ? 1 : -1
    path.push({ edge, sign })
    at = sign === 1 ? merge(edge.to) : merge(edge.from)
  }
  return path
}

/** Whether a set of oriented unit voltages is the three-phase set the connection needs. */
function isProper(kind: string, v: C[]): boolean {
  const mean = v.reduce((s, x) => s + abs(x), 0) / v.length
  if (mean === 0) return true
  if (kind === 'delta' || kind === 'wye') return abs(v.reduce(addc, [0, 0])) <= CANCEL * mean
  // open delta: walked end to end, the two add up to a third of the same size (120° apart);
  // open wye: out of the star point, the two are √3 × apart (120° apart as well)
  const spread = kind === 'open-delta' ? abs(addc(v[0]!, v[1]!)) : abs(sub(v[0]!, v[1]!)) / Math.sqrt(3)
  const sameSize = Math.abs(abs(v[0]!) - abs(v[1]!)) <= OPEN_SPREAD * mean
  return sameSize && Math.abs(spread - mean) <= OPEN_SPREAD * mean
}

const NAMED = new Set(['delta', 'wye', 'open-delta', 'open-wye'])

function checkSecondary(topo: Topology, graph: SideGraph, merge: (n: number) => number): BankProblem[] {
  const problems: BankProblem[] = []
  const open = new Set<string>()
  for (const unit of topo.units) {
    // both coils in use but joined neither in series nor in parallel
    if (unit.windings.length >= 3 && unitCoilMode(topo, unit) === 'other') open.add(unit.id)
  }
  // a unit's secondary on its own beside a bank of the others
  const biggest = Math.max(0, ...graph.groups.map((g) => g.length))
  if (biggest >= 2) for (const g of graph.groups) if (g.length === 1) open.add(g[0]!.unit)
  for (const id of open) {
    problems.push({
      code: 'open-coil',
      side: 'secondary',
      units: [id],
      message: `${id}'s secondary is open: ${unitCoilMode(topo, topo.unitById.get(id)!) === 'other' ? 'its two coils are joined neither in series nor in parallel' : 'it is not joined to the rest of the bank'}.`,
    })
  }
  const direction = edgeDirections(topo)
  for (const group of graph.groups) {
    if (group.some((e) => open.has(e.unit))) continue
    const kind = classifyGroup(topo, group, merge)
    if (!NAMED.has(kind)) continue
    const path = orientedSet(group, merge, kind)
    const directions = group.map(direction)
    if (!path || directions.some((d) => d === null)) continue
    const v = path.map(({ edge, sign }) => scale(direction(edge)!, sign))
    if (isProper(kind, v)) continue
    const turned = v.map((_, k) => isProper(kind, v.map((x, j) => (j === k ? scale(x, -1) : x))))
    const reversed = path.filter((_, k) => turned[k]).map(({ edge }) => edge.unit)
    if (reversed.length > 0) {
      problems.push({
        code: 'reversed-unit',
        side: 'secondary',
        units: reversed,
        message:
          reversed.length === 1
            ? `${reversed[0]} is connected backwards: its secondary leads are the wrong way round for this ${kind.replace('-', ' ')}.`
            : `${reversed.join(' or ')} is connected backwards: with two units either one turned round would make it right.`,
      })
    } else {
      problems.push({
        code: 'not-three-phase',
        side: 'secondary',
        units: group.map((e) => e.unit),
        message: `${[...new Set(group.map((e) => e.unit))].join(', ')} do not make a three-phase set: check that they are fed from different pairs of lines in rotation, with the same ratio and coils.`,
      })
    }
  }
  return problems
}

/**
 * What keeps the bank from being a proper connection; empty when it is one (or is a single
 * unit). `primary` and `secondary` are the connections `classifySide` read.
 */
export function bankProblems(topo: Topology, graphs: { primary: SideGraph; secondary: SideGraph }, merge: (n: number) => number, primary: string, secondary: string): BankProblem[] {
  if (topo.units.length === 0) return []
  const problems = checkSecondary(topo, graphs.secondary, merge)
  if (primary === 'other') {
    problems.push({ code: 'not-three-phase', side: 'primary', units: topo.units.map((u) => u.id), message: 'The primaries make no delta or wye: check which lines each H1 and H2 goes to.' })
  }
  if (secondary === 'other' && !problems.some((p) => p.side === 'secondary')) {
    problems.push({ code: 'not-three-phase', side: 'secondary', units: topo.units.map((u) => u.id), message: 'The secondaries make no delta or wye: check the jumpers between the X terminals.' })
  }
  return problems
}
