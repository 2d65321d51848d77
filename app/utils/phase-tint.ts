import type { PhaseColourSet } from '#shared/phase-colours'
import type { Reading } from '#shared/engine'

/**
 * Which phase a conductor belongs to, from its voltage to ground: the nearest of A (0°),
 * B (−120°) and C (+120°) for ABC rotation; neutral when it sits near ground.
 */
export function phaseOf(reading: Reading | undefined, rotation: 'ABC' | 'ACB', supplyPhaseVolts: number): 'A' | 'B' | 'C' | 'N' | null {
  if (!reading || supplyPhaseVolts <= 0) return null
  if (reading.volts < 0.05 * supplyPhaseVolts) return 'N'
  const angles = rotation === 'ABC' ? { A: 0, B: -120, C: 120 } : { A: 0, B: 120, C: -120 }
  let best: 'A' | 'B' | 'C' = 'A'
  let bestGap = Infinity
  for (const p of ['A', 'B', 'C'] as const) {
    const gap = Math.abs(((reading.degrees - angles[p] + 540) % 360) - 180)
    if (gap < bestGap) {
      bestGap = gap
      best = p
    }
  }
  return best
}

export function phaseColour(set: PhaseColourSet, phase: 'A' | 'B' | 'C' | 'N'): string {
  return phase === 'N' ? set.neutral.screen : set.phases[phase].screen
}
