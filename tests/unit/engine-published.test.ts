// Engine results against published standards and handbook values. Every row names its source;
// "from memory" marks a value recalled rather than read from the document here.
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import {
  bankKva,
  bankRating,
  nextStandardUp,
  OPEN_DELTA_OF_CLOSED,
  OPEN_DELTA_OF_TWO_UNITS,
  primaryAndSecondaryProtection,
  primaryOnlyProtection,
  solve,
  STANDARD_AMPS,
} from '#shared/engine'

const within = (actual: number, expected: number, fraction: number) => expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * fraction)

const unit120x2 = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const wye480 = { connection: 'wye' as const, lineVolts: 480 * Math.sqrt(3) }

describe('angular displacement and clock numbers', () => {
  const rows: [string, string, BankSpec, number, number][] = [
    ['IEC 60076-1 Dd0; IEEE C57.12.00: delta-delta 0°', 'Dd0', { supply: delta480, units: unit120x2, primary: 'delta', secondary: 'delta', coils: 'series' }, 0, 0],
    ['IEEE C57.12.00: delta-wye, low side lags 30°; IEC 60076-1 Dyn1', 'Dyn1', { supply: delta480, units: unit120x2, primary: 'delta', secondary: 'wye', coils: 'parallel' }, -30, 1],
    ['IEC 60076-1 Dyn11: low side leads 30°', 'Dyn11', { supply: delta480, units: unit120x2, primary: 'delta', secondary: 'wye', coils: 'parallel', shift: 'lead' }, 30, 11],
    ['IEEE C57.12.00: wye-delta, low side lags 30°; IEC 60076-1 Yd1', 'Yd1', { supply: wye480, units: unit120x2, primary: 'wye', secondary: 'delta', coils: 'series' }, -30, 1],
    ['IEC 60076-1 Yd11', 'Yd11', { supply: wye480, units: unit120x2, primary: 'wye', secondary: 'delta', coils: 'series', shift: 'lead' }, 30, 11],
    ['IEC 60076-1 Yy0; IEEE C57.12.00: wye-wye 0°', 'Yy0', { supply: wye480, units: { kva: 10, primaryVolts: 480, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single' }, 0, 0],
  ]
  it.each(rows)('%s', (_, _vector, spec, displacement, clock) => {
    const r = solve(buildBank(spec))
    expect(r.bank.displacementDegrees).not.toBeNull()
    expect(Math.abs(r.bank.displacementDegrees! - displacement)).toBeLessThan(0.5)
    expect(r.bank.clock).toBe(clock)
    expect(r.hazards).toEqual([])
  })

  it('reads the connection from the wiring: delta-wye with parallel coils', () => {
    const r = solve(buildBank(rows[1]![2]))
    expect(r.bank).toMatchObject({ primary: 'delta', secondary: 'wye', coils: 'parallel' })
  })
})

describe('open delta (handbook: √3 × one unit = 57.7 % of the closed bank = 86.6 % of the two units)', () => {
  it('ratings helper gives the published ratios (e.g. US Navy NAVEDTRA 14344, from memory)', () => {
    within(bankKva('open-delta', [10, 10]) / bankKva('delta', [10, 10, 10]), 0.577, 0.001)
    within(bankKva('open-delta', [10, 10]) / 20, 0.866, 0.001)
    within(OPEN_DELTA_OF_CLOSED, 0.577, 0.001)
    within(OPEN_DELTA_OF_TWO_UNITS, 0.866, 0.001)
  })

  it('engine: each unit of an open delta carries the full line current, so √3 × unit kVA loads each unit to 100 %', () => {
    // balanced delta load sized for √3 × 10 kVA at 240 V; a stiff supply and low impedance keep the voltage at 240 V
    const sOpen = Math.sqrt(3) * 10_000
    const ohms = (3 * 240 * 240) / sOpen
    const doc = buildBank({
      supply: { ...delta480, sourceOhms: { r: 0, x: 0 } },
      units: { ...unit120x2, impedancePercent: 0.05 },
      primary: 'open-delta',
      secondary: 'open-delta',
      coils: 'series',
      load: { ohms, connection: 'delta' },
    })
    const r = solve(doc)
    expect(r.bank.secondary).toBe('open-delta')
    const rated = 10_000 / 240
    for (const t of ['T1', 'T2']) within(r.windings[`${t}.X1-X2`]!.amps, rated, 0.005)
    for (const m of ['Mab', 'Mbc', 'Mca']) within(r.meters[m]!.volts, 240, 0.005)
  })
})

describe('DOE-HDBK-1011/4-92, Electrical Science, module ES-13 (three-phase circuits), worked examples', () => {
  it('a wye with 440 V line voltage has 254.3 V per winding (V_phase = V_line / √3)', () => {
    // a 440 V wye supply feeding three units' primaries line to neutral
    const r = solve(
      buildBank({
        supply: { connection: 'wye', lineVolts: 440 },
        units: { kva: 10, primaryVolts: 254, secondaryVolts: [120] },
        primary: 'wye',
        secondary: 'wye',
        coils: 'single',
      }),
    )
    for (const t of ['T1', 'T2', 'T3']) within(r.windings[`${t}.H1-H2`]!.volts, 254.3, 0.005)
  })

  it('and the other way: windings of 254.3 V in wye make 440 V line to line', () => {
    const r = solve(
      buildBank({ supply: delta480, units: { kva: 10, primaryVolts: 480, secondaryVolts: [254.3] }, primary: 'delta', secondary: 'wye', coils: 'single' }),
    )
    for (const m of ['Mab', 'Mbc', 'Mca']) within(r.meters[m]!.volts, 440, 0.005)
  })

  it('a delta with 10.4 A line current carries 6 A in each winding (I_phase = I_line / √3)', () => {
    // a delta secondary feeding a balanced wye load (its star floating) that draws 10.4 A per line
    const ohms = 240 / Math.sqrt(3) / 10.4
    const r = solve(
      buildBank({
        supply: { ...delta480, sourceOhms: { r: 0, x: 0 } },
        units: { ...unit120x2, impedancePercent: 0.01 },
        primary: 'delta',
        secondary: 'delta',
        coils: 'series',
        load: { ohms, connection: 'wye' },
      }),
    )
    within(r.windings['T1.X1-X2']!.amps, 6.0, 0.005)
    within(r.windings['T2.X3-X4']!.amps, 6.0, 0.005)
  })
})

describe('percent impedance: I_fault = I_rated / Z_pu (BCcampus, "Single-Phase Transformers", Percent Impedance)', () => {
  it.each([
    [10, 3],
    [25, 2],
    [50, 4.5],
  ])('%s kVA at %s percent impedance, secondary bolted short, stiff supply', (kva, z) => {
    const r = solve({
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480, sourceOhms: { r: 0, x: 0 } },
        { id: 'T1', kind: 'transformer', kva, primaryVolts: 480, secondaryVolts: [120, 120], impedancePercent: z },
      ],
      // a jumper straight across the secondary: the bolted short
      wires: [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['T1.X2', 'T1.X3'], ['T1.X1', 'T1.X4']],
    })
    const rated = (kva * 1000) / 240
    within(r.windings['T1.X1-X2']!.amps, rated / (z / 100), 0.005)
    expect(r.hazards.map((h) => h.code)).toContain('fault-current')
  })
})

describe('NEC Table 450.3(B) with NEC 240.6(A) standard sizes (2023 / 2017 editions, from memory)', () => {
  it('240.6(A) lists the standard ratings in order, from 15 A to 6000 A', () => {
    expect(STANDARD_AMPS.slice(0, 8)).toEqual([15, 20, 25, 30, 35, 40, 45, 50])
    expect(STANDARD_AMPS).toContain(110)
    expect(STANDARD_AMPS.at(-1)).toBe(6000)
  })

  it.each([
    // primary current, table percent, max device: [source of the row]
    [20.8, 125, 30, '45 kVA at 480 V: 125 % = 26 A, Note 1 permits the next higher standard size, 30 A'],
    [54.1, 125, 70, '45 kVA 3φ at 480 V: 67.6 A → 70 A (Note 1)'],
    [40, 125, 50, '125 % of 40 A = 50 A, itself a standard size'],
    [6, 167, 10, 'below 9 A: 167 % of 6 A = 10.0 A, not exceeded: 10 A (an additional fuse rating)'],
    [5, 167, 6, 'below 9 A: 8.35 A rounds down to 6 A'],
    [1.5, 300, 3, 'below 2 A: 300 % = 4.5 A rounds down to 3 A'],
  ])('primary only: %s A at %s percent → %s A (%s)', (amps, percent, device) => {
    const p = primaryOnlyProtection(amps)
    expect(p.percent).toBe(percent)
    expect(p.maxDeviceAmps).toBe(device)
  })

  it('primary and secondary: primary 250 %, secondary 125 % (Note 1) at 9 A or more, 167 % below', () => {
    const big = primaryAndSecondaryProtection(20.8, 41.7)
    expect(big.primary).toMatchObject({ percent: 250, maxDeviceAmps: 50 }) // 52 A rounds down to 50 A
    expect(big.secondary).toMatchObject({ percent: 125, maxDeviceAmps: 60 }) // 52.1 A → next higher, 60 A
    const small = primaryAndSecondaryProtection(3, 7)
    expect(small.secondary).toMatchObject({ percent: 167, maxDeviceAmps: 10 }) // 11.69 A rounds down to 10 A
  })

  it('a bank rating combines capacity, full-load currents and device limits', () => {
    // three 10 kVA units, 480 V delta to 240 V: 30 kVA, 36.1 A primary, 72.2 A secondary
    const r = bankRating('delta', [10, 10, 10], 480, 240)
    within(r.kva, 30, 1e-9)
    within(r.primaryAmps, 36.08, 0.001)
    within(r.secondaryAmps, 72.17, 0.001)
    expect(r.primaryOnly.maxDeviceAmps).toBe(nextStandardUp(36.08 * 1.25)) // 45.1 A → 50 A
    expect(r.primaryOnly.maxDeviceAmps).toBe(50)
  })
})
