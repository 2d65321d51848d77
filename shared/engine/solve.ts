/**
 * solve(document) → the settled result of circuit-format.md: solve, find the protective
 * device that operates first, open it, solve again, until nothing more operates.
 */
import { parseCircuitIndexed, type CircuitError, type TerminalIndex } from '../circuit/parse'
import type { Circuit } from '../circuit/schema'
import { bankProblems } from './bank-check'
import { classifyCoils, classifySide, contactMerge, deltaLoops, sideGraphs } from './bank'
import { deviceHazards, loopHazards, windingHazards, type HazardContext } from './hazards'
import { backfeedHazards, neutralShiftHazards, outputVoltageHazards } from './hazards-output'
import { inrushCautions } from './inrush'
import { buildTopology, CircuitSolveError, nodeOfTerminal, solveStage, type StageSolution, type Topology } from './network'
import { curveOf, operatingTime } from './protection'
import type { BankSummary, ClosingCheck, DeviceReading, Hazard, MeterReading, ProtectionEvent, Reading, RotationReading, SolveResult } from './types'
import { vectorGroupOf } from './vector-group'

/** Settings of the model itself, for tests that show a result does not depend on them. */
export interface EngineOptions {
  /** every node's conductance to ground (circuit-format.md: 1 GΩ, i.e. 1e-9 S) */
  leakSiemens?: number
}

export class CircuitValidationError extends Error {
  constructor(readonly errors: CircuitError[]) {
    super(`invalid circuit document: ${errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`)
  }
}

const round = (x: number, digits: number) => {
  const k = digits === 4 ? 1e4 : digits === 2 ? 100 : 10 ** digits
  const r = Math.round(x * k) / k
  return r === 0 ? 0 : r
}

/** Angle in degrees, in (−180, 180]. */
export function degreesOf(re: number, im: number): number {
  let d = (Math.atan2(im, re) * 180) / Math.PI
  if (d <= -180) d += 360
  return d
}

function reading(re: number, im: number): Reading {
  const volts = Math.sqrt(re * re + im * im)
  if (volts < 1e-6) return { volts: 0, degrees: 0 }
  const deg = round(degreesOf(re, im), 2)
  return { volts: round(volts, 4), degrees: deg === -180 ? 180 : deg }
}

export interface SolveDetail {
  topo: Topology
  /** the state as energized, before any protective device operated */
  initial: StageSolution
  /** the settled state */
  final: StageSolution
  open: Set<string>
  result: SolveResult
}

/** Validates and solves a circuit document; throws CircuitValidationError or CircuitSolveError. */
export function solve(input: unknown): SolveResult {
  return solveDetailed(input).result
}

export function solveDetailed(input: unknown, options?: EngineOptions): SolveDetail {
  const parsed = parseCircuitIndexed(input)
  if (!parsed.ok) throw new CircuitValidationError(parsed.errors)
  return solveCircuit(parsed.circuit, parsed.terminals, options)
}

function deviceAmps(topo: Topology, sol: StageSolution, open: ReadonlySet<string>): Map<string, number> {
  const amps = new Map<string, number>()
  const poles = topo.poles
  for (let k = 0; k < poles.length; k++) {
    const p = poles[k]!
    if (open.has(p.device)) continue
    const c = sol.poleCurrent[k]!
    const i = Math.sqrt(c.re * c.re + c.im * c.im)
    const was = amps.get(p.device)
    amps.set(p.device, was === undefined ? Math.max(0, i) : Math.max(was, i))
  }
  return amps
}

function stageHazards(topo: Topology, sol: StageSolution, open: ReadonlySet<string>, amps: Map<string, number>, hz: number) {
  const merge = contactMerge(topo, open)
  const graphs = sideGraphs(topo, merge)
  const ctx: HazardContext = { topo, sol, secondary: graphs.secondary, loops: deltaLoops(graphs.secondary, merge), merge, deviceAmps: amps, hz }
  const loops = loopHazards(ctx)
  const hazards = [...loops.hazards, ...windingHazards(ctx), ...deviceHazards(ctx)]
  const primary = classifySide(topo, graphs.primary, merge)
  const secondary = classifySide(topo, graphs.secondary, merge)
  const problems = bankProblems(topo, graphs, merge, primary, secondary)
  const out = { topo, sol, open, merge, graphs }
  hazards.push(...backfeedHazards(out), ...neutralShiftHazards(out))
  // with a delta's corner open the bank is mid closing-check: the loop hazards speak for it,
  // and the output is not to be loaded until the corner is closed
  if (loops.checks.length === 0) hazards.push(...outputVoltageHazards(out, problems))
  return { hazards, checks: loops.checks, merge, graphs, connections: { primary, secondary }, problems }
}

