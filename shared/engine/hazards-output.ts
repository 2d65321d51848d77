/**
 * Hazards of one solved state that concern what the bank delivers and what it holds live
 * (circuit-format.md 1.1): `backfeed`, `output-voltage` and `neutral-shift`.
 * Thresholds (circuit-format.md): a cut-off conductor held above 50 V (the voltage above which
 * NFPA 70E and IEC 60364 treat a conductor as a shock hazard, from memory); output readings
 * more than 10 % from their mean or from the nameplates; a floating star point moved more
 * than 10 % of the phase voltage.
 */
import type { BankEdge, SideGraph } from './bank'
import { classifyGroup, isClosedRing, nodeRoles, starOf } from './bank'
import { edgeDirections } from './bank-check'
import { nodeOfTerminal, type StageSolution, type Topology } from './network'
import type { BankProblem, Hazard } from './types'

export const BACKFEED_VOLTS = 50
export const OUTPUT_TOLERANCE = 0.1
export const NEUTRAL_SHIFT_LIMIT = 0.1

type C = [number, number]
const abs = (a: C) => Math.sqrt(a[0] * a[0] + a[1] * a[1])
const sub = (a: C, b: C): C => [a[0] - b[0], a[1] - b[1]]
const fmtV = (v: number) => `${v.toFixed(1)} V`

export interface OutputContext {
  topo: Topology
  sol: StageSolution
  open: ReadonlySet<string>
  merge: (n: number) => number
  graphs: { primary: SideGraph; secondary: SideGraph }
}

const V = (sol: StageSolution, node: number): C => (node < 0 ? [0, 0] : [sol.vRe[node]!, sol.vIm[node]!])

/** An open device whose far side the bank still holds live: "dead" by the switch, live by the bank. */
export function backfeedHazards(ctx: OutputContext): Hazard[] {
  const { topo, sol, merge } = ctx
  if (ctx.open.size === 0) return []
  const fed = new Set(topo.phases.map((p) => merge(p.line)))
  const hazards: Hazard[] = []
  const reported = new Set<number>()
  for (const pole of topo.poles) {
    if (!ctx.open.has(pole.device)) continue
    for (const side of [pole.a, pole.b]) {
      const group = merge(side)
      if (side < 0 || fed.has(group) || reported.has(group)) continue
      // the windings with an end on this cut-off conductor, and what they hold it at
      let worst = { volts: 0, unit: '', winding: '' }
      const units = new Set<string>()
      topo.units.forEach((u) => {
        for (const w of u.windings) {
          if (merge(w.a) !== group && merge(w.b) !== group) continue
          const volts = abs(sub(V(sol, w.a), V(sol, w.b)))
          if (volts > BACKFEED_VOLTS) units.add(u.id)
          if (volts > worst.volts) worst = { volts, unit: u.id, winding: w.name }
        }
      })
      if (worst.volts <= BACKFEED_VOLTS) continue
      reported.add(group)
      const device = topo.byId.get(pole.device)!
      const opened = device.kind === 'fuse' ? 'blown' : 'open'
      const terminal = topo.terminalNames[topo.terminalNodes.indexOf(side)] ?? pole.device
      hazards.push({
        code: 'backfeed',
        severity: 'danger',
        units: [pole.device, ...units],
        volts: worst.volts,
        message:
          `${pole.device} is ${opened}, but the conductor beyond it (${terminal}) is still live: ${worst.unit}'s winding ${worst.winding} holds ${fmtV(worst.volts)}, fed back through the bank from the other phases. ` +
          `Dead by the switch is not dead: open every source of the bank, then test for absence of voltage at the point of work before touching.`,
      })
    }
  }
  return hazards
}

/** The output block's line terminals that a jumper reaches, with their nodes. */
function outputLines(topo: Topology): { id: string; lines: { name: string; node: number }[]; n: number | null }[] {
  const out: { id: string; lines: { name: string; node: number }[]; n: number | null }[] = []
  for (const c of topo.circuit.components) {
    if (c.kind !== 'output') continue
    const wired = (t: string) => {
      const node = nodeOfTerminal(topo, `${c.id}.${t}`)!
      return node < 0 || topo.nodeTerminalCount[node]! > 1 ? node : undefined
    }
    const lines = ['a', 'b', 'c'].flatMap((t) => {
      const node = wired(t)
      return node === undefined ? [] : [{ name: t, node }]
    })
    out.push({ id: c.id, lines, n: wired('n') ?? null })
  }
  return out
}

/** The line-to-line voltage a correct bank of this wiring gives: from the nameplates (turns) and the supply. */
function nameplateLineVolts(ctx: OutputContext, group: BankEdge[]): number | null {
  const direction = edgeDirections(ctx.topo)
  let sum = 0
  for (const e of group) {
    const d = direction(e)
    if (!d) return null
    sum += abs(d)
  }
  const coil = sum / group.length
  const kind = classifyGroup(ctx.topo, group, ctx.merge)
  if (kind === 'delta' || kind === 'open-delta' || kind === 'single-phase') return coil
  if (kind === 'wye' || kind === 'open-wye') return coil * Math.sqrt(3)
  return null
}

/**
 * A three-phase output whose line-to-line readings differ from their mean by more than 10 %,
 * or that stand more than 10 % off the nameplates' value for the connection of the secondary
 * group it is wired to.
 */
