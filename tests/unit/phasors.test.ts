// The phasors the Bench draws, read from solve results of the starters.
import { describe, expect, it } from 'vitest'
import type { Circuit } from '#shared/circuit/schema'
import { solve } from '#shared/engine'
import { difference, formatAngle, formatReading, phasorView } from '#shared/phasors'
import { starterBySlug } from '#shared/starters'

function closed(slug: string): Circuit {
  const doc = starterBySlug(slug)!.document
  const cb1 = doc.components.find((c) => c.id === 'CB1')
  if (cb1?.kind === 'breaker') cb1.closed = true
  return doc
}

describe('difference and formats', () => {
  it('subtracts readings as complex numbers: 1∠0° − 1∠120° = √3∠−30°', () => {
    const d = difference({ volts: 1, degrees: 0 }, { volts: 1, degrees: 120 })
    expect(d.volts).toBeCloseTo(Math.sqrt(3), 9)
    expect(d.degrees).toBeCloseTo(-30, 9)
    expect(difference({ volts: 5, degrees: 10 }, { volts: 5, degrees: 10 })).toEqual({ volts: 0, degrees: 0 })
    expect(difference({ volts: 0, degrees: 0 }, { volts: 2, degrees: 0 }).degrees).toBe(180)
  })

  it('reads like a meter, with a true minus sign', () => {
    expect(formatReading({ volts: 239.84, degrees: 30 })).toBe('239.8 V ∠ 30.0°')
    expect(formatReading({ volts: 120, degrees: -150.04 })).toBe('120.0 V ∠ −150.0°')
    expect(formatAngle(-0.01)).toBe('0.0°')
  })
})

describe('phasorView', () => {
  it('is empty when not energized or without a result', () => {
    const doc = starterBySlug('closed-delta-240')!.document
    for (const result of [solve(doc), null]) {
      expect(phasorView(result, doc)).toMatchObject({ energized: false, primary: [], secondary: [], vectorGroup: null })
    }
  })

  it('closed delta: 480 V primary at 30°, −90°, 150° and 240 V secondary in phase (IEC 60076-1 Dd0)', () => {
    const doc = closed('closed-delta-240')
    const v = phasorView(solve(doc), doc)
    expect(v.primary.map((p) => p.name)).toEqual(['A–B', 'B–C', 'C–A'])
    expect(v.primary.map((p) => Math.round(p.degrees))).toEqual([30, -90, 150])
    for (const p of v.primary) expect(p.volts).toBeCloseTo(480, 0)
    expect(v.secondary.map((p) => p.name)).toEqual(['a–b', 'b–c', 'c–a'])
    for (const p of v.secondary) expect(Math.abs(p.volts - 240)).toBeLessThan(2.4)
    expect(v.vectorGroup).toBe('Dd0')
  })

  it('delta-wye: line to n phasors from the wired neutral, and Dyn1 (IEEE C57.12.00 lag, IEC 60076-1)', () => {
    const doc = closed('delta-wye-208y120')
    const v = phasorView(solve(doc), doc)
    expect(v.secondary.map((p) => `${p.name}:${p.between}`)).toEqual(['a–b:lines', 'b–c:lines', 'c–a:lines', 'a–n:line-neutral', 'b–n:line-neutral', 'c–n:line-neutral'])
    expect(v.secondary.every((p) => !p.highLeg)).toBe(true)
    expect(v.vectorGroup).toBe('Dyn1')
    expect(v.clock).toBe(1)
  })

  it('high-leg delta: b–n is the high leg (common practice: about 208 V)', () => {
    const doc = closed('high-leg-delta-240-120')
    const v = phasorView(solve(doc), doc)
    expect(v.secondary.filter((p) => p.highLeg).map((p) => p.name)).toEqual(['b–n'])
    // a delta with a tap: "n" in IEC 60076-1 is for a star point, so no n here
    expect(v.vectorGroup).toBe('Dd0')
  })

  it('single unit: one secondary phasor, and no vector group for a single-phase bank', () => {
    const doc = closed('single-unit-parallel-120')
    const v = phasorView(solve(doc), doc)
    expect(v.secondary.map((p) => p.name)).toEqual(['a–b'])
    expect(v.secondary[0]!.volts).toBeCloseTo(120, 0)
    expect(v.vectorGroup).toBeNull()
  })

  it('open delta: no IEC letter for an open bank, so no vector group', () => {
    const doc = closed('open-delta-240')
    expect(phasorView(solve(doc), doc).vectorGroup).toBeNull()
  })
})
