/**
 * The Site check plan: the inputs built into a bank (`./build`), solved by the engine, and
 * read back as what a practitioner takes to site — the expected reading at every test point
 * in the order they are taken, the bank's capacity (open-delta derating), each unit's loading
 * under the stated loads, line currents, NEC 450.3(B) protection and the warnings.
 * Pure: no Vue, no Nitro.
 */
import type { CircuitInput } from '../circuit/schema'
import { solve } from '../engine/solve'
import { bankRating, bankKva, OPEN_DELTA_OF_CLOSED, OPEN_DELTA_OF_TWO_UNITS, type BankRating } from '../engine/ratings'
import { meterVolts, type Hazard, type SolveResult } from '../engine/types'
import { benchDocument, hasDeltaSecondary, hasNeutral, loadedDocument, noLoadDocument, ratingConnection } from './build'
import type { SiteCheckInput } from './inputs'
import { drawBank, type BankDrawing } from './drawing'
import { smallestStandard } from './sizes'
import { siteWarnings, type SiteWarning } from './warnings'

export type TestPointKind = 'primary' | 'coil' | 'closing-check' | 'line' | 'line-neutral' | 'high-leg'

export interface TestPoint {
  step: number
  /** when it is taken: with the delta's last corner still open, or with the bank complete */
  stage: 'corner-open' | 'complete'
  kind: TestPointKind
  /** "T1 primary H1–H2", "a–b", "b–n (high leg)" */
  label: string
  /** the two terminals the meter leads go on, as the circuit document names them */
  leads: [string, string]
  expectedVolts: number
  note?: string
}

export interface UnitLoading {
  unit: string
  kva: number
  /** the winding that is loaded hardest, as a percent of its rated current */
  percent: number
  /** kVA carried: percent × nameplate */
  carriedKva: number
  /** the lighting unit of a high-leg delta */
  lighting: boolean
  /** the smallest standard single-phase size that carries it (sizes.ts) */
  smallestStandardKva: number | null
}

export interface Capacity {
  /** balanced three-phase capacity (ratings.ts: 3 × the smallest unit closed, √3 × it open) */
  kva: number
  unitSumKva: number
  /** open delta only: the closed bank it stands for and the two published ratios */
  openDelta?: { closedBankKva: number; ofClosedPercent: number; ofUnitsPercent: number }
}

export interface LineCurrents {
  primary: Record<'A' | 'B' | 'C', number>
  secondary: Record<string, number>
  /** full-load line currents at the bank's capacity */
  fullLoad: { primary: number; secondary: number }
}

export interface SitePlan {
  input: SiteCheckInput
  /** the document that opens on the Bench */
  document: CircuitInput
  /** the bank drawing of the sheet (the bank with its corner open, as first energized) */
  drawing: BankDrawing
  secondaryLineVolts: number
  secondaryNeutralVolts: number | null
  testPoints: TestPoint[]
  /** what the closing check reads with one unit connected backwards */
  reversedClosingVolts: number | null
  capacity: Capacity
  loading: UnitLoading[]
  currents: LineCurrents
  /** line-to-line voltage unbalance under load, % (NEMA MG 1 definition: largest deviation from the average over the average) */
  voltageUnbalancePercent: number
  protection: BankRating
  warnings: SiteWarning[]
  /** the engine's hazards on the complete bank at no load (a correct build has none) */
  hazards: Hazard[]
}

const round = (x: number, places = 1) => Math.round(x * 10 ** places) / 10 ** places

const DASH = '–'
const terminalLabel = (t: string) => t.replace('.', ' ')

function primaryAndCoilPoints(input: SiteCheckInput, result: SolveResult, stage: TestPoint['stage']): Omit<TestPoint, 'step'>[] {
  const points: Omit<TestPoint, 'step'>[] = []
  input.units.forEach((_, i) => {
    const id = `T${i + 1}`
    const h = result.windings[`${id}.H1-H2`]
    if (h) points.push({ stage, kind: 'primary', label: `${id} primary H1${DASH}H2`, leads: [`${id}.H1`, `${id}.H2`], expectedVolts: h.volts })
  })
  input.units.forEach((u, i) => {
    const id = `T${i + 1}`
    const coils = u.secondaryVolts.length === 2 ? (['X1-X2', 'X3-X4'] as const) : (['X1-X2'] as const)
    for (const c of coils) {
      const w = result.windings[`${id}.${c}`]
      const [a, b] = c.split('-') as [string, string]
      if (w) points.push({ stage, kind: 'coil', label: `${id} coil ${a}${DASH}${b}`, leads: [`${id}.${a}`, `${id}.${b}`], expectedVolts: w.volts })
    }
  })
  return points
}