/** Two operating times this close are one instant: the devices open together. */
const SAME_INSTANT = 1e-9
/**
 * The protection study re-solves the whole network after each instant at which devices open;
 * past this many separate instants it stops with a CircuitSolveError (a 422) rather than take
 * seconds: no real bank has more than a few dozen devices that open one after another.
 */
export const MAX_OPERATING_INSTANTS = 64

/** Solves an already-validated document (defaults filled in). */
export function solveCircuit(circuit: Circuit, terminals?: TerminalIndex, options?: EngineOptions): SolveDetail {
  const topo = buildTopology(circuit, terminals)
  if (options?.leakSiemens !== undefined) topo.leakSiemens = options.leakSiemens
  const firstSupply = circuit.components.find((c) => c.kind === 'supply')
  const hz = firstSupply?.kind === 'supply' ? firstSupply.hz : 60

  const open = new Set<string>()
  const devices: Record<string, DeviceReading> = {}
  for (const c of circuit.components) {
    if (c.kind === 'breaker') {
      devices[c.id] = { state: c.closed ? 'closed' : 'open', amps: 0 }
      if (!c.closed) open.add(c.id)
    } else if (c.kind === 'fuse') {
      devices[c.id] = { state: c.blown ? 'blown' : 'intact', amps: 0 }
      if (c.blown) open.add(c.id)
    }
  }

  const events: ProtectionEvent[] = []
  const hazards: Hazard[] = []
  const hazardKeys = new Set<string>()
  const damage = new Map<string, number>()
  let seconds = 0
  let instants = 0
  let initial: StageSolution | undefined
  let sol: StageSolution
  let checks: ClosingCheck[] = []
  let stage: ReturnType<typeof stageHazards>
  let amps: Map<string, number>
  for (;;) {
    sol = solveStage(topo, open)
    initial ??= sol
    amps = deviceAmps(topo, sol, open)
    stage = stageHazards(topo, sol, open, amps, hz)
    if (sol === initial) checks = stage.checks
    for (const h of stage.hazards) {
      const key = `${h.code}:${h.units.join(',')}`
      if (!hazardKeys.has(key)) {
        hazardKeys.add(key)
        hazards.push(h)
      }
    }
    // the devices that operate first, with the stress each has already taken; those that
    // operate at the same instant open together
    const candidates: { id: string; amps: number; after: number; region: ProtectionEvent['region']; ratio: number }[] = []
    const times = new Map<string, number>()
    let soonest = Infinity
    for (const [id, i] of amps) {
      const c = topo.byId.get(id)!
      if (c.kind !== 'fuse' && c.kind !== 'breaker') continue
      if (c.kind === 'breaker' && !c.trips) continue // a disconnect or tie switch
      const op = operatingTime(curveOf(c), c.amps, i, hz)
      if (!op) continue
      times.set(id, op.seconds)
      const after = Math.max(0, (1 - (damage.get(id) ?? 0)) * op.seconds)
      candidates.push({ id, amps: i, after, region: op.region, ratio: i / c.amps })
      if (after < soonest) soonest = after
    }
    if (candidates.length === 0) break
    if (++instants > MAX_OPERATING_INSTANTS) {
      throw new CircuitSolveError(
        `the protection study stops after ${MAX_OPERATING_INSTANTS} separate instants at which fuses or breakers open, and this network needs more: ` +
          `devices of the same rating and load open together, so give like branches like loads, or study fewer branches at a time.`,
        [],
      )
    }
    const batch = candidates.filter((c) => c.after <= soonest * (1 + SAME_INSTANT) + 1e-12)
    batch.sort((x, y) => y.ratio - x.ratio || (x.id < y.id ? -1 : x.id > y.id ? 1 : 0))
    for (const [id, t] of times) damage.set(id, (damage.get(id) ?? 0) + soonest / t)
    seconds += soonest
    for (const next of batch) {
      const kind = topo.byId.get(next.id)!.kind
      const state = kind === 'fuse' ? 'blown' : 'tripped'
      events.push({ device: next.id, action: 'opened', amps: round(next.amps, 4), seconds: round(seconds, 6), state, region: next.region })
      devices[next.id] = { state, amps: round(next.amps, 4) }
      open.add(next.id)
    }
  }

  // the last stage is the settled state: nothing opened after it was solved
  const result = buildResult(topo, sol, amps, devices, events, hazards, checks, stage)
  result.cautions = inrushCautions(topo, hz)
  return { topo, initial: initial!, final: sol, open, result }
}

