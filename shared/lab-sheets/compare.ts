/**
 * Measured against predicted: within tolerance or not, and for each miss the likely cause in
 * plain words. `likelyCause` reads one reading on its own; `sheetCause` reads it with the rest
 * of the sheet (a unit's coils beside its series pair, the three line pairs of a wye), as a
 * lab does. The rules are the trade's common practice (no published source), each checked by
 * a row of tests/unit/lab-sheets.test.ts.
 */
import type { TestPoint } from './points'

export const DEFAULT_TOLERANCE_PERCENT = 5

/** A reading as typed: "239.8", "239,8" or " 240 " → a number; '' → null; anything else → NaN. */
export function parseReading(text: string): number | null {
  const t = text.trim().replace(/\s+/g, '')
  if (t === '') return null
  if (!/^-?\d+([.,]\d+)?$/.test(t)) return Number.NaN
  return Number(t.replace(',', '.'))
}

export type RowStatus = 'ok' | 'miss' | 'not-taken'

export interface ComparedRow {
  point: TestPoint
  /** the prediction, rescaled to the measured supply when asked */
  expectedVolts: number
  measuredVolts: number | null
  /** (measured − expected) / reference, in percent */
  deviationPercent: number | null
  status: RowStatus
  cause: string | null
}

export interface Comparison {
  tolerancePercent: number
  /** the factor the prediction was multiplied by (measured supply ÷ nominal), 1 when not rescaled */
  scale: number
  rows: ComparedRow[]
  taken: number
  misses: number
}

export interface CompareOptions {
  tolerancePercent?: number
  nominalSupplyVolts?: number | null
  measuredSupplyVolts?: number | null
  rescale?: boolean
}

const near = (ratio: number, target: number, within = 0.06) => Math.abs(ratio / target - 1) <= within

/** The likely cause of one miss; `ratios` are measured ÷ expected over every point taken. */
export function likelyCause(point: TestPoint, expected: number, measured: number, ratios: number[]): string {
  if (point.kind === 'closing-check') {
    const coil = point.referenceVolts
    if (measured >= 1.6 * coil) return 'About twice the coil voltage across the open corner: one unit is connected backwards. Do not close the corner; check each unit’s polarity (swap that unit’s secondary leads).'
    return 'Well above 0 V but not twice the coil voltage: the units do not match (ratio, tap or coil connection), or a coil inside one unit is reversed. Do not close the corner; compare each unit’s coil readings.'
  }
  if (expected > 0 && measured < 0.05 * expected) {
    return 'No voltage where there should be some: an open coil, a blown fuse, an open breaker or a loose jumper upstream of this point. De-energize and check continuity.'
  }
  const ratio = measured / expected
  const others = ratios.filter((r) => Number.isFinite(r))
  const median = others.length ? [...others].sort((a, b) => a - b)[Math.floor(others.length / 2)]! : ratio
  if (ratio > 1 && ratio <= 1.1 && median > 1.01 && median <= 1.1) {
    return 'Everything reads a few percent high: small units are wound to read high at no load (compensated windings), or the supply is high. Normal; rescale to the measured supply to check.'
  }
  if (ratio < 1 && ratio >= 0.9 && median < 0.99 && median >= 0.9) {
    return 'Everything reads a few percent low: the supply is low, or the bank is carrying load. Measure the supply and rescale.'
  }
  if (near(ratio, Math.sqrt(3))) return 'About √3 × the expected voltage: the reading spans two coils that add instead of subtract, as when one unit is backwards in the delta, or a wye is read line to line where line to n was meant.'
  if (near(ratio, 1 / Math.sqrt(3))) return 'About expected ÷ √3: this reads like a line-to-n voltage; check that the leads are on two lines, and where the high leg is.'
  if (near(ratio, 0.5)) return 'About half the expected voltage: the reading takes in only one coil of a series pair (check the X2–X3 jumper), or the unit’s ratio is not the one on the sheet.'
  if (near(ratio, 2)) return 'About twice the expected voltage: the coils are in series where parallel was meant (X2–X3 instead of X1–X3 and X2–X4), or the wrong unit or tap.'
  return `Off by ${Math.round((ratio - 1) * 100)} %: check the meter’s range and leads, the supply voltage, and the unit’s tap and nameplate.`
}

