// The Site check plan against published values and hand calculations. Every row names its
// source; "from memory" marks a value recalled rather than read from the document here.
import { describe, expect, it } from 'vitest'
import { bankKva, expectedReadings, fullLoadAmps, OPEN_DELTA_OF_CLOSED, OPEN_DELTA_OF_TWO_UNITS, primaryAndSecondaryProtection, primaryOnlyProtection, solve } from '#shared/engine'
import { parseCircuit } from '#shared/circuit/parse'
import {
  exampleSiteCheck,
  planSiteCheck,
  SiteCheckInputSchema,
  smallestStandard,
  STANDARD_THREE_PHASE_KVA,
  STANDARD_UNIT_KVA,
  threePhaseKva,
  type SiteCheckInputRaw,
  type SiteConnection,
} from '#shared/site-check'

const within = (actual: number, expected: number, fraction: number) => expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * fraction)
const unit = (kva: number, primaryVolts: number, secondaryVolts: number[], impedancePercent = 3) => ({ kva, primaryVolts, secondaryVolts, impedancePercent })
const input = (raw: Partial<SiteCheckInputRaw> & Pick<SiteCheckInputRaw, 'connection' | 'units'>) =>
  SiteCheckInputSchema.parse({ name: 'test bank', supply: { lineVolts: 480, connection: 'delta' }, ...raw })
const reading = (plan: ReturnType<typeof planSiteCheck>, label: string) => {
  const p = plan.testPoints.find((t) => t.label === label)
  if (!p) throw new Error(`no test point ${label}: ${plan.testPoints.map((t) => t.label).join(', ')}`)
  return p.expectedVolts
}

describe('open delta: √3 × one unit, 57.7 % of the closed bank, 86.6 % of the two units', () => {
  const plan = planSiteCheck(input({ connection: 'open-delta', units: [unit(25, 480, [120, 120]), unit(25, 480, [120, 120])], loads: { threePhaseKva: 30, powerFactor: 0.9 } }))
  it.each([
    ['57.7 % of the closed three-unit bank (handbook ratio 1/√3; US Navy NAVEDTRA 14344, from memory)', plan.capacity.openDelta!.ofClosedPercent, 57.7],
    ['86.6 % of the two units’ sum (handbook ratio √3/2; same source, from memory)', plan.capacity.openDelta!.ofUnitsPercent, 86.6],
    ['bank capacity √3 × 25 kVA = 43.3 kVA (hand calculation)', plan.capacity.kva, 43.3],
    ['the closed bank it stands for: 3 × 25 = 75 kVA', plan.capacity.openDelta!.closedBankKva, 75],
  ])('%s', (_, actual, expected) => {
    expect(actual).toBeCloseTo(expected, 1)
  })
  it('the ratios agree with ratings.ts', () => {
    within(plan.capacity.kva / bankKva('delta', [25, 25, 25]), OPEN_DELTA_OF_CLOSED, 0.002)
    within(plan.capacity.kva / 50, OPEN_DELTA_OF_TWO_UNITS, 0.002)
  })
  it('each unit carries the line current: 30 kVA on 43.3 kVA is about 69 % (hand calculation; the engine a little less for the voltage drop)', () => {
    for (const u of plan.loading) {
      expect(u.percent).toBeGreaterThan(64)
      expect(u.percent).toBeLessThanOrEqual(69.5)
    }
  })
  it('an open delta has no closing check (no closed loop) and reads 240 V on all three line pairs', () => {
    expect(plan.testPoints.some((t) => t.kind === 'closing-check')).toBe(false)
    for (const l of ['a–b', 'b–c', 'c–a']) within(reading(plan, l), 240, 0.002)
  })
})