function buildResult(
  topo: Topology,
  sol: StageSolution,
  /** largest pole current of each conducting fuse and breaker in this state */
  amps: Map<string, number>,
  devices: Record<string, DeviceReading>,
  events: ProtectionEvent[],
  hazards: Hazard[],
  closingChecks: ClosingCheck[],
  stage: ReturnType<typeof stageHazards>,
): SolveResult {
  const { merge, graphs } = stage
  const V = (node: number): [number, number] => (node < 0 ? [0, 0] : [sol.vRe[node]!, sol.vIm[node]!])
  const vt = (terminal: string) => V(nodeOfTerminal(topo, terminal)!)

  const terminals: Record<string, Reading> = {}
  const { vRe, vIm } = sol
  const names = topo.terminalNames
  const nodes = topo.terminalNodes
  // each node's reading once: several terminals share a node
  const nodeVolts: number[] = new Array<number>(topo.nodeCount)
  const nodeDegrees: number[] = new Array<number>(topo.nodeCount)
  for (let node = 0; node < topo.nodeCount; node++) {
    const r = reading(vRe[node]!, vIm[node]!)
    nodeVolts[node] = r.volts
    nodeDegrees[node] = r.degrees
  }
  for (let k = 0; k < names.length; k++) {
    const node = nodes[k]!
    terminals[names[k]!] = node < 0 ? { volts: 0, degrees: 0 } : { volts: nodeVolts[node]!, degrees: nodeDegrees[node]! }
  }
  const re = (node: number) => (node < 0 ? 0 : vRe[node]!)
  const im = (node: number) => (node < 0 ? 0 : vIm[node]!)
  const meters: Record<string, MeterReading> = {}
  for (const m of topo.meters) meters[m.id] = reading(re(m.a) - re(m.b), im(m.a) - im(m.b))
  topo.ammeters.forEach((m, k) => {
    const i = sol.ammeterCurrent[k]!
    const r = reading(i.re, i.im)
    meters[m.id] = { amps: r.volts, degrees: r.degrees }
  })
  for (const r of topo.rotationMeters) {
    const lead = (n: number): [number, number] => [re(n) - re(r.common), im(n) - im(r.common)]
    meters[r.id] = { sequence: phaseSequence(lead(r.a), lead(r.b), lead(r.c)) }
  }
  const windings: SolveResult['windings'] = {}
  for (let ui = 0; ui < topo.units.length; ui++) {
    const u = topo.units[ui]!
    const current = sol.units[ui]!.current
    for (let k = 0; k < u.windings.length; k++) {
      const w = u.windings[k]!
      const i = current[k]!
      const dr = re(w.a) - re(w.b)
      const di = im(w.a) - im(w.b)
      const volts = Math.sqrt(dr * dr + di * di)
      const windingAmps = round(Math.sqrt(i.re * i.re + i.im * i.im), 4)
      let wr: SolveResult['windings'][string]
      if (volts < 1e-6) wr = { volts: 0, degrees: 0, amps: windingAmps }
      else {
        const deg = round(degreesOf(dr, di), 2)
        wr = { volts: round(volts, 4), degrees: deg === -180 ? 180 : deg, amps: windingAmps }
      }
      windings[`${u.id}.${w.name}`] = wr
    }
  }
  for (const [id, i] of amps) {
    const d = devices[id]!
    if (d.state === 'closed' || d.state === 'intact') d.amps = round(i, 4)
  }

  const bank: BankSummary = {
    primary: stage.connections.primary,
    secondary: stage.connections.secondary,
    coils: classifyCoils(topo),
    displacementDegrees: null,
    clock: null,
    vectorGroup: null,
  }
  const problems = stage.problems
  const energized = isEnergized(topo, merge)
  const output = topo.circuit.components.find((c) => c.kind === 'output')
  const supply = topo.circuit.components.find((c) => c.kind === 'supply')
  if (energized && output && supply) {
    const [or, oi] = vt(`${output.id}.a`).map((x, i) => x - vt(`${output.id}.b`)[i]!) as [number, number]
    const [sr, si] = vt(`${supply.id}.A`).map((x, i) => x - vt(`${supply.id}.B`)[i]!) as [number, number]
    const wired = [`${output.id}.a`, `${output.id}.b`].every((t) => {
      const node = nodeOfTerminal(topo, t)!
      return node < 0 || topo.nodeTerminalCount[node]! > 1
    })
    if (wired && Math.hypot(or, oi) > 1e-3 * Math.hypot(sr, si) && Math.hypot(sr, si) > 0) {
      let d = degreesOf(or, oi) - degreesOf(sr, si)
      while (d <= -180) d += 360
      while (d > 180) d -= 360
      bank.displacementDegrees = round(d, 2)
      const group = problems.length === 0 && supply.kind === 'supply' ? vectorGroupOf(topo, graphs, merge, stage.connections, d, supply.rotation) : null
      if (group) {
        bank.clock = group.clock
        bank.vectorGroup = group.vectorGroup
      }
    }
  }

  return {
    energized,
    meters,
    terminals,
    windings,
    devices,
    events,
    hazards: hazards.map((h) => ({ ...h, ...(h.volts !== undefined && { volts: round(h.volts, 2) }), ...(h.amps !== undefined && { amps: round(h.amps, 2) }) })),
    bank,
    closingChecks: closingChecks.map((c) => ({ ...c, volts: round(c.volts, 2) })),
    bankProblems: problems,
    cautions: [],
  }
}