function outputPoints(input: SiteCheckInput, result: SolveResult, stage: TestPoint['stage']): Omit<TestPoint, 'step'>[] {
  const points: Omit<TestPoint, 'step'>[] = []
  for (const [x, y] of [['a', 'b'], ['b', 'c'], ['c', 'a']] as const) {
    const volts = meterVolts(result.meters[`M${x}${y}`])
    if (volts !== undefined) points.push({ stage, kind: 'line', label: `${x}${DASH}${y}`, leads: [`OUT.${x}`, `OUT.${y}`], expectedVolts: volts })
  }
  if (hasNeutral(input.connection)) {
    for (const x of ['a', 'b', 'c'] as const) {
      const volts = meterVolts(result.meters[`M${x}n`])
      if (volts === undefined) continue
      const high = input.connection === 'high-leg-delta' && x === 'b'
      points.push({
        stage,
        kind: high ? 'high-leg' : 'line-neutral',
        label: high ? `b${DASH}n (high leg)` : `${x}${DASH}n`,
        leads: [`OUT.${x}`, 'OUT.n'],
        expectedVolts: volts,
        note: high ? 'the high leg: line × √3 / 2 above the neutral; no 120 V load may go on it' : undefined,
      })
    }
  }
  return points
}

function unitLoading(input: SiteCheckInput, result: SolveResult): UnitLoading[] {
  return input.units.map((u, i) => {
    const id = `T${i + 1}`
    const primaryRated = (u.kva * 1000) / u.primaryVolts
    // each coil's rated current is kVA / (sum of coil volts), in series and in parallel alike
    const coilRated = (u.kva * 1000) / u.secondaryVolts.reduce((s, v) => s + v, 0)
    let worst = 0
    for (const [name, w] of Object.entries(result.windings)) {
      if (!name.startsWith(`${id}.`)) continue
      const rated = name.endsWith('H1-H2') ? primaryRated : coilRated
      worst = Math.max(worst, w.amps / rated)
    }
    const carried = worst * u.kva
    return { unit: id, kva: u.kva, percent: round(worst * 100), carriedKva: round(carried), lighting: input.connection === 'high-leg-delta' && i === 2, smallestStandardKva: smallestStandard(carried) }
  })
}

/** Secondary line currents from the load currents the solve implies (I = ΔV / Z for each load). */
function secondaryCurrents(doc: CircuitInput, result: SolveResult): Record<string, number> {
  const phasor = (t: string) => {
    const r = result.terminals[t]
    if (!r) return { re: 0, im: 0 }
    const rad = (r.degrees * Math.PI) / 180
    return { re: r.volts * Math.cos(rad), im: r.volts * Math.sin(rad) }
  }
  const lines: Record<string, { re: number; im: number }> = {}
  const endOf = (terminal: string) => {
    const w = doc.wires.find(([a, b]) => a === terminal || b === terminal)
    const other = w ? (w[0] === terminal ? w[1] : w[0]) : undefined
    return other?.startsWith('OUT.') ? other : undefined
  }
  for (const c of doc.components) {
    if (c.kind !== 'load') continue
    const p = endOf(`${c.id}.a`)
    const q = endOf(`${c.id}.b`)
    if (!p || !q) continue
    const z = typeof c.ohms === 'number' ? { re: c.ohms, im: 0 } : { re: c.ohms.r, im: c.ohms.x }
    const vp = phasor(p)
    const vq = phasor(q)
    const dv = { re: vp.re - vq.re, im: vp.im - vq.im }
    const den = z.re * z.re + z.im * z.im
    const i = { re: (dv.re * z.re + dv.im * z.im) / den, im: (dv.im * z.re - dv.re * z.im) / den }
    for (const [t, sign] of [[p, 1], [q, -1]] as const) {
      const line = (lines[t.slice(4)] ??= { re: 0, im: 0 })
      line.re += sign * i.re
      line.im += sign * i.im
    }
  }
  const out: Record<string, number> = {}
  for (const name of ['a', 'b', 'c', 'n']) {
    const l = lines[name]
    if (l) out[name] = round(Math.hypot(l.re, l.im))
  }
  return out
}