describe('expected readings at every test point', () => {
  const rows: [string, SiteConnection, 'wye' | 'delta', number[], number, Record<string, number>][] = [
    ['high-leg delta: b–n = 240 × √3 / 2 = 207.8 V (NEC 110.15 informational note; hand calculation)', 'high-leg-delta', 'delta', [120, 120], 480, { 'a–b': 240, 'c–a': 240, 'a–n': 120, 'c–n': 120, 'b–n (high leg)': 207.8, 'T3 coil X1–X2': 120 }],
    ['delta–wye 480 V to 208Y/120 V: 120 × √3 = 207.8 V line to line (hand calculation)', 'delta-wye', 'delta', [120], 480, { 'a–b': 207.8, 'a–n': 120, 'T1 primary H1–H2': 480 }],
    ['wye–delta 480Y/277 V to 240 V: 277 V on each primary (480 / √3, hand calculation)', 'wye-delta', 'wye', [120, 120], 277.13, { 'T1 primary H1–H2': 277.1, 'a–b': 240 }],
    ['wye–wye 480Y/277 V to 208Y/120 V (hand calculation)', 'wye-wye', 'wye', [120], 277.13, { 'a–n': 120, 'a–b': 207.8 }],
    ['closed delta 480 V to 240 V (hand calculation)', 'closed-delta', 'delta', [120, 120], 480, { 'a–b': 240, 'T2 coil X3–X4': 120 }],
  ]
  it.each(rows)('%s', (_, connection, supply, coils, primaryVolts, expected) => {
    const plan = planSiteCheck(input({ connection, supply: { lineVolts: 480, connection: supply }, units: [0, 1, 2].map(() => unit(25, primaryVolts, coils)) }))
    for (const [label, volts] of Object.entries(expected)) within(reading(plan, label), volts, 0.002)
    expect(plan.hazards).toEqual([])
  })

  it('a delta secondary: primaries and coils with the corner open, then the closing check near 0 V, then the lines', () => {
    const plan = planSiteCheck(exampleSiteCheck())
    const kinds = plan.testPoints.map((t) => t.kind)
    expect(kinds.indexOf('closing-check')).toBeGreaterThan(kinds.lastIndexOf('coil'))
    expect(kinds.indexOf('closing-check')).toBeLessThan(kinds.indexOf('line'))
    expect(plan.testPoints.find((t) => t.kind === 'closing-check')!.expectedVolts).toBeLessThan(1)
    expect(plan.testPoints.map((t) => t.step)).toEqual(plan.testPoints.map((_, i) => i + 1))
    // 3 primaries, 6 coils, 1 closing check, 3 lines, 3 to neutral
    expect(plan.testPoints).toHaveLength(16)
  })

  it('a unit connected backwards reads about twice the 240 V winding across the open corner (product.md; hand calculation)', () => {
    within(planSiteCheck(exampleSiteCheck()).reversedClosingVolts!, 480, 0.01)
  })

  it('the Bench document is a valid circuit: breaker open, corner open with MC across it, solves de-energized', () => {
    const plan = planSiteCheck(exampleSiteCheck())
    const parsed = parseCircuit(plan.document)
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors))
    const doc = parsed.circuit
    expect(doc.components.find((c) => c.id === 'CB1')).toMatchObject({ kind: 'breaker', closed: false })
    expect(doc.components.some((c) => c.id === 'MC')).toBe(true)
    expect(doc.layout).toBeDefined()
    expect(solve(plan.document).energized).toBe(false)
  })

  it('on the Bench, the ratio\'s prediction for that document agrees with the plan: the high leg is b–n even with the corner open', () => {
    const plan = planSiteCheck(exampleSiteCheck())
    const parsed = parseCircuit(plan.document)
    if (!parsed.ok) throw new Error(JSON.stringify(parsed.errors))
    const energized = { ...parsed.circuit, components: parsed.circuit.components.map((c) => (c.kind === 'breaker' ? { ...c, closed: true } : c)) }
    const expected = expectedReadings(energized, solve(energized))
    within(expected.Mbn!.volts, 207.8, 0.001)
    within(expected.Man!.volts, 120, 0.001)
    within(expected.Mcn!.volts, 120, 0.001)
    expect(expected.MC!.volts).toBe(0)
  })
})

describe('DOE-HDBK-1011 and UFC 3-520-01 worked example (values from memory): 480 V to 208Y/120 V, 30 A per phase', () => {
  it('30 A per phase at 208 V is √3 × 208 × 30 = 10.8 kVA, which takes a 15 kVA transformer', () => {
    const kva = threePhaseKva(208, 30)
    within(kva, 10.8, 0.005)
    expect(smallestStandard(kva, STANDARD_THREE_PHASE_KVA)).toBe(15)
  })
  it('a 15 kVA transformer draws 15000 / (√3 × 480) = 18 A on the primary', () => {
    within(fullLoadAmps(15, 480), 18.04, 0.001)
  })
  it('the same as a bank: three 5 kVA units delta–wye, 15 kVA, 18 A full-load primary; 10.8 kVA loads each unit to about 72 %', () => {
    expect(smallestStandard(10.8 / 3, STANDARD_UNIT_KVA)).toBe(5)
    const plan = planSiteCheck(input({ connection: 'delta-wye', units: [0, 1, 2].map(() => unit(5, 480, [120], 1)), loads: { threePhaseKva: threePhaseKva(208, 30), powerFactor: 1 } }))
    expect(plan.capacity.kva).toBe(15)
    within(plan.currents.fullLoad.primary, 18.0, 0.005)
    for (const u of plan.loading) within(u.percent, 72, 0.02)
    // under that load each secondary line carries about 30 A (a little less for the voltage drop)
    for (const l of ['a', 'b', 'c']) within(plan.currents.secondary[l]!, 30, 0.03)
  })
})