/** The three-phase set that makes ABC, ACB, or none (circuit-format.md 1.1). */
const SEQUENCE_MIN_SHARE = 0.1
/** the sequence that dominates must be this many times the other: leads about 120° apart */
const SEQUENCE_DOMINANCE = 3

export function phaseSequence(a: [number, number], b: [number, number], c: [number, number]): RotationReading['sequence'] {
  const size = (z: [number, number]) => Math.hypot(z[0], z[1])
  const largest = Math.max(size(a), size(b), size(c))
  if (largest < 1e-6 || [a, b, c].some((z) => size(z) < SEQUENCE_MIN_SHARE * largest)) return 'none'
  // symmetrical components: with h = 1∠120°, V+ = (a + h·b + h²·c) / 3 and V− = (a + h²·b + h·c) / 3
  const h: [number, number] = [-0.5, Math.sqrt(3) / 2]
  const h2: [number, number] = [-0.5, -Math.sqrt(3) / 2]
  const mul = (x: [number, number], y: [number, number]): [number, number] => [x[0] * y[0] - x[1] * y[1], x[0] * y[1] + x[1] * y[0]]
  const sum = (...zs: [number, number][]): [number, number] => zs.reduce((s, z) => [s[0] + z[0], s[1] + z[1]], [0, 0])
  const positive = size(sum(a, mul(h, b), mul(h2, c)))
  const negative = size(sum(a, mul(h2, b), mul(h, c)))
  if (positive >= SEQUENCE_DOMINANCE * negative) return 'ABC'
  if (negative >= SEQUENCE_DOMINANCE * positive) return 'ACB'
  return 'none'
}

/** A transformer, load or output block sits on a node that a supply line reaches through closed contacts. */
function isEnergized(topo: Topology, merge: (n: number) => number): boolean {
  const live = new Set(topo.phases.map((p) => merge(p.line)))
  if (live.size === 0) return false
  const reached = (node: number) => live.has(merge(node))
  if (topo.units.some((u) => u.windings.some((w) => reached(w.a) || reached(w.b)))) return true
  if (topo.loads.some((l) => reached(l.a) || reached(l.b))) return true
  return topo.circuit.components.some((c) => c.kind === 'output' && ['a', 'b', 'c', 'n'].some((t) => reached(nodeOfTerminal(topo, `${c.id}.${t}`)!)))
}
