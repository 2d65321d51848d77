/**
 * Measured against predicted: within tolerance or not, and for each miss the likely cause in
 * plain words. The rules are the trade's common practice (no published source), each checked
 * by a row of tests/unit/lab-sheets.test.ts.
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
    return {
      point,
      expectedVolts,
      measuredVolts: value,
      deviationPercent: Math.round(deviation * 10) / 10,
      status: within ? 'ok' : 'miss',
      cause: within ? null : likelyCause(point, expectedVolts, value, ratios),
    }
  })
  return { tolerancePercent, scale, rows, taken, misses }
}
