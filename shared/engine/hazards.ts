/**
 * Hazards of one solved state, each in plain words: what would happen and what to check.
 * Thresholds:
 * - closing check: a gap reading above 5 % of the coil voltage fails (common practice of the
 *   trade: a correct delta reads near 0 V across its last corner; no published limit);
 * - winding-overvoltage: above 110 % of rated voltage (the IEEE C57.12.00 limit for operation
 *   above rated voltage at no load is 110 %, from memory);
 * - fault-current: a winding at 3 × its rated current or more, or a fuse or breaker in its
 *   instantaneous region (our threshold for "far above rating");
 * - overload: a winding above 105 % of rated current, or a fuse or breaker in its inverse-time
 *   region (it would open in seconds to minutes).
 */
import type { BankEdge, DeltaLoop, SideGraph } from './bank'
import { edgeDirections } from './bank-check'
import { nodeOfTerminal, type StageSolution, type Topology, type Unit } from './network'
import { curveOf, operatingTime } from './protection'
import type { ClosingCheck, Hazard } from './types'

export const CLOSING_TOLERANCE = 0.05
export const OVERVOLTAGE_LIMIT = 1.1
export const FAULT_MULTIPLE = 3
export const OVERLOAD_LIMIT = 1.05
/** a fuse or breaker at 10 × its rating carries a fault, whatever its curve does with it */
export const INSTANTANEOUS_HAZARD_MULTIPLE = 10

type C = [number, number]
const sub = (a: C, b: C): C => [a[0] - b[0], a[1] - b[1]]
const addc = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]]
const scale = (a: C, k: number): C => [a[0] * k, a[1] * k]
const abs = (a: C) => Math.sqrt(a[0] * a[0] + a[1] * a[1])
const fmtV = (v: number) => `${v.toFixed(1)} V`
const fmtA = (a: number) => `${a >= 100 ? a.toFixed(0) : a.toFixed(1)} A`
const pct = (x: number) => `${Math.round(x * 100)} %`

export interface HazardContext {
  topo: Topology
  sol: StageSolution
  secondary: SideGraph
  loops: DeltaLoop[]
  merge: (n: number) => number
  /** largest pole current of each conducting fuse and breaker */
  deviceAmps: Map<string, number>
  hz: number
}

function voltage(ctx: HazardContext, terminal: string): C {
  const node = nodeOfTerminal(ctx.topo, terminal)!
  return node < 0 ? [0, 0] : [ctx.sol.vRe[node]!, ctx.sol.vIm[node]!]
}

function unitOf(ctx: HazardContext, id: string): Unit {
  return ctx.topo.unitById.get(id)!
}

function nodeVoltage(ctx: HazardContext, node: number): C {
  return node < 0 ? [0, 0] : [ctx.sol.vRe[node]!, ctx.sol.vIm[node]!]
}

/** Open-circuit EMF of an edge, estimated from its unit's primary terminal voltage and turns. */
function edgeEmf(ctx: HazardContext, e: BankEdge): C {
  const unit = unitOf(ctx, e.unit)
  const primary = unit.windings[0]!
  const vp = sub(nodeVoltage(ctx, primary.a), nodeVoltage(ctx, primary.b))
  const turns = e.windings.reduce((s, w) => s + unit.windings[w]!.turns, 0)
  return scale(vp, turns / primary.turns)
}

function edgeRatedVolts(ctx: HazardContext, e: BankEdge): number {
  const unit = unitOf(ctx, e.unit)
  return e.windings.reduce((s, w) => s + unit.windings[w]!.ratedVolts, 0)
}

const short = (terminal: string) => terminal.split('.')[1]!