describe('NEC Table 450.3(B) rounded to NEC 240.6(A) standard sizes, on a planned bank (2023 / 2017 editions, from memory)', () => {
  const plan = planSiteCheck(input({ connection: 'delta-wye', units: [0, 1, 2].map(() => unit(5, 480, [120])) }))
  it.each([
    ['primary only, 18.04 A × 125 % = 22.6 A, Note 1: next higher standard size', plan.protection.primaryOnly, 125, 25],
    ['primary and secondary: primary 18.04 A × 250 % = 45.1 A, not exceeded: 45 A', plan.protection.primaryAndSecondary.primary, 250, 45],
    ['primary and secondary: secondary 41.6 A × 125 % = 52.0 A, Note 1: 60 A', plan.protection.primaryAndSecondary.secondary, 125, 60],
  ])('%s', (_, device, percent, amps) => {
    expect(device.percent).toBe(percent)
    expect(device.maxDeviceAmps).toBe(amps)
  })
  it.each([
    [8, 167, 10, 'primary only below 9 A: 167 % of 8 A = 13.4 A rounds down to 10 A (an additional fuse rating)'],
    [100, 125, 125, '100 A × 125 % = 125 A, itself a standard size'],
    [101, 125, 150, '101 A × 125 % = 126.3 A, Note 1: 150 A'],
  ])('primary only %s A: %s %% → %s A (%s)', (amps, percent, device) => {
    expect(primaryOnlyProtection(amps)).toMatchObject({ percent, maxDeviceAmps: device })
  })
  it('secondary below 9 A: 167 %, rounding down (Table 450.3(B))', () => {
    expect(primaryAndSecondaryProtection(4, 8).secondary).toMatchObject({ percent: 167, maxDeviceAmps: 10 })
  })
})

describe('unit loading of a high-leg delta by hand calculation', () => {
  // Three equal 25 kVA units, 480 V to 240/120 V, low impedance (0.5 %) so the voltage stays near
  // nominal. Loads: 45 kVA three-phase at unity pf, and 12 kVA of 120 V lighting, half on a–n
  // and half on c–n (the same as 12 kVA at 240 V across c–a, the lighting unit T3).
  //
  // Hand calculation (superposition, equal impedances):
  //   three-phase share per unit: 45 / 3 = 15 kVA → 15000 / 240 = 62.50 A, in phase with the unit's own voltage
  //   single-phase load across c–a: 12000 / 240 = 50.00 A, divided by impedance between T3 (Z)
  //     and T1 + T2 in series (2Z): T3 carries 2/3 = 33.33 A, T1 and T2 1/3 = 16.67 A
  //   T3: 62.50 + 33.33 = 95.83 A (same phase) → 95.83 / 104.17 = 92.0 %
  //   T1, T2: the 16.67 A is at 60° to their own voltage:
  //     |62.50 ∠ 0° + 16.67 ∠ −60°| = √(62.50² + 16.67² + 62.50 × 16.67) = 72.29 A → 69.4 %
  //   (the rough rule "lighting unit = one third of the three-phase load + all the lighting"
  //    gives 15 + 12 = 27 kVA = 108 %: it overstates a closed bank)
  const plan = planSiteCheck(
    input({ connection: 'high-leg-delta', units: [0, 1, 2].map(() => unit(25, 480, [120, 120], 0.5)), loads: { threePhaseKva: 45, powerFactor: 1, lightingKva: 12 } }),
  )
  const byUnit = Object.fromEntries(plan.loading.map((u) => [u.unit, u]))
  it.each([
    ['T3, the lighting unit: 92.0 % (hand calculation above)', 'T3', 92.0],
    ['T1: 69.4 % (hand calculation above)', 'T1', 69.4],
    ['T2: 69.4 % (hand calculation above)', 'T2', 69.4],
  ])('%s', (_, id, percent) => {
    within(byUnit[id]!.percent, percent, 0.015)
  })
  it('the lighting unit carries the most and is marked as the lighting unit', () => {
    expect(byUnit.T3!.lighting).toBe(true)
    expect(byUnit.T3!.percent).toBeGreaterThan(byUnit.T1!.percent + 15)
  })
  it('more lighting pushes the lighting unit past 100 % and warns, naming it', () => {
    const heavy = planSiteCheck(
      input({ connection: 'high-leg-delta', units: [0, 1, 2].map(() => unit(25, 480, [120, 120], 0.5)), loads: { threePhaseKva: 45, powerFactor: 1, lightingKva: 24 } }),
    )
    // hand calculation: 62.50 + 2/3 × 100 = 129.2 A → 124 %
    const t3 = heavy.loading.find((u) => u.unit === 'T3')!
    within(t3.percent, 124, 0.02)
    expect(heavy.warnings.find((w) => w.code === 'unit-overload')).toMatchObject({ severity: 'danger', units: ['T3'] })
  })
})

