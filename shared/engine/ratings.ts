/**
 * Bank ratings and overcurrent sizes.
 *
 * - Bank capacity: a closed delta or wye of three units carries 3 × one unit; an open delta
 *   (two units) carries √3 × one unit, which is 57.7 % of the three-unit bank and 86.6 % of
 *   the two units' sum (the standard handbook result, e.g. the US Navy electricity training
 *   manual NAVEDTRA 14344, from memory; it follows from the line current of the open bank
 *   being each unit's full coil current). With units of different sizes the balanced
 *   three-phase capacity is set by the smallest unit.
 * - Overcurrent: NEC Table 450.3(B), transformers 1000 V and less (2023 edition, from memory):
 *   primary only — 125 % at 9 A or more (Note 1: the next higher standard rating is permitted),
 *   167 % below 9 A, 300 % below 2 A; primary and secondary — primary 250 %, secondary 125 % at
 *   9 A or more (Note 1 again) and 167 % below 9 A. Where Note 1 does not apply, the device may
 *   not exceed the percentage, so the size rounds down to a standard rating.
 * - Standard ratings: NEC 240.6(A) (2017 list, from memory), with the additional fuse
 *   ratings 1, 3, 6, 10 and 601 A.
 */

export type BankConnection = 'delta' | 'wye' | 'open-delta' | 'open-wye' | 'single-phase'

/** NEC 240.6(A) standard ampere ratings of fuses and inverse-time breakers. */
export const STANDARD_AMPS = [
  15, 20, 25, 30, 35, 40, 45, 50, 60, 70, 80, 90, 100, 110, 125, 150, 175, 200, 225, 250, 300, 350, 400, 450, 500, 600, 700, 800, 1000,
  1200, 1600, 2000, 2500, 3000, 4000, 5000, 6000,
] as const
/** NEC 240.6(A): additional standard ratings for fuses. */
export const ADDITIONAL_FUSE_AMPS = [1, 3, 6, 10, 601] as const

const FUSE_SIZES = [...new Set([...STANDARD_AMPS, ...ADDITIONAL_FUSE_AMPS])].sort((a, b) => a - b)

/** Balanced three-phase (or single-phase) capacity of a bank, in kVA. */
export function bankKva(connection: BankConnection, unitKva: number[]): number {
  if (unitKva.length === 0) return 0
  const smallest = Math.min(...unitKva)
  switch (connection) {
    case 'delta':
    case 'wye':
      return 3 * smallest
    case 'open-delta':
    case 'open-wye':
      return Math.sqrt(3) * smallest
    case 'single-phase':
      return smallest
  }
}

/** An open bank's share of the closed three-unit bank (1/√3 = 57.7 %) and of its own two units (√3/2 = 86.6 %). */
export const OPEN_DELTA_OF_CLOSED = 1 / Math.sqrt(3)
export const OPEN_DELTA_OF_TWO_UNITS = Math.sqrt(3) / 2

/** Full-load line current: kVA × 1000 / (√3 × V) for three phases, kVA × 1000 / V for one. */
export function fullLoadAmps(kva: number, lineVolts: number, phases: 1 | 3 = 3): number {
  return (kva * 1000) / (phases === 3 ? Math.sqrt(3) * lineVolts : lineVolts)
}

/** Round up to the next standard rating (NEC 450.3(B) Note 1). */
export function nextStandardUp(amps: number): number | null {
  return FUSE_SIZES.find((s) => s >= amps - 1e-9) ?? null
}

/** Round down to the largest standard rating that does not exceed the limit. */
export function nextStandardDown(amps: number): number | null {
  let best: number | null = null
  for (const s of FUSE_SIZES) if (s <= amps + 1e-9) best = s
  return best
}

export interface DeviceLimit {
  /** the percentage of full-load current the table allows */
  percent: number
  /** full-load current × percent */
  limitAmps: number
  /** the largest standard device permitted */
  maxDeviceAmps: number | null
  /** whether Note 1 (next higher standard rating) was applied */
  roundedUp: boolean
  rule: string
}

function limit(amps: number, percent: number, note1: boolean, rule: string): DeviceLimit {
  const limitAmps = (amps * percent) / 100
  const maxDeviceAmps = note1 ? nextStandardUp(limitAmps) : nextStandardDown(limitAmps)
  return { percent, limitAmps, maxDeviceAmps, roundedUp: note1 && maxDeviceAmps !== null && maxDeviceAmps > limitAmps + 1e-9, rule }
}

/** NEC Table 450.3(B), primary protection only. */
export function primaryOnlyProtection(primaryAmps: number): DeviceLimit {
  if (primaryAmps >= 9) return limit(primaryAmps, 125, true, 'NEC 450.3(B), primary only, 9 A or more: 125 % (Note 1)')
  if (primaryAmps >= 2) return limit(primaryAmps, 167, false, 'NEC 450.3(B), primary only, less than 9 A: 167 %')
  return limit(primaryAmps, 300, false, 'NEC 450.3(B), primary only, less than 2 A: 300 %')
}

/** NEC Table 450.3(B), primary and secondary protection. */
export function primaryAndSecondaryProtection(primaryAmps: number, secondaryAmps: number): { primary: DeviceLimit; secondary: DeviceLimit } {
  return {
    primary: limit(primaryAmps, 250, false, 'NEC 450.3(B), primary and secondary: primary 250 %'),
    secondary:
      secondaryAmps >= 9
        ? limit(secondaryAmps, 125, true, 'NEC 450.3(B), primary and secondary: secondary 9 A or more, 125 % (Note 1)')
        : limit(secondaryAmps, 167, false, 'NEC 450.3(B), primary and secondary: secondary less than 9 A, 167 %'),
  }
}

export interface BankRating {
  kva: number
  primaryAmps: number
  secondaryAmps: number
  primaryOnly: DeviceLimit
  primaryAndSecondary: { primary: DeviceLimit; secondary: DeviceLimit }
}

/** Capacity, full-load line currents and NEC 450.3(B) device limits of a bank. */
export function bankRating(connection: BankConnection, unitKva: number[], primaryLineVolts: number, secondaryLineVolts: number): BankRating {
  const kva = bankKva(connection, unitKva)
  const phases = connection === 'single-phase' ? 1 : 3
  const primaryAmps = fullLoadAmps(kva, primaryLineVolts, phases)
  const secondaryAmps = fullLoadAmps(kva, secondaryLineVolts, phases)
  return {
    kva,
    primaryAmps,
    secondaryAmps,
    primaryOnly: primaryOnlyProtection(primaryAmps),
    primaryAndSecondary: primaryAndSecondaryProtection(primaryAmps, secondaryAmps),
  }
}