export function loopHazards(ctx: HazardContext): { hazards: Hazard[]; checks: ClosingCheck[] } {
  const hazards: Hazard[] = []
  const checks: ClosingCheck[] = []
  const nominal = edgeDirections(ctx.topo)
  for (const loop of ctx.loops) {
    const measured = loop.path.map(({ edge, sign }) => scale(edgeEmf(ctx, edge), sign))
    const energized = measured.reduce((s, e) => s + abs(e), 0) / measured.length >= 1
    // which unit is backwards is judged from the EMFs the wiring puts around the loop, not from
    // the coil voltages: a reversed unit in a closed delta collapses those under its own fault
    // current, the more so the weaker the source
    const wired = loop.path.map(({ edge, sign }) => {
      const d = nominal(edge)
      return d ? scale(d, sign) : null
    })
    const emfs = wired.every((e) => e !== null) ? (wired as C[]) : measured
    const mean = emfs.reduce((s, e) => s + abs(e), 0) / emfs.length
    const coilVolts = Math.max(...loop.path.map(({ edge }) => edgeRatedVolts(ctx, edge)))
    const sum = emfs.reduce(addc, [0, 0] as C)
    const gapVolts = loop.gap ? abs(sub(voltage(ctx, loop.gap[0]), voltage(ctx, loop.gap[1]))) : abs(sum)
    const units = loop.path.map(({ edge }) => edge.unit)
    if (loop.gap) checks.push({ units, between: loop.gap, volts: gapVolts, coilVolts, energized, ok: energized && gapVolts <= CLOSING_TOLERANCE * coilVolts })
    if (!energized) continue
    if (abs(sum) <= CLOSING_TOLERANCE * mean && gapVolts <= CLOSING_TOLERANCE * coilVolts) continue

    let odd = -1
    let best = Infinity
    emfs.forEach((e, k) => {
      const flipped = abs(sub(sum, scale(e, 2)))
      if (flipped < best) {
        best = flipped
        odd = k
      }
    })
    const reversed = abs(sum) >= 1.5 * mean && best <= 0.25 * mean
    if (reversed) {
      const edge = loop.path[odd]!.edge
      const leads = `${short(edge.fromTerminal)} and ${short(edge.toTerminal)}`
      // closed: what would stand across a corner if it were opened, on the nameplate (the
      // solved EMFs sag under the short-circuit current itself, so they would understate it)
      const where = loop.gap ? `the closing check across ${loop.gap[0]} – ${loop.gap[1]} reads ${fmtV(gapVolts)}` : `about ${fmtV(2 * coilVolts)} would stand across a corner if it were opened`
      hazards.push({
        code: 'reversed-winding',
        severity: 'danger',
        units: [edge.unit],
        volts: loop.gap ? gapVolts : 2 * coilVolts,
        ...(loop.gap && { onClosing: true }),
        message: loop.gap
          ? `${edge.unit} is connected backwards in the delta: ${where}, about twice the ${fmtV(coilVolts)} coil voltage, where a correct delta reads near 0 V. ` +
            `Do not close this corner: it would be a dead short around the delta that only a fuse or breaker would stop. ` +
            `De-energize, lock out, reverse ${edge.unit}'s secondary leads (${leads}), then repeat the closing check.`
          : `${edge.unit} is connected backwards in a closed delta: ${where}, about twice the ${fmtV(coilVolts)} coil voltage, where the coils should cancel to near 0 V, ` +
            `so a short-circuit current circulates around the delta. De-energize at once, lock out, open one corner, reverse ${edge.unit}'s secondary leads (${leads}) ` +
            `and repeat the closing check before closing the corner again.`,
      })
    } else if (loop.gap) {
      hazards.push({
        code: 'loop-voltage',
        severity: 'danger',
        units,
        volts: gapVolts,
        onClosing: true,
        message:
          `The closing check across ${loop.gap[0]} – ${loop.gap[1]} reads ${fmtV(gapVolts)} (${pct(gapVolts / coilVolts)} of the ${fmtV(coilVolts)} coil voltage), where a correct delta reads near 0 V. ` +
          `Closing this corner would drive a circulating current around the delta. Check that ${units.join(', ')} are fed from three different phases in rotation, share the same ratio and tap, and are marked correctly.`,
      })
    }
  }
  hazards.push(...parallelHazards(ctx))
  return { hazards, checks }
}

