/**
 * The readings a lab takes on a bank, in the order they are taken, each with what the engine
 * predicts: every primary H1–H2; the closing check across the last open corner (before it is
 * closed); every coil (and X1–X4 across a series pair); every output line to line and line
 * to n; the high leg where there is one. The prediction is the bank energized (breakers
 * closed, fuses in) with the corner closed, except the closing check, taken with it open.
 */
import { parseCircuit } from '../circuit/parse'
import { splitTerminal, type Circuit } from '../circuit/schema'
import { solveCircuit } from '../engine/solve'
import type { SolveResult } from '../engine/types'
import { difference, phasorView } from '../phasors'

export type PointKind = 'primary' | 'closing-check' | 'coil' | 'line-line' | 'line-neutral' | 'high-leg'

export interface TestPoint {
  /** stable within a sheet: `kind:from:to` */
  id: string
  step: number
  kind: PointKind
  label: string
  from: string
  to: string
  expectedVolts: number
  /** what a miss is measured against: the expected value, or for a closing check the coil voltage */
  referenceVolts: number
  note: string
  /**
   * For an output reading, the unit whose secondary alone feeds each output terminal it touches
   * (`{ 'OUT.b': 'T1' }`): every line of a wye, both lines of one unit's 120/240 V output. A delta
   * corner joins two units and names none.
   */
  feeders?: Record<string, string>
}

const isSecondary = (t: string) => /^X[1-4]$/.test(splitTerminal(t)?.[1] ?? '')

function energizedCopy(circuit: Circuit): Circuit {
  return {
    ...circuit,
    components: circuit.components.map((c) => (c.kind === 'breaker' ? { ...c, closed: true } : c.kind === 'fuse' ? { ...c, blown: false } : c)),
  }
}

function solved(circuit: Circuit): SolveResult | null {
  try {
    return solveCircuit(circuit).result
  } catch {
    return null
  }
}

/** The bank with its last delta corner open and with it closed, and that corner's check. */
function corners(live: Circuit, result: SolveResult) {
  const open = result.closingChecks[0]
  if (open) {
    return { openResult: result, closed: { ...live, wires: [...live.wires, open.between] as [string, string][] }, check: open }
  }
  if (result.bank.secondary !== 'delta') return { openResult: null, closed: live, check: null }
  // the corner closed last: the last jumper between two units' secondaries whose removal opens a loop
  for (let i = live.wires.length - 1; i >= 0; i--) {
    const [a, b] = live.wires[i]!
    if (!isSecondary(a) || !isSecondary(b) || splitTerminal(a)![0] === splitTerminal(b)![0]) continue
    const trial = { ...live, wires: live.wires.filter((_, k) => k !== i) }
    const r = solved(trial)
    const check = r?.closingChecks.find((c) => c.between.includes(a) && c.between.includes(b))
    if (r && check) return { openResult: r, closed: live, check }
  }
  return { openResult: null, closed: live, check: null }
}

/**
 * The one unit whose secondary sits at the terminal's voltage, or null. Wired terminals are
 * one node; a closed breaker pole or fuse between them drops a few millivolts at most under load.
 */
function feederOf(result: SolveResult, units: Circuit['components'], terminal: string): string | null {
  const at = result.terminals[terminal]
  if (!at) return null
  const within = Math.max(0.5, at.volts * 0.002)
  const found = new Set(units
    .filter((u) => ['X1', 'X2', 'X3', 'X4'].some((x) => {
      const t = result.terminals[`${u.id}.${x}`]
      return t !== undefined && difference(t, at).volts <= within
    }))
    .map((u) => u.id))
  return found.size === 1 ? [...found][0]! : null
}

/** The test points of a bank (a circuit document); [] when it cannot be solved. */
export function labPoints(document: unknown): TestPoint[] {
  const parsed = parseCircuit(document)
  if (!parsed.ok) return []
  const live = energizedCopy(parsed.circuit)
  const first = solved(live)
  if (!first) return []
  const { closed, check } = corners(live, first)
  const result = closed === live ? first : solved(closed)
  if (!result || !result.energized) return []

  const points: Omit<TestPoint, 'step'>[] = []
  const add = (kind: PointKind, label: string, from: string, to: string, volts: number, note: string, reference = volts) =>
    points.push({ id: `${kind}:${from}:${to}`, kind, label, from, to, expectedVolts: Math.round(volts * 10) / 10, referenceVolts: Math.round(reference * 10) / 10, note })
  const units = closed.components.filter((c) => c.kind === 'transformer')
  const addOutput = (kind: PointKind, label: string, from: string, to: string, volts: number, note: string) => {
    add(kind, label, from, to, volts, note)
    const feeders: Record<string, string> = {}
    for (const t of [from, to]) {
      const unit = feederOf(result, units, t)
      if (unit) feeders[t] = unit
    }
    if (Object.keys(feeders).length) points[points.length - 1]!.feeders = feeders
  }
  const across = (from: string, to: string) => {
    const a = result.terminals[from]
    const b = result.terminals[to]
    return a && b ? difference(a, b).volts : null
  }

  for (const u of units) {
    const w = result.windings[`${u.id}.H1-H2`]
    if (w) add('primary', `${u.id} primary`, `${u.id}.H1`, `${u.id}.H2`, w.volts, 'the supply across the unit’s primary')
  }
  if (check) {
    add('closing-check', 'Closing check', check.between[0], check.between[1], check.volts, 'across the open corner, before it is closed: near 0 V when every unit is phased right', check.coilVolts)
  }
  for (const u of units) {
    if (u.kind !== 'transformer') continue
    const coils = u.secondaryVolts.length === 2 ? [['X1', 'X2'], ['X3', 'X4']] : [['X1', 'X2']]
    for (const [a, b] of coils) {
      const w = result.windings[`${u.id}.${a}-${b}`]
      if (w) add('coil', `${u.id} coil ${a}–${b}`, `${u.id}.${a}`, `${u.id}.${b}`, w.volts, 'one coil on its own')
    }
    const wired = new Set(closed.wires.flatMap((w) => w))
    const series = closed.wires.some(([a, b]) => (a === `${u.id}.X2` && b === `${u.id}.X3`) || (a === `${u.id}.X3` && b === `${u.id}.X2`))
    if (u.secondaryVolts.length === 2 && series && wired.has(`${u.id}.X1`) && wired.has(`${u.id}.X4`)) {
      const v = across(`${u.id}.X1`, `${u.id}.X4`)
      if (v !== null) add('coil', `${u.id} X1–X4 (coils in series)`, `${u.id}.X1`, `${u.id}.X4`, v, 'both coils in series: their sum')
    }
  }
  for (const p of phasorView(result, closed).secondary) {
    if (p.between === 'lines') addOutput('line-line', `Output ${p.name}`, p.from, p.to, p.volts, 'line to line at the output')
    else if (!p.highLeg) addOutput('line-neutral', `Output ${p.name}`, p.from, p.to, p.volts, 'line to n at the output')
  }
  for (const p of phasorView(result, closed).secondary.filter((q) => q.highLeg)) {
    add('high-leg', `High leg ${p.name}`, p.from, p.to, p.volts, 'the high leg to n: about √3 × the other lines to n; mark it orange (NEC 110.15)')
  }
  return points.map((p, i) => ({ ...p, step: i + 1 }))
}