export function compareSheet(points: TestPoint[], measured: Record<string, number | null | undefined>, options: CompareOptions = {}): Comparison {
  const tolerancePercent = options.tolerancePercent ?? DEFAULT_TOLERANCE_PERCENT
  const canScale = options.rescale && options.nominalSupplyVolts && options.measuredSupplyVolts
  const scale = canScale ? options.measuredSupplyVolts! / options.nominalSupplyVolts! : 1
  const ratios = points
    .filter((p) => p.kind !== 'closing-check' && p.expectedVolts > 0 && typeof measured[p.id] === 'number')
    .map((p) => (measured[p.id] as number) / (p.expectedVolts * scale))
  let misses = 0
  let taken = 0
  const rows = points.map((point): ComparedRow => {
    const expectedVolts = Math.round(point.expectedVolts * scale * 10) / 10
    const value = measured[point.id]
    if (typeof value !== 'number' || !Number.isFinite(value)) {
      return { point, expectedVolts, measuredVolts: null, deviationPercent: null, status: 'not-taken', cause: null }
    }
    taken++
    const reference = point.kind === 'closing-check' ? point.referenceVolts : expectedVolts
    const deviation = reference > 0 ? ((value - expectedVolts) / reference) * 100 : 0
    const within = Math.abs(deviation) <= tolerancePercent + 1e-9
    if (!within) misses++
    return { point, expectedVolts, measuredVolts: value, deviationPercent: Math.round(deviation * 10) / 10, status: within ? 'ok' : 'miss', cause: null }
  })
  // causes once every row is known: a miss can depend on the readings beside it
  for (const row of rows) if (row.status === 'miss') row.cause = sheetCause(row, rows, ratios)
  return { tolerancePercent, scale, rows, taken, misses }
}

// ---- the sheet read as a whole ----

/** measured ÷ expected of a taken reading with something expected; null otherwise */
const ratioOf = (row: ComparedRow | undefined) =>
  row && row.measuredVolts !== null && row.expectedVolts > 0 ? row.measuredVolts / row.expectedVolts : null
const unitOf = (terminal: string) => terminal.slice(0, terminal.lastIndexOf('.'))
const endOf = (terminal: string) => terminal.slice(terminal.lastIndexOf('.') + 1)
// "about right" for a coil beside a dead series pair, and "about 0 V" for the pair: generous,
// since a bucking pair reads a few volts at most and the coils beside it read normally
const COIL_ABOUT_RIGHT = 0.15
const PAIR_ABOUT_ZERO = 0.15
const ZERO = 0.05

function coilRow(rows: readonly ComparedRow[], unit: string, a: string, b: string) {
  return rows.find((r) => r.point.kind === 'coil' && r.point.from === `${unit}.${a}` && r.point.to === `${unit}.${b}`)
}

/** The unit whose two coils in series (X2–X3 jumpered) this reading spans, if the sheet says so. */
function seriesPairUnit(row: ComparedRow, rows: readonly ComparedRow[]): string | null {
  const { point } = row
  if (point.kind === 'coil' && endOf(point.from) === 'X1' && endOf(point.to) === 'X4' && unitOf(point.from) === unitOf(point.to)) return unitOf(point.from)
  // an output line pair fed at both ends by one unit whose coils the sheet has in series (a 120/240 V output)
  const fromUnit = point.feeders?.[point.from]
  if (point.kind === 'line-line' && fromUnit && fromUnit === point.feeders?.[point.to] && coilRow(rows, fromUnit, 'X1', 'X4')) return fromUnit
  return null
}

function seriesPairCause(row: ComparedRow, rows: readonly ComparedRow[]): string | null {
  const unit = seriesPairUnit(row, rows)
  const ratio = ratioOf(row)
  if (!unit || ratio === null || ratio >= PAIR_ABOUT_ZERO) return null
  const first = ratioOf(coilRow(rows, unit, 'X1', 'X2'))
  const second = ratioOf(coilRow(rows, unit, 'X3', 'X4'))
  const right = (r: number | null) => r !== null && Math.abs(r - 1) <= COIL_ABOUT_RIGHT
  const dead = (r: number | null) => r !== null && r < ZERO
  if (right(first) && right(second)) {
    return `Each coil of ${unit} reads about its own voltage but the two in series read about 0 V, so the two coils are bucking: one coil is reversed (check the X2–X3 jumper and the coil marking). De-energize before moving the jumper.`
  }
  if (dead(first) && right(second)) return openCoil(unit, ['X1', 'X2'], ['X3', 'X4'])
  if (dead(second) && right(first)) return openCoil(unit, ['X3', 'X4'], ['X1', 'X2'])
  if ((first === null || second === null) && ratio < ZERO) {
    return `No voltage across the two coils of ${unit} in series: an open coil, or the two coils bucking (one coil reversed). Read each coil on its own: one at 0 V is the open coil; both reading right means they are bucking (check the X2–X3 jumper and the coil marking).`
  }
  return null
}

const openCoil = (unit: string, [a, b]: string[], [c, d]: string[]) =>
  `${a}–${b} of ${unit} reads about 0 V while ${c}–${d} reads right: an open coil (a broken winding, or a loose lead at ${a} or ${b}). De-energize and check that coil’s continuity.`

/** A single coil at about 0 V beside the unit’s other coil reading right: that coil is open. */
function deadCoilCause(row: ComparedRow, rows: readonly ComparedRow[]): string | null {
  const { point } = row
  const ratio = ratioOf(row)
  if (point.kind !== 'coil' || ratio === null || ratio >= ZERO) return null
  const unit = unitOf(point.from)
  const coil = [endOf(point.from), endOf(point.to)]
  const twin = { 'X1–X2': ['X3', 'X4'], 'X3–X4': ['X1', 'X2'] }[coil.join('–')]
  if (!twin || unitOf(point.to) !== unit) return null
  const twinRatio = ratioOf(coilRow(rows, unit, twin[0]!, twin[1]!))
  return twinRatio !== null && Math.abs(twinRatio - 1) <= COIL_ABOUT_RIGHT ? openCoil(unit, coil, twin) : null
}