/** Coils or units joined at like ends, about to be paralleled: the last pair must read near 0 V. */
function parallelHazards(ctx: HazardContext): Hazard[] {
  const hazards: Hazard[] = []
  for (const unit of ctx.topo.units) {
    if (unit.windings.length < 3) continue
    const id = unit.id
    const node = (t: string) => ctx.merge(unit.node[t]!)
    const x13 = node('X1') === node('X3')
    const x24 = node('X2') === node('X4')
    if (x13 === x24) continue
    const gap: [string, string] = x13 ? [`${id}.X2`, `${id}.X4`] : [`${id}.X1`, `${id}.X3`]
    const volts = abs(sub(voltage(ctx, gap[0]), voltage(ctx, gap[1])))
    const coil = Math.min(unit.windings[1]!.ratedVolts, unit.windings[2]!.ratedVolts)
    if (volts <= CLOSING_TOLERANCE * coil) continue
    hazards.push({
      code: 'loop-voltage',
      severity: 'danger',
      units: [id],
      volts,
      onClosing: true,
      message:
        `${id}'s coils are joined ${x13 ? 'X1 to X3' : 'X2 to X4'}, and ${gap[0]} – ${gap[1]} reads ${fmtV(volts)}: coils about to be paralleled must read near 0 V there. ` +
        `Joining them would short one coil through the other. Check the coil voltages on the nameplate and the unit's terminal marking before joining.`,
    })
  }
  for (const group of ctx.secondary.groups) {
    if (group.length !== 2 || group[0]!.unit === group[1]!.unit) continue
    const [e1, e2] = group as [BankEdge, BankEdge]
    const shared = [e1.from, e1.to].map(ctx.merge).filter((n) => n === ctx.merge(e2.from) || n === ctx.merge(e2.to))
    if (shared.length !== 1) continue
    const centre = shared[0]!
    const like = (ctx.merge(e1.from) === centre) === (ctx.merge(e2.from) === centre)
    if (!like) continue
    const far1 = ctx.merge(e1.from) === centre ? e1.toTerminal : e1.fromTerminal
    const far2 = ctx.merge(e2.from) === centre ? e2.toTerminal : e2.fromTerminal
    const a = edgeEmf(ctx, e1)
    const b = edgeEmf(ctx, e2)
    if (abs(a) < 1 || abs(b) < 1) continue
    const cos = (a[0] * b[0] + a[1] * b[1]) / (abs(a) * abs(b))
    if (Math.abs(cos) < Math.cos((20 * Math.PI) / 180)) continue // units on different phases: a wye, not a parallel
    const volts = abs(sub(voltage(ctx, far1), voltage(ctx, far2)))
    const coil = Math.min(edgeRatedVolts(ctx, e1), edgeRatedVolts(ctx, e2))
    if (volts <= CLOSING_TOLERANCE * coil) continue
    hazards.push({
      code: 'loop-voltage',
      severity: 'danger',
      units: [e1.unit, e2.unit],
      volts,
      onClosing: true,
      message:
        `${e1.unit} and ${e2.unit} are joined at one end as if to be paralleled, and ${far1} – ${far2} reads ${fmtV(volts)} instead of near 0 V. ` +
        `Joining those ends would short one unit through the other. Check polarity (one unit may be reversed), ratio and tap before paralleling.`,
    })
  }
  return hazards
}

