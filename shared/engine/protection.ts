/**
 * Time-current behaviour of fuses and breakers: an inverse-time region and an
 * instantaneous region. These are generic curves for teaching and planning, not any maker's
 * published curve; real devices differ, and the maker's curve and local code come first.
 *
 * Basis (the points are from memory of the standards, as stated):
 * - Fuse (UL 248 time-delay class, dual element): carries 110 % of its rating indefinitely,
 *   opens at 135 % within one hour and at 200 % within about two minutes (UL 248 conventional
 *   points, from memory; IEC 60269-1 gG: conventional fusing current 1.6 × In within 1 h,
 *   consistent with this curve). Above 10 × In the short-circuit link clears within half a
 *   cycle (current-limiting; common practice, from memory).
 * - Breaker (UL 489 thermal-magnetic): carries 100 % (we hold to 110 % here), trips at 135 %
 *   within one hour and at 200 % within two minutes for frames up to 30 A (UL 489 calibration
 *   points, from memory). Magnetic trip above 10 × In within one cycle (fixed-trip
 *   thermal-magnetic breakers are commonly set 5–10 × In; common practice, from memory).
 * The inverse-time part is a thermal model t = K / (M² − M₀²) with M = I / In, M₀ = 1.1.
 */

export type DeviceKind = 'fuse' | 'breaker'

export interface Curve {
  /** the multiple of rating below which the device never operates */
  holdMultiple: number
  /** K of the inverse-time region, seconds */
  thermalK: number
  /** the multiple of rating from which the instantaneous region applies */
  instantaneousMultiple: number
  /** operating time in the instantaneous region, in cycles of the supply frequency */
  instantaneousCycles: number
}

export const CURVES: Record<DeviceKind, Curve> = {
  // at 1.35 × In: 150 / (1.8225 − 1.21) = 245 s ≤ 3600 s; at 2 × In: 54 s ≤ 120 s
  fuse: { holdMultiple: 1.1, thermalK: 150, instantaneousMultiple: 10, instantaneousCycles: 0.5 },
  // at 1.35 × In: 490 s ≤ 3600 s; at 2 × In: 108 s ≤ 120 s
  breaker: { holdMultiple: 1.1, thermalK: 300, instantaneousMultiple: 10, instantaneousCycles: 1 },
}

/** Longest time the protection study looks ahead: one hour (the UL 248 / UL 489 conventional time). */
export const HORIZON_SECONDS = 3600

export interface Operation {
  seconds: number
  region: 'instantaneous' | 'inverse-time'
}

/** How long the device takes to operate at a steady current, or null if it never does. */
export function operatingTime(kind: DeviceKind, ratedAmps: number, amps: number, hz: number): Operation | null {
  const c = CURVES[kind]
  const m = amps / ratedAmps
  if (!(m > c.holdMultiple)) return null
  if (m >= c.instantaneousMultiple) return { seconds: c.instantaneousCycles / hz, region: 'instantaneous' }
  const seconds = c.thermalK / (m * m - c.holdMultiple * c.holdMultiple)
  return seconds <= HORIZON_SECONDS ? { seconds, region: 'inverse-time' } : null
}
