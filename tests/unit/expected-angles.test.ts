// What a correct bank reads at each meter, by angle as well as size (expected.ts), and how a
// reading is compared with it (checkReading).
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { parseCircuit } from '#shared/circuit/parse'
import { checkReading, expectedReadings, solve } from '#shared/engine'

const unit = { kva: 25, primaryVolts: 480, secondaryVolts: [120, 120] }
const base = { supply: { connection: 'delta', lineVolts: 480 }, units: unit, primary: 'delta', coils: 'series', breaker: { amps: 150, closed: true }, fuseAmps: 125 } as const
function expected(spec: Partial<BankSpec>) {
  const parsed = parseCircuit(buildBank({ ...base, secondary: 'delta', ...spec } as BankSpec))
  if (!parsed.ok) throw new Error('invalid test bank')
  const r = solve(parsed.circuit)
  return { r, e: expectedReadings(parsed.circuit, r) }
}

describe('expected angles', () => {
  it.each([
    // circuit-format.md: V(A−B) of the supply at 30° for ABC; a delta–delta has no shift (IEC 60076-1 Dd0)
    ['delta–delta, ABC (IEC 60076-1 Dd0)', { secondary: 'delta' }, { Mab: 30, Mbc: -90, Mca: 150 }],
    // IEEE C57.12.00: the low side of a delta–wye lags 30°; line to n lags its line pair 30° more
    ['delta–wye, ABC (IEEE C57.12.00, low side lags 30°)', { secondary: 'wye' }, { Mab: 0, Mbc: -120, Mca: 120, Man: -30, Mbn: -150, Mcn: 90 }],
    // ACB rotation: B and C swap (circuit-format.md), the same bank then leads 30°
    ['delta–wye, ACB (circuit-format.md rotation)', { supply: { connection: 'delta', lineVolts: 480, rotation: 'ACB' }, secondary: 'wye' }, { Mab: 0, Mbc: 120, Mca: -120, Man: 30, Mbn: 150, Mcn: -90 }],
    // high-leg delta: n is the middle of the lighting unit, the high leg stands √3/2 × line off it (common practice)
    ['high-leg delta (common practice)', { secondary: 'high-leg' }, { Man: -30, Mbn: -120, Mcn: 150 }],
  ] as [string, Partial<BankSpec>, Record<string, number>][])('%s', (_name, spec, angles) => {
    const { r, e } = expected(spec)
    for (const [id, deg] of Object.entries(angles)) {
      expect(e[id]!.degrees).toBeCloseTo(deg, 1)
      expect(checkReading(r.meters[id]!, e[id]!)).toEqual({ voltsOff: null, degreesOff: null })
    }
  })

  it('a closing check and a single-phase bank expect no angle', () => {
    expect(expected({ openCorner: true }).e.MC).toEqual(expect.not.objectContaining({ degrees: expect.anything() }))
    const single = expected({ primary: 'single', secondary: 'single' }).e
    for (const x of Object.values(single)) expect(x.degrees).toBeUndefined()
  })
})

describe('checkReading', () => {
  const e = { volts: 240, degrees: -90, basis: '' }
  it.each([
    ['right size and angle', { volts: 241, degrees: -88 }, { voltsOff: null, degreesOff: null }],
    ['right size, 120° off', { volts: 240, degrees: 30 }, { voltsOff: null, degreesOff: 120 }],
    ['right size, reversed (180°)', { volts: 240, degrees: 90 }, { voltsOff: null, degreesOff: 180 }],
    ['angle across ±180° wraps', { volts: 240, degrees: 175 }, { voltsOff: null, degreesOff: -95 }],
    ['right angle, wrong size', { volts: 415.7, degrees: -90 }, { voltsOff: 175.7, degreesOff: null }],
    ['near 0 V: no angle to compare', { volts: 2, degrees: 70 }, { voltsOff: -238, degreesOff: null }],
  ])('%s', (_name, reading, want) => {
    const got = checkReading(reading, e)
    expect(got.degreesOff === null ? null : Math.round(got.degreesOff)).toBe(want.degreesOff)
    expect(got.voltsOff === null ? null : Math.round(got.voltsOff * 10) / 10).toBe(want.voltsOff)
  })
})