export function planSiteCheck(input: SiteCheckInput): SitePlan {
  const delta = hasDeltaSecondary(input.connection)
  const complete = solve(noLoadDocument(input))
  const steps: Omit<TestPoint, 'step'>[] = []
  let reversedClosingVolts: number | null = null
  if (delta) {
    const open = solve(noLoadDocument(input, { open: true }))
    steps.push(...primaryAndCoilPoints(input, open, 'corner-open'))
    const check = open.closingChecks[0]
    // the same bank with its last unit connected backwards: what a wrong closing check reads
    const wrong = solve(noLoadDocument(input, { open: true, reversed: [`T${input.units.length}`] }))
    const wrongVolts = meterVolts(wrong.meters.MC)
    reversedClosingVolts = wrongVolts !== undefined ? round(wrongVolts) : null
    if (check) {
      steps.push({
        stage: 'corner-open',
        kind: 'closing-check',
        label: `closing check across the open corner ${terminalLabel(check.between[0])} ${DASH} ${terminalLabel(check.between[1])}`,
        leads: check.between,
        expectedVolts: check.volts,
        note: `near 0 V is right: close the corner only then (de-energized). About ${round(reversedClosingVolts ?? 2 * check.coilVolts, 0)} V means a unit is connected backwards: do not close, closing it is a dead short`,
      })
    }
  } else {
    steps.push(...primaryAndCoilPoints(input, complete, 'complete'))
  }
  steps.push(...outputPoints(input, complete, 'complete'))
  const testPoints = steps.map((p, i) => ({ ...p, step: i + 1, expectedVolts: round(p.expectedVolts) }))

  const secondaryLineVolts = meterVolts(complete.meters.Mab) ?? 0
  const secondaryNeutralVolts = hasNeutral(input.connection) ? (meterVolts(complete.meters.Man) ?? null) : null

  const loadedDoc = loadedDocument(input, secondaryLineVolts, secondaryNeutralVolts)
  const loaded = solve(loadedDoc)
  const loading = unitLoading(input, loaded)
  const lineToLine = ['Mab', 'Mbc', 'Mca'].map((m) => meterVolts(loaded.meters[m]) ?? 0)
  const average = lineToLine.reduce((s, v) => s + v, 0) / 3
  const voltageUnbalancePercent = average > 0 ? round((Math.max(...lineToLine.map((v) => Math.abs(v - average))) / average) * 100, 2) : 0

  const kvas = input.units.map((u) => u.kva)
  const connection = ratingConnection(input.connection)
  const protection = bankRating(connection, kvas, input.supply.lineVolts, secondaryLineVolts)
  const capacity: Capacity = { kva: round(bankKva(connection, kvas)), unitSumKva: kvas.reduce((s, k) => s + k, 0) }
  if (connection === 'open-delta') {
    capacity.openDelta = { closedBankKva: 3 * Math.min(...kvas), ofClosedPercent: round(OPEN_DELTA_OF_CLOSED * 100), ofUnitsPercent: round(OPEN_DELTA_OF_TWO_UNITS * 100) }
  }
  const currents: LineCurrents = {
    primary: { A: round(loaded.devices.F1?.amps ?? 0), B: round(loaded.devices.F2?.amps ?? 0), C: round(loaded.devices.F3?.amps ?? 0) },
    secondary: secondaryCurrents(loadedDoc, loaded),
    fullLoad: { primary: round(protection.primaryAmps), secondary: round(protection.secondaryAmps) },
  }
  const plan: Omit<SitePlan, 'warnings'> = {
    input,
    document: benchDocument(input),
    drawing: drawBank(noLoadDocument(input, { open: true }), {
      highLeg: input.connection === 'high-leg-delta' ? 'b' : undefined,
      supplyLabel: `supply ${input.supply.lineVolts} V`,
      outputLabel: `output ${round(secondaryLineVolts)} V${secondaryNeutralVolts ? ` / ${round(secondaryNeutralVolts)} V to n` : ''}`,
    }),
    secondaryLineVolts: round(secondaryLineVolts),
    secondaryNeutralVolts: secondaryNeutralVolts === null ? null : round(secondaryNeutralVolts),
    testPoints,
    reversedClosingVolts,
    capacity,
    loading,
    currents,
    voltageUnbalancePercent,
    protection,
    hazards: complete.hazards,
  }
  return { ...plan, warnings: siteWarnings(plan) }
}