describe('warnings', () => {
  it.each([
    ['high leg orange (NEC 110.15) and in the B position (NEC 408.3(E))', exampleSiteCheck(), ['high-leg-orange', 'high-leg-b-position', 'high-leg-no-120v']],
    [
      'a wye primary on an ungrounded supply (star point floats)',
      input({ connection: 'wye-wye', supply: { lineVolts: 480, connection: 'wye', grounded: false }, units: [0, 1, 2].map(() => unit(25, 277, [120])) }),
      ['ungrounded-wye-primary'],
    ],
    [
      'a wye–delta with its star point on the supply neutral is a grounding source and back-feeds an opened phase (IEEE C57.105, from memory)',
      input({ connection: 'wye-delta', supply: { lineVolts: 480, connection: 'wye', grounded: true }, units: [0, 1, 2].map(() => unit(25, 277, [120, 120])) }),
      ['grounded-wye-delta'],
    ],
    [
      'a 480 V primary on 277 V units is a nameplate mismatch',
      input({ connection: 'closed-delta', units: [0, 1, 2].map(() => unit(25, 277, [120, 120])) }),
      ['nameplate-voltage'],
    ],
    [
      'units of different impedance in a closed delta',
      input({ connection: 'closed-delta', units: [unit(25, 480, [120, 120], 2), unit(25, 480, [120, 120], 3), unit(25, 480, [120, 120], 4)] }),
      ['unequal-units'],
    ],
    [
      'an open delta under heavy load is unbalanced (NEMA MG 1, from memory: above 1 %)',
      input({ connection: 'open-delta', units: [unit(25, 480, [120, 120]), unit(25, 480, [120, 120])], loads: { threePhaseKva: 43, powerFactor: 0.8 } }),
      ['voltage-unbalance'],
    ],
  ])('%s', (_, siteInput, codes) => {
    const found = planSiteCheck(siteInput).warnings.map((w) => w.code)
    for (const c of codes) expect(found).toContain(c)
  })

  it('a correct floating wye–delta (three-wire supply) gets no danger and no star-point warning: the usual recommendation', () => {
    const plan = planSiteCheck(input({ connection: 'wye-delta', supply: { lineVolts: 480, connection: 'delta', grounded: false }, units: [0, 1, 2].map(() => unit(25, 277, [120, 120])) }))
    expect(plan.warnings.filter((w) => w.severity === 'danger')).toEqual([])
    expect(plan.warnings.map((w) => w.code)).not.toContain('ungrounded-wye-primary')
    expect(plan.hazards).toEqual([])
    const check = plan.testPoints.find((p) => p.kind === 'closing-check')
    expect(check?.expectedVolts ?? 0).toBeLessThan(3)
  })
  it('a plain closed delta of equal units at light load warns of nothing', () => {
    expect(planSiteCheck(input({ connection: 'closed-delta', units: [0, 1, 2].map(() => unit(25, 480, [120, 120])), loads: { threePhaseKva: 20, powerFactor: 0.9 } })).warnings).toEqual([])
  })
})

describe('the inputs schema names the JSON path of each error', () => {
  it.each([
    ['a high-leg delta needs three units', { connection: 'high-leg-delta', units: [unit(25, 480, [120, 120]), unit(25, 480, [120, 120])] }, 'units'],
    ['lighting load only on a high-leg delta', { connection: 'closed-delta', units: [0, 1, 2].map(() => unit(25, 480, [120, 120])), loads: { lightingKva: 5 } }, 'loads.lightingKva'],
    ['the lighting unit needs two coils', { connection: 'high-leg-delta', units: [0, 1, 2].map(() => unit(25, 480, [240])) }, 'units.2.secondaryVolts'],
    ['above 1000 V is outside Table 450.3(B)', { connection: 'closed-delta', supply: { lineVolts: 4160, connection: 'delta' }, units: [0, 1, 2].map(() => unit(25, 480, [120, 120])) }, 'supply.lineVolts'],
  ])('%s', (_, raw, path) => {
    const r = SiteCheckInputSchema.safeParse({ name: 'x', supply: { lineVolts: 480, connection: 'delta' }, ...raw })
    expect(r.success).toBe(false)
    expect(r.error!.issues.map((i) => i.path.join('.'))).toContain(path)
  })
})