export function windingHazards(ctx: HazardContext): Hazard[] {
  const hazards: Hazard[] = []
  ctx.topo.units.forEach((unit, ui) => {
    const solved = ctx.sol.units[ui]!
    const { vRe, vIm } = ctx.sol
    let worstV = { ratio: 0, name: '', volts: 0, rated: 0 }
    let worstA = { ratio: 0, name: '', amps: 0, rated: 0 }
    for (let k = 0; k < unit.windings.length; k++) {
      const w = unit.windings[k]!
      const dr = (w.a < 0 ? 0 : vRe[w.a]!) - (w.b < 0 ? 0 : vRe[w.b]!)
      const di = (w.a < 0 ? 0 : vIm[w.a]!) - (w.b < 0 ? 0 : vIm[w.b]!)
      const volts = Math.sqrt(dr * dr + di * di)
      const i = solved.current[k]!
      const amps = Math.sqrt(i.re * i.re + i.im * i.im)
      if (volts / w.ratedVolts > worstV.ratio) worstV = { ratio: volts / w.ratedVolts, name: w.name, volts, rated: w.ratedVolts }
      if (amps / w.ratedAmps > worstA.ratio) worstA = { ratio: amps / w.ratedAmps, name: w.name, amps, rated: w.ratedAmps }
    }
    if (worstV.ratio > OVERVOLTAGE_LIMIT) {
      hazards.push({
        code: 'winding-overvoltage',
        severity: 'danger',
        units: [unit.id],
        volts: worstV.volts,
        message:
          `${unit.id}'s winding ${worstV.name} sees ${fmtV(worstV.volts)}, ${pct(worstV.ratio)} of its ${fmtV(worstV.rated)} rating. ` +
          `Driven this far above rating the core saturates, the unit overheats and every secondary reading is too high. ` +
          `Check that the primary connection (across lines or line to neutral) suits the unit's ${fmtV(unit.spec.primaryVolts)} primary, and check the tap.`,
      })
    }
    if (worstA.ratio >= FAULT_MULTIPLE) {
      hazards.push({
        code: 'fault-current',
        severity: 'danger',
        units: [unit.id],
        amps: worstA.amps,
        message:
          `${unit.id}'s winding ${worstA.name} carries ${fmtA(worstA.amps)}, ${worstA.ratio.toFixed(1)} × its ${fmtA(worstA.rated)} rating: a short circuit or a circulating current. ` +
          `The protection must clear it; the unit is damaged if it does not. Look for a jumper across a winding, a reversed unit in a closed delta, or units of different ratio in parallel.`,
      })
    } else if (worstA.ratio > OVERLOAD_LIMIT) {
      hazards.push({
        code: 'overload',
        severity: 'caution',
        units: [unit.id],
        amps: worstA.amps,
        message:
          `${unit.id}'s winding ${worstA.name} carries ${fmtA(worstA.amps)}, ${pct(worstA.ratio)} of its ${fmtA(worstA.rated)} rating: the unit runs hot. ` +
          `Reduce the load or use a larger unit (in an open delta each unit carries the full line current).`,
      })
    }
  })
  return hazards
}

export function deviceHazards(ctx: HazardContext): Hazard[] {
  const hazards: Hazard[] = []
  for (const [id, amps] of ctx.deviceAmps) {
    const c = ctx.topo.byId.get(id)!
    if (c.kind !== 'fuse' && c.kind !== 'breaker') continue
    if (c.kind === 'breaker' && !c.trips) continue // a disconnect: nothing to operate
    const op = operatingTime(curveOf(c), c.amps, amps, ctx.hz)
    if (!op) continue
    const what = c.kind === 'fuse' ? 'fuse' : 'breaker'
    if (op.region === 'instantaneous' || amps >= INSTANTANEOUS_HAZARD_MULTIPLE * c.amps) {
      hazards.push({
        code: 'fault-current',
        severity: 'danger',
        units: [id],
        amps,
        message:
          `${what} ${id} carries ${fmtA(amps)}, ${(amps / c.amps).toFixed(0)} × its ${fmtA(c.amps)} rating: a short circuit. ` +
          `It would ${c.kind === 'fuse' ? 'blow' : 'trip'} ${op.seconds < 0.05 ? 'at once' : 'within'} (about ${formatSeconds(op.seconds)}). Find the fault before re-energizing.`,
      })
    } else {
      hazards.push({
        code: 'overload',
        severity: 'caution',
        units: [id],
        amps,
        message:
          `${what} ${id} carries ${fmtA(amps)}, ${pct(amps / c.amps)} of its ${fmtA(c.amps)} rating: it would ${c.kind === 'fuse' ? 'blow' : 'trip'} in about ${formatSeconds(op.seconds)}. ` +
          `Reduce the load or check the sizing.`,
      })
    }
  }
  return hazards
}

export function formatSeconds(s: number): string {
  if (s < 1) return `${(s * 1000).toFixed(0)} ms`
  if (s < 120) return `${s.toFixed(s < 10 ? 1 : 0)} s`
  return `${(s / 60).toFixed(0)} min`
}
