/**
 * Common nameplate sizes, for "the smallest standard size that carries it".
 * Lists as recalled from makers' catalogues of dry-type and distribution transformers
 * (ANSI C57.12 ratings, from memory): they are the usual steps, not a rule.
 */

/** single-phase units, kVA */
export const STANDARD_UNIT_KVA = [3, 5, 7.5, 10, 15, 25, 37.5, 50, 75, 100, 167, 250, 333, 500] as const
/** three-phase transformers (and banks), kVA */
export const STANDARD_THREE_PHASE_KVA = [3, 6, 9, 15, 30, 45, 75, 112.5, 150, 225, 300, 500, 750, 1000] as const

/** The smallest size in `sizes` at or above `kva`, or null past the list. */
export function smallestStandard(kva: number, sizes: readonly number[] = STANDARD_UNIT_KVA): number | null {
  return sizes.find((s) => s >= kva - 1e-9) ?? null
}

/** Apparent power of a balanced three-phase load: √3 × line volts × line amps, in kVA. */
export const threePhaseKva = (lineVolts: number, lineAmps: number) => (Math.sqrt(3) * lineVolts * lineAmps) / 1000