export function outputVoltageHazards(ctx: OutputContext, problems: BankProblem[]): Hazard[] {
  const hazards: Hazard[] = []
  let groupAt: Map<number, BankEdge[]> | undefined
  for (const block of outputLines(ctx.topo)) {
    const lines = block.lines
    if (lines.length < 2) continue
    const volts: number[] = []
    for (let i = 0; i < lines.length; i++) {
      for (let j = i + 1; j < lines.length; j++) volts.push(abs(sub(V(ctx.sol, lines[i]!.node), V(ctx.sol, lines[j]!.node))))
    }
    const mean = volts.reduce((s, v) => s + v, 0) / volts.length
    if (mean < 1) continue // dead
    if (!groupAt) {
      groupAt = new Map()
      for (const g of ctx.graphs.secondary.groups) for (const e of g) groupAt.set(ctx.merge(e.from), g).set(ctx.merge(e.to), g)
    }
    const group = groupAt.get(ctx.merge(lines[0]!.node))
    const expected = group ? nameplateLineVolts(ctx, group) : null
    const unbalanced = volts.length === 3 && volts.some((v) => Math.abs(v - mean) > OUTPUT_TOLERANCE * mean)
    const off = expected !== null && volts.some((v) => Math.abs(v - expected) > OUTPUT_TOLERANCE * expected)
    if (!unbalanced && !off) continue
    const high = expected !== null && volts.some((v) => v > (1 + OUTPUT_TOLERANCE) * expected)
    const names: string[] = []
    for (let i = 0; i < lines.length; i++) for (let j = i + 1; j < lines.length; j++) names.push(`${lines[i]!.name}–${lines[j]!.name}`)
    const readings = volts.map((v, k) => `${names[k]} ${fmtV(v)}`).join(', ')
    const reversed = problems.find((p) => p.code === 'reversed-unit')
    const why = reversed
      ? `${reversed.message} `
      : 'Look for a unit connected backwards, a blown fuse or open pole on the primary, a unit on another tap or ratio, or a heavy unbalanced load. '
    hazards.push({
      code: 'output-voltage',
      severity: high ? 'danger' : 'caution',
      units: [block.id, ...(reversed?.units ?? [])],
      volts: Math.max(...volts),
      message:
        `The output ${block.id} reads ${readings}` +
        (expected !== null ? `, where the nameplates give ${fmtV(expected)} line to line. ` : ', which are not one balanced set. ') +
        why +
        (high ? 'Loads connected here would see the overvoltage: do not connect them until the readings are right.' : 'Three-phase loads on it would run unbalanced.'),
    })
  }
  return hazards
}

/** The common point of each wye winding set that nothing holds, moved more than 10 % of the phase voltage. */
export function neutralShiftHazards(ctx: OutputContext): Hazard[] {
  const { topo, sol, merge } = ctx
  const hazards: Hazard[] = []
  const ground = merge(-1)
  const closedDeltaUnits = (graph: SideGraph) => {
    const held = new Set<string>()
    for (const g of graph.groups) {
      if (g.length === 3 && classifyGroup(topo, g, merge) === 'delta' && isClosedRing(g, merge)) for (const e of g) held.add(e.unit)
    }
    return held
  }
  const sides = [
    { name: 'primaries', graph: ctx.graphs.primary, other: closedDeltaUnits(ctx.graphs.secondary) },
    { name: 'secondaries', graph: ctx.graphs.secondary, other: closedDeltaUnits(ctx.graphs.primary) },
  ]
  for (const side of sides) {
    for (const group of side.graph.groups) {
      if (group.length !== 3 || classifyGroup(topo, group, merge) !== 'wye') continue
      const centre = starOf(group, merge)
      if (centre === null || centre === ground) continue
      if (group.every((e) => side.other.has(e.unit))) continue // a closed delta on the other side holds it
      const rawCentre = merge(group[0]!.from) === centre ? group[0]!.from : group[0]!.to
      if (nodeRoles(topo, rawCentre).grounded) continue
      const outer = group.map((e) => (merge(e.from) === centre ? e.to : e.from)).map((n) => V(sol, n))
      const middle: C = [(outer[0]![0] + outer[1]![0] + outer[2]![0]) / 3, (outer[0]![1] + outer[1]![1] + outer[2]![1]) / 3]
      const line = (abs(sub(outer[0]!, outer[1]!)) + abs(sub(outer[1]!, outer[2]!)) + abs(sub(outer[2]!, outer[0]!))) / 3
      if (line < 1) continue
      const phase = line / Math.sqrt(3)
      const shift = abs(sub(V(sol, rawCentre), middle))
      if (shift <= NEUTRAL_SHIFT_LIMIT * phase) continue
      const units = [...new Set(group.map((e) => e.unit))]
      hazards.push({
        code: 'neutral-shift',
        severity: 'caution',
        units,
        volts: shift,
        message:
          `The star point of ${units.join(', ')}'s ${side.name} is held by nothing (not grounded, no closed delta on the other side) and has moved ${fmtV(shift)} from the centre of its ${fmtV(line)} line voltages ` +
          `(${Math.round((shift / phase) * 100)} % of the ${fmtV(phase)} phase voltage): the three units see unequal voltages, some above rating. ` +
          `A floating wye cannot carry line-to-neutral load; bond the star point to the supply neutral, or close a delta on the other side.`,
      })
    }
  }
  return hazards
}
