/**
 * Time-current behaviour of fuses and breakers: an inverse-time region and an instantaneous
 * region. These are generic curves for teaching and planning, not any maker's published
 * curve; real devices differ, and the maker's curve and local code come first.
 *
 * Basis (points from memory of the standards, as stated; the product and its tests say so):
 * - Time-delay fuse (UL 248 dual element, e.g. class RK5 or J time-delay): carries 110 % of
 *   its rating, opens at 135 % within one hour and at 200 % within two minutes (UL 248
 *   conventional points for ≤ 30 A); a time-delay fuse must hold at least 10 s at 500 %
 *   (UL 248's definition of time delay). Its short-circuit link is current-limiting (clears in
 *   half a cycle) only far above rating: here from 30 × In (common practice).
 *   IEC 60269-1 gG (conventional fusing current 1.6 × In within 1 h) agrees with this curve.
 * - Fast-acting fuse (UL 248 non-time-delay): the same conventional points at 135 % and
 *   200 %, but no time delay: a few tenths of a second at 500 % and current-limiting, half a
 *   cycle, from 10 × In (common practice, from memory).
 * - Breaker (UL 489 thermal-magnetic): carries its rating (we hold to 110 %), trips at 135 %
 *   within one hour and at 200 % within two minutes for frames up to 30 A (UL 489 calibration
 *   points, from memory); the thermal part is t = K / (M² − M₀²), M = I / In, M₀ = 1.1.
 *   Magnetic trip from 10 × In within one cycle (fixed-trip breakers are commonly set
 *   5–10 × In; common practice).
 * A fuse curve between its points is a straight line on log–log paper, as makers draw them.
 */
import type { FuseCurve } from '../circuit/schema'

/** The curves the engine knows: a fuse's class, or a breaker's. */
export type CurveName = FuseCurve | 'breaker'

export interface Curve {
  /** the multiple of rating below which the device never operates */
  holdMultiple: number
  /** inverse-time region: (multiple of rating, seconds) points, log–log between them (fuses) */
  points?: readonly (readonly [number, number])[]
  /** inverse-time region as a thermal model K / (M² − M₀²), K in seconds (breakers) */
  thermalK?: number
  /** the multiple of rating from which the instantaneous region applies */
  instantaneousMultiple: number
  /** operating time in the instantaneous region, in cycles of the supply frequency */
  instantaneousCycles: number
}

export const CURVES: Record<CurveName, Curve> = {
  'time-delay': {
    holdMultiple: 1.1,
    // 135 %: 30 min (≤ 1 h); 200 %: 60 s (≤ 2 min); 500 %: 12 s (≥ 10 s); 10 ×: 1.5 s; 20 ×: 0.12 s
    points: [[1.1, 3600 * 24], [1.35, 1800], [2, 60], [5, 12], [10, 1.5], [20, 0.12], [30, 0.02]],
    instantaneousMultiple: 30,
    instantaneousCycles: 0.5,
  },
  'fast-acting': {
    holdMultiple: 1.1,
    // 135 %: 10 min; 200 %: 10 s; 500 %: 0.3 s; 10 ×: half a cycle (current-limiting)
    points: [[1.1, 3600 * 24], [1.35, 600], [2, 10], [5, 0.3], [10, 0.5 / 60]],
    instantaneousMultiple: 10,
    instantaneousCycles: 0.5,
  },
  // at 1.35 × In: 300 / (1.8225 − 1.21) = 490 s ≤ 3600 s; at 2 × In: 108 s ≤ 120 s
  breaker: { holdMultiple: 1.1, thermalK: 300, instantaneousMultiple: 10, instantaneousCycles: 1 },
}

/** Longest time the protection study looks ahead: one hour (the UL 248 / UL 489 conventional time). */
export const HORIZON_SECONDS = 3600

/**
 * Energizing inrush: about 12 × the rated primary current for 0.1 s (common practice of the
 * trade for distribution transformers; the real first peak depends on the switching instant
 * and the core's remanence). A device that would open within that time trips on energizing.
 */
export const INRUSH_MULTIPLE = 12
export const INRUSH_SECONDS = 0.1

export interface Operation {
  seconds: number
  region: 'instantaneous' | 'inverse-time'
}

function alongPoints(points: readonly (readonly [number, number])[], m: number): number {
  for (let k = 1; k < points.length; k++) {
    const [m1, t1] = points[k]!
    if (m > m1 && k < points.length - 1) continue
    const [m0, t0] = points[k - 1]!
    const slope = Math.log(t1 / t0) / Math.log(m1 / m0)
    return t0 * Math.exp(slope * Math.log(m / m0))
  }
  return points[points.length - 1]![1]
}

/** How long the device takes to operate at a steady current, or null if it never does (within the horizon). */
export function operatingTime(curve: CurveName, ratedAmps: number, amps: number, hz: number): Operation | null {
  const c = CURVES[curve]
  const m = amps / ratedAmps
  if (!(m > c.holdMultiple) || !Number.isFinite(m)) return m === Infinity ? { seconds: c.instantaneousCycles / hz, region: 'instantaneous' } : null
  if (m >= c.instantaneousMultiple) return { seconds: c.instantaneousCycles / hz, region: 'instantaneous' }
  const seconds = c.points ? alongPoints(c.points, m) : c.thermalK! / (m * m - c.holdMultiple * c.holdMultiple)
  return seconds <= HORIZON_SECONDS ? { seconds, region: 'inverse-time' } : null
}

/** The curve a fuse or breaker of the document follows. */
export function curveOf(device: { kind: 'fuse'; curve: FuseCurve } | { kind: 'breaker' }): CurveName {
  return device.kind === 'fuse' ? device.curve : 'breaker'
}