/**
 * A wye secondary: no delta corner to check, no high leg, and its lines each fed by one unit
 * alone, or line to n at line to line ÷ √3.
 */
function isWyeSheet(rows: readonly ComparedRow[]): boolean {
  const kinds = rows.map((r) => r.point.kind)
  if (kinds.includes('closing-check') || kinds.includes('high-leg')) return false
  const lines = rows.filter((r) => r.point.kind === 'line-line')
  if (lines.length === 0) return false
  const fedAlone = lines.every(({ point }) => {
    const [a, b] = [point.feeders?.[point.from], point.feeders?.[point.to]]
    return a && b && a !== b
  })
  const toN = rows.filter((r) => r.point.kind === 'line-neutral' && r.expectedVolts > 0)
  const phaseToLine = toN.length > 0 && toN.every((n) => lines.every((l) => near(n.expectedVolts / l.expectedVolts, 1 / Math.sqrt(3))))
  return fedAlone || phaseToLine
}

const pairName = (p: TestPoint) => `${endOf(p.from)}–${endOf(p.to)}`

/** Two line pairs low by √3 on a wye point to one unit reversed; all three, to line-to-n readings. */
function wyeLinesCause(row: ComparedRow, rows: readonly ComparedRow[]): string | null {
  const ratio = ratioOf(row)
  if (row.point.kind !== 'line-line' || ratio === null || !isWyeSheet(rows)) return null
  const lines = rows.filter((r) => r.point.kind === 'line-line')
  const taken = lines.filter((r) => ratioOf(r) !== null)
  const third = 1 / Math.sqrt(3)
  if (taken.length === 3 && taken.every((r) => near(ratioOf(r)!, third))) {
    return 'All three line pairs read about ÷ √3, which is what line to n reads: the leads are most likely on a line and n, not on two lines. Put both leads on lines and read again.'
  }
  let low: ComparedRow[] = []
  let full: ComparedRow | null = null
  if (taken.length === 3) {
    // the two lowest read alike and about ÷ √3 of the third, whatever the third reads against the sheet
    const [m1, m2, m3] = [...taken].sort((p, q) => p.measuredVolts! - q.measuredVolts!)
    if (m3!.measuredVolts! > 0 && near(m1!.measuredVolts! / m2!.measuredVolts!, 1) && near(m1!.measuredVolts! / m3!.measuredVolts!, third) && near(m2!.measuredVolts! / m3!.measuredVolts!, third)) {
      low = [m1!, m2!]
      full = m3!
    }
  }
  else if (taken.length === 2 && lines.length === 3 && taken.every((r) => near(ratioOf(r)!, third))) {
    low = taken
  }
  if (!low.includes(row) || low.some((r) => r.status !== 'miss')) return null
  const [p, q] = [low[0]!.point, low[1]!.point]
  const common = [p.from, p.to].find((t) => t === q.from || t === q.to)
  const pairs = `${pairName(p)} and ${pairName(q)}`
  const unit = common ? p.feeders?.[common] ?? q.feeders?.[common] : undefined
  const onPhase = common ? `the unit on phase ${endOf(common)}${unit ? ` (${unit})` : ''}` : null
  if (full) {
    const against = full.status === 'ok' ? `while ${pairName(full.point)} reads right` : `of what ${pairName(full.point)} reads`
    const which = onPhase ? ` Line ${endOf(common!)} is common to both low pairs: ${onPhase} is the one reversed.` : ''
    return `${pairs} read about ÷ √3 ${against}: one unit in the wye is connected backwards, its line end and its n end swapped.${which} De-energize, then swap that unit’s two secondary leads: the one on its line and the one on n.`
  }
  const which = onPhase ? ` If so, it is ${onPhase}, on the line common to both.` : ''
  return `${pairs} both read about ÷ √3: most likely one unit in the wye is connected backwards (two readings taken line to n by mistake would read the same).${which} Read the third line pair: it reads the full line voltage when a unit is reversed.`
}

/**
 * The likely cause of one miss read with the rest of the sheet: a series pair at 0 V beside
 * coils that read right is bucking, not open; a coil at 0 V beside its twin reading right is
 * open; two line pairs of a wye at ÷ √3 are a unit reversed. Anything else is `likelyCause`.
 */
export function sheetCause(row: ComparedRow, rows: readonly ComparedRow[], ratios?: number[]): string | null {
  if (row.measuredVolts === null) return null
  const sheetRatios = ratios ?? rows.filter((r) => r.point.kind !== 'closing-check').map(ratioOf).filter((r): r is number => r !== null)
  return seriesPairCause(row, rows)
    ?? deadCoilCause(row, rows)
    ?? wyeLinesCause(row, rows)
    ?? likelyCause(row.point, row.expectedVolts, row.measuredVolts, sheetRatios)
}
