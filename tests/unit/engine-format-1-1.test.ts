// Circuit format 1.1 against published sources and hand calculations: the exciting branch,
// taps, the bushing layout, vector groups, ammeters, rotation meters, the new hazards, inrush
// and the protection study. Each row names where its expected value comes from.
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { CircuitSolveError, CircuitValidationError, MAX_OPERATING_INSTANTS, solve, type SolveResult } from '#shared/engine'
import { starters } from '#shared/starters'

const doc = (components: unknown[], wires: [string, string][]) => ({ format: 'phaseloom.circuit', version: 1, components, wires })
/** the paths of every number in a result that is not finite */
function nonFinite(value: unknown, path = ''): string[] {
  if (typeof value === 'number') return Number.isFinite(value) ? [] : [path]
  if (typeof value !== 'object' || value === null) return []
  return Object.entries(value).flatMap(([k, v]) => nonFinite(v, `${path}.${k}`))
}
const codes = (r: SolveResult) => r.hazards.map((h) => h.code)
const volts = (r: SolveResult, id: string) => (r.meters[id] as { volts: number }).volts
const unit277 = { kva: 10, primaryVolts: 277, secondaryVolts: [120, 120] }
const unit480 = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const wye480 = { connection: 'wye' as const, lineVolts: 480 }

describe('the exciting branch holds a floating star point (circuit-format.md 1.1)', () => {
  it('a correct floating wye–delta on a three-wire 480 V supply reads near 0 V across its last open corner and raises nothing', () => {
    const r = solve(buildBank({ supply: delta480, units: unit277, primary: 'wye', secondary: 'delta', coils: 'series', openCorner: true }))
    expect(volts(r, 'MC')).toBeLessThan(3)
    expect(r.hazards).toEqual([])
    expect(r.closingChecks[0]!.ok).toBe(true)
  })

  it('two 120 V primaries in series across 240 V each take half (equal cores), not a split set by the leaks', () => {
    const r = solve(doc(
      [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 240 },
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 120, secondaryVolts: [24] },
        { id: 'T2', kind: 'transformer', kva: 10, primaryVolts: 120, secondaryVolts: [24] },
        { id: 'M1', kind: 'voltmeter' },
        { id: 'M2', kind: 'voltmeter' },
      ],
      [['S1.A', 'T1.H1'], ['T1.H2', 'T2.H1'], ['T2.H2', 'S1.B'], ['M1.a', 'T1.H1'], ['M1.b', 'T1.H2'], ['M2.a', 'T2.H1'], ['M2.b', 'T2.H2']],
    ))
    expect(volts(r, 'M1')).toBeCloseTo(120, 0)
    expect(volts(r, 'M2')).toBeCloseTo(120, 0)
  })

  it('draws excitingPercent of rated current at no load (distribution units draw about 0.5–2 %: common practice)', () => {
    const r = solve(doc([{ id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 }, { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [240], excitingPercent: 1.5 }], [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2']]))
    expect(r.windings['T1.H1-H2']!.amps / (10000 / 480)).toBeCloseTo(0.015, 3)
  })

  it('no-load ratio within the ±0.5 % of IEEE C57.12.00 (9.1, from memory) with the default exciting branch', () => {
    const r = solve(buildBank({ supply: delta480, units: { kva: 25, primaryVolts: 480, secondaryVolts: [240] }, primary: 'delta', secondary: 'delta', coils: 'single' }))
    expect(Math.abs(volts(r, 'Mab') / 240 - 1)).toBeLessThan(0.005)
  })

  it('refuses a core loss larger than the exciting current, naming the field', () => {
    expect(() => solve(doc([{ id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [240], excitingPercent: 0.5, coreLossPercent: 0.8 }], []))).toThrow(/components\[0\]\.coreLossPercent/)
  })
})

describe('taps (circuit-format.md 1.1): more primary turns in use, less on the secondary', () => {
  it.each([
    [2.5, 240 / 1.025, 'a tap 2.5 % above nominal: the secondary falls by 1/1.025'],
    [-5, 240 / 0.95, 'a tap 5 % below nominal raises the secondary by 1/0.95'],
  ])('tap %s %%: %s', (tapPercent, expected) => {
    const r = solve(doc(
      [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [240], tapPercent },
        { id: 'M1', kind: 'voltmeter' },
      ],
      [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['M1.a', 'T1.X1'], ['M1.b', 'T1.X2']],
    ))
    expect(volts(r, 'M1') / expected).toBeCloseTo(1, 3)
  })
})

describe('polarity (IEEE C57.12.00): a jumper across the adjacent H1 and X bushings, a meter across the other pair', () => {
  // subtractive: X1 beside H1; additive: X1 diagonally across, so X2 stands beside H1
  it.each([
    ['subtractive', 'T1.X1', 'T1.X2', 480 - 120, 'reads the difference of the windings'],
    ['additive', 'T1.X2', 'T1.X1', 480 + 120, 'reads their sum'],
  ] as const)('%s: jumper H1–%s, meter H2–%s %s', (polarity, besideH1, besideH2, expected) => {
    const r = solve(doc(
      [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120], polarity },
        { id: 'M1', kind: 'voltmeter' },
      ],
      [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['T1.H1', besideH1], ['M1.a', 'T1.H2'], ['M1.b', besideH2]],
    ))
    expect(volts(r, 'M1')).toBeCloseTo(expected, -1)
  })
})

describe('vector groups as a nameplate gives them (IEC 60076-1 clause 6, annex D)', () => {
  const unit = { kva: 10, primaryVolts: 480, secondaryVolts: [120] }
  it.each([
    ['Dd0', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'single' }],
    ['Dyn1', { supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'single' }],
    ['Dyn1', { supply: { ...delta480, rotation: 'ACB' }, units: unit, primary: 'delta', secondary: 'wye', coils: 'single' }],
    ['Dyn11', { supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'single', shift: 'lead' }],
    ['Yd1', { supply: delta480, units: { ...unit, primaryVolts: 277 }, primary: 'wye', secondary: 'delta', coils: 'single' }],
    ['YNd1', { supply: wye480, units: { ...unit, primaryVolts: 277 }, primary: 'wye', secondary: 'delta', coils: 'single' }],
    ['YNd11', { supply: { connection: 'delta', lineVolts: 240 }, units: { kva: 10, primaryVolts: 240, secondaryVolts: [2400] }, primary: 'delta', secondary: 'wye', coils: 'single' }],
    ['Ii0', { supply: delta480, units: unit, primary: 'single', secondary: 'single', coils: 'single' }],
  ] as [string, BankSpec][])('%s', (group, spec) => {
    const r = solve(buildBank(spec))
    expect(r.bank.vectorGroup).toBe(group)
    expect(r.bank.clock).toBe(Number(group.replace(/^\D+/, '')))
  })

  it('the same Dyn1 wiring measures −30° on ABC and +30° on ACB (the mirror image), and is clock 1 on both', () => {
    const abc = solve(buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'single' }))
    const acb = solve(buildBank({ supply: { ...delta480, rotation: 'ACB' }, units: unit, primary: 'delta', secondary: 'wye', coils: 'single' }))
    expect([abc.bank.displacementDegrees, acb.bank.displacementDegrees]).toEqual([-30, 30])
  })

  it('no vector group for no proper connection (one unit reversed)', () => {
    const r = solve(buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'single', reversed: ['T2'] }))
    expect(r.bank.vectorGroup).toBeNull()
    expect(r.bank.clock).toBeNull()
  })
})

describe('hazards of format 1.1', () => {
  it('backfeed: a grounded wye–delta with one primary fuse blown holds that unit’s primary at about 277 V (by hand: the closed delta puts the missing phase back)', () => {
    const d = buildBank({ supply: wye480, units: unit277, primary: 'wye', secondary: 'delta', coils: 'series', fuseAmps: 30 })
    ;(d.components.find((c) => c.id === 'F1') as { blown: boolean }).blown = true
    const r = solve(d)
    const h = r.hazards.find((x) => x.code === 'backfeed')
    expect(h).toMatchObject({ severity: 'danger', units: ['F1', 'T1'] })
    expect(h!.volts! / 277).toBeCloseTo(1, 1)
  })

  it('no backfeed when the bank is fed through an open breaker: everything beyond it is dead', () => {
    const r = solve(buildBank({ supply: wye480, units: unit277, primary: 'wye', secondary: 'delta', coils: 'series', fuseAmps: 30, breaker: { amps: 60, closed: false } }))
    expect(codes(r)).not.toContain('backfeed')
  })

  it('output-voltage: an open delta with one unit reversed reads 240 × √3 = 415.7 V on one line pair (by hand) and is a danger', () => {
    const r = solve(buildBank({ supply: delta480, units: unit480, primary: 'open-delta', secondary: 'open-delta', coils: 'series', reversed: ['T2'] }))
    const h = r.hazards.find((x) => x.code === 'output-voltage')
    expect(h).toMatchObject({ severity: 'danger' })
    expect(h!.volts!).toBeCloseTo(240 * Math.sqrt(3), -1)
    expect(h!.units).toContain('T2')
  })

  it('neutral-shift: a floating wye–wye with line-to-neutral load on one side moves its star point; grounded, it does not', () => {
    const spec = { units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single', lightingOhms: 2 } as const
    expect(codes(solve(buildBank({ ...spec, supply: delta480 })))).toContain('neutral-shift')
    expect(codes(solve(buildBank({ ...spec, supply: wye480 })))).not.toContain('neutral-shift')
    expect(codes(solve(buildBank({ ...spec, supply: delta480, lightingOhms: undefined })))).not.toContain('neutral-shift')
  })

  it.each([0.001, 0.05, 0.5, 2, 10, 50])('reversed-winding in a closed delta whatever the source impedance (x = %s Ω: judged from the wiring’s EMFs)', (x) => {
    const r = solve(buildBank({ supply: { ...delta480, sourceOhms: { r: x / 3, x } }, units: unit480, primary: 'delta', secondary: 'delta', coils: 'series', reversed: ['T2'] }))
    expect(r.hazards.find((h) => h.code === 'reversed-winding')?.units).toEqual(['T2'])
  })

  it('a corner-grounded open delta is an open delta: correct, nothing wrong; one unit reversed, named', () => {
    const grounded = (reversed?: string[]) => {
      const d = buildBank({ supply: delta480, units: unit480, primary: 'open-delta', secondary: 'open-delta', coils: 'series', reversed })
      d.components.push({ id: 'G1', kind: 'ground' })
      d.wires.push(['OUT.b', 'G1.g'])
      return solve(d)
    }
    const ok = grounded()
    expect(ok.bank.secondary).toBe('open-delta')
    expect(ok.bankProblems).toEqual([])
    expect(ok.hazards).toEqual([])
    const wrong = grounded(['T2'])
    expect(wrong.bankProblems.map((p) => p.code)).toEqual(['reversed-unit'])
    expect(codes(wrong)).toContain('output-voltage')
  })
})

describe('meters of format 1.1', () => {
  const feeder = (rotation: 'ABC' | 'ACB') =>
    doc(
      [
        { id: 'S1', kind: 'supply', connection: 'wye', lineVolts: 208, rotation, sourceOhms: { r: 0, x: 0 } },
        { id: 'A1', kind: 'ammeter' },
        { id: 'L1', kind: 'load', ohms: { r: 8, x: 6 } },
        { id: 'R1', kind: 'rotation-meter' },
      ],
      [['S1.A', 'A1.a'], ['A1.b', 'L1.a'], ['L1.b', 'S1.N'], ['R1.a', 'S1.A'], ['R1.b', 'S1.B'], ['R1.c', 'S1.C']],
    )

  it('an ammeter reads V/Z: 120.1 V across 8 + j6 Ω is 12.01 A lagging 36.87° (Ohm’s law by hand)', () => {
    const r = solve(feeder('ABC'))
    expect(r.meters.A1).toEqual({ amps: expect.closeTo(208 / Math.sqrt(3) / 10, 2), degrees: expect.closeTo(-36.87, 1) })
  })

  it.each(['ABC', 'ACB'] as const)('a rotation meter on the supply reads %s', (rotation) => {
    expect(solve(feeder(rotation)).meters.R1).toEqual({ sequence: rotation })
  })

  it('a rotation meter with a lead on nothing reads none', () => {
    const d = feeder('ABC')
    d.wires = d.wires.filter((w) => w[0] !== 'R1.c')
    expect(solve(d).meters.R1).toEqual({ sequence: 'none' })
  })

  it('two ammeters in parallel have no one reading: a 422-type error naming the meter', () => {
    const d = feeder('ABC')
    d.components.push({ id: 'A2', kind: 'ammeter' })
    d.wires.push(['A2.a', 'A1.a'], ['A2.b', 'A1.b'])
    expect(() => solve(d)).toThrow(CircuitSolveError)
  })
})

describe('fuse classes and inrush (UL 248; 12 × full load for 0.1 s, common practice)', () => {
  const bank = (curve: 'time-delay' | 'fast-acting') => {
    const d = buildBank({ supply: delta480, units: unit480, primary: 'delta', secondary: 'delta', coils: 'series', fuseAmps: 50 })
    for (const c of d.components) if (c.kind === 'fuse') (c as { curve?: string }).curve = curve
    return solve(d)
  }
  it('time-delay primary fuses sized by NEC 450.3(B) ride through inrush: no caution', () => {
    expect(bank('time-delay').cautions).toEqual([])
  })
  it('fast-acting fuses of the same rating are named as likely to open on energizing, with the inrush figure', () => {
    const r = bank('fast-acting')
    expect(r.cautions.map((c) => c.units[0])).toEqual(['F1', 'F2', 'F3'])
    // 3 × 10 kVA at 480 V: 36.1 A full load, 433 A of inrush on each line
    expect(r.cautions[0]!.amps).toBeCloseTo(12 * 36.08, -1)
  })
})

describe('the protection study (devices that operate at one instant open together)', () => {
  const branches = (n: number, ohms: (i: number) => number) => {
    const components: unknown[] = [{ id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480, sourceOhms: { r: 0, x: 0.00001 } }]
    const wires: [string, string][] = []
    for (let i = 0; i < n; i++) {
      components.push({ id: `F${i}`, kind: 'fuse', amps: 10 }, { id: `L${i}`, kind: 'load', ohms: ohms(i) })
      const p = i % 3
      wires.push([`S1.${'ABC'[p]}`, `F${i}.a`], [`F${i}.b`, `L${i}.a`], [`L${i}.b`, `S1.${'ABC'[(p + 1) % 3]}`])
    }
    return doc(components, wires)
  }

  it('2 400 like branches overloaded alike open at one instant', () => {
    const r = solve(branches(2400, () => 20))
    expect(r.events).toHaveLength(2400)
    expect(new Set(r.events.map((e) => e.seconds)).size).toBe(1)
  })

  it(`more than ${MAX_OPERATING_INSTANTS} separate instants: refused as unsolvable, naming the limit`, () => {
    expect(() => solve(branches(200, (i) => 20 + i * 0.05))).toThrow(new RegExp(`${MAX_OPERATING_INSTANTS} separate instants`))
  })

  it('a breaker that does not trip (a disconnect) never operates, whatever it carries', () => {
    const r = solve(doc(
      [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        { id: 'SW1', kind: 'breaker', poles: 2, amps: 10, closed: true, trips: false },
        { id: 'L1', kind: 'load', ohms: 4 },
      ],
      [['S1.A', 'SW1.L1'], ['S1.B', 'SW1.L2'], ['SW1.T1', 'L1.a'], ['L1.b', 'SW1.T2']],
    ))
    expect(r.events).toEqual([])
    expect(r.devices.SW1!.state).toBe('closed')
  })
})

describe('numerics that do not depend on the leaks', () => {
  it.each([
    [10_000, 0.01, '10 MVA at 0.01 %'],
    [100_000, 0.01, '100 MVA at 0.01 %'],
    [0.001, 50, '1 VA at 50 %'],
  ])('%s kVA, %s %% impedance (%s): solved, no Infinity or NaN anywhere', (kva, impedancePercent) => {
    const r = solve(buildBank({ supply: delta480, units: { kva, primaryVolts: 480, secondaryVolts: [240], impedancePercent }, primary: 'delta', secondary: 'delta', coils: 'single', load: { ohms: 10, connection: 'delta' } }))
    expect(nonFinite(r)).toEqual([])
    expect(volts(r, 'Mab')).toBeGreaterThan(0)
  })

  it.each([
    ['components[0].hz', { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480, hz: 1e-310 }],
    ['components[0].amps', { id: 'F1', kind: 'fuse', amps: 1e-300 }],
    ['components[0].kva', { id: 'T1', kind: 'transformer', kva: 1e-160, primaryVolts: 480, secondaryVolts: [240] }],
  ])('a value that would overflow the study is refused at %s', (path, component) => {
    try {
      solve(doc([component], []))
      expect.unreachable()
    } catch (e) {
      expect(e).toBeInstanceOf(CircuitValidationError)
      expect((e as CircuitValidationError).errors.map((x) => x.path)).toContain(path)
    }
  })
})

describe('no physical reading depends on the 1 GΩ leaks (circuit-format.md): scaled by 10 and by 0.1', () => {
  const floatingBanks: [string, BankSpec][] = [
    ['floating wye–delta, corner open', { supply: delta480, units: unit277, primary: 'wye', secondary: 'delta', coils: 'series', openCorner: true }],
    ['grounded wye–delta, loaded', { supply: wye480, units: unit277, primary: 'wye', secondary: 'delta', coils: 'series', load: { ohms: 10, connection: 'delta' } }],
    ['floating wye–wye', { supply: delta480, units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single' }],
    ['wye–wye, floating primary, loaded', { supply: delta480, units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single', load: { ohms: 5, connection: 'delta' } }],
  ]
  const cases: [string, unknown][] = [...starters.map((s) => [s.slug, s.document] as [string, unknown]), ...floatingBanks.map(([n, spec]) => [n, buildBank(spec)] as [string, unknown])]

  it.each(cases)('%s', async (_, document) => {
    const { solveDetailed } = await import('#shared/engine')
    const base = solveDetailed(document).result
    const supply = (document as { components: { kind: string; lineVolts?: number }[] }).components.find((c) => c.kind === 'supply')!
    const limit = 0.001 * supply.lineVolts!
    for (const scale of [10, 0.1]) {
      const scaled = solveDetailed(document, { leakSiemens: 1e-9 * scale }).result
      for (const [id, m] of Object.entries(base.meters)) if ('volts' in m) expect(Math.abs((scaled.meters[id] as { volts: number }).volts - m.volts), id).toBeLessThanOrEqual(limit)
      for (const [id, w] of Object.entries(base.windings)) expect(Math.abs(scaled.windings[id]!.volts - w.volts), id).toBeLessThanOrEqual(limit)
      for (const [id, t] of Object.entries(base.terminals)) expect(Math.abs(scaled.terminals[id]!.volts - t.volts), id).toBeLessThanOrEqual(limit)
    }
  })
})

/**
 * A 40-digit reference in fixed-point BigInt arithmetic (no floating point in it): one unit
 * on one phase of a wye supply, its X2 grounded, a load and a voltmeter across X1–X2, solved
 * by hand through the T model of circuit-format.md (source, half the impedance, the exciting
 * branch across the core, the ideal ratio, the other half, the load with the meter's 10 MΩ
 * and the node's 1 GΩ leak beside it).
 */
describe('stiff units against a 40-digit reference (T model by hand)', () => {
  const SCALE = 10n ** 40n
  type Z = [bigint, bigint]
  const fx = (x: number): bigint => {
    // the double exactly as a ratio of integers, then scaled
    if (x === 0) return 0n
    const [mantissa, exponent] = x.toExponential(20).split('e') as [string, string]
    const digits = BigInt(mantissa.replace('.', '').replace('-', ''))
    const sign = x < 0 ? -1n : 1n
    const e = Number(exponent) - 20
    return sign * (e >= 0 ? digits * 10n ** BigInt(e) * SCALE : (digits * SCALE) / 10n ** BigInt(-e))
  }
  const c = (re: number, im = 0): Z => [fx(re), fx(im)]
  const add = (a: Z, b: Z): Z => [a[0] + b[0], a[1] + b[1]]
  const mul = (a: Z, b: Z): Z => [(a[0] * b[0] - a[1] * b[1]) / SCALE, (a[0] * b[1] + a[1] * b[0]) / SCALE]
  const div = (a: Z, b: Z): Z => {
    const d = (b[0] * b[0] + b[1] * b[1]) / SCALE
    return [((a[0] * b[0] + a[1] * b[1]) / d), ((a[1] * b[0] - a[0] * b[1]) / d)]
  }
  const inv = (a: Z) => div([SCALE, 0n], a)
  const size = (a: Z) => Math.hypot(Number(a[0] / 10n ** 20n) / 1e20, Number(a[1] / 10n ** 20n) / 1e20)

  it.each([
    [10_000, 0.01, 0.01, { r: 0, x: 0 }, '10 MVA at 0.01 % on an ideal source'],
    [100_000, 0.01, 0.002, { r: 0, x: 0 }, '100 MVA at 0.01 %'],
    [10_000, 0.01, 0.01, { r: 1, x: 2 }, '10 MVA at 0.01 % behind 1 + j2 Ω (weakly driven)'],
    [0.001, 50, 1000, { r: 0, x: 0 }, '1 VA at 50 %'],
  ])('%s kVA, %s %%, %s Ω load (%s): within 1e-4 relative', (kva, impedancePercent, loadOhms, sourceOhms) => {
    const lineVolts = 480 * Math.sqrt(3)
    const r = solve(doc(
      [
        { id: 'S1', kind: 'supply', connection: 'wye', lineVolts, sourceOhms },
        { id: 'T1', kind: 'transformer', kva, primaryVolts: 480, secondaryVolts: [240], impedancePercent },
        { id: 'L1', kind: 'load', ohms: loadOhms },
        { id: 'M1', kind: 'voltmeter' },
        { id: 'G1', kind: 'ground' },
      ],
      [['S1.A', 'T1.H1'], ['T1.H2', 'S1.N'], ['T1.X1', 'L1.a'], ['L1.b', 'T1.X2'], ['T1.X2', 'G1.g'], ['M1.a', 'T1.X1'], ['M1.b', 'T1.X2']],
    ))
    // the engine's model, by hand: windingSeries and excitingAdmittance of shared/engine/network.ts
    const va = kva * 1000
    const zpu = impedancePercent / 100
    const rpu = zpu / Math.sqrt(1 + 1.5 * 1.5)
    const half = (v: number): Z => mul(c(rpu, rpu * 1.5), c((0.5 * v * v) / va))
    const zp = half(480)
    const zs = half(240)
    const a: Z = c(2)
    const ym = div(c(0.002 * va, -Math.sqrt(0.01 * 0.01 - 0.002 * 0.002) * va), c(480 * 480))
    const zLoad = inv(add(add(inv(c(loadOhms)), c(1e-7)), c(1e-9)))
    const z2 = mul(mul(a, a), add(zs, zLoad))
    const yCore = add(ym, inv(z2))
    const e = div(c(480), add([SCALE, 0n], mul(add(zp, c(sourceOhms.r, sourceOhms.x)), yCore)))
    const vLoad = mul(div(e, a), div(zLoad, add(zs, zLoad)))
    const reference = size(vLoad)
    expect(Math.abs(volts(r, 'M1') - reference) / reference).toBeLessThan(1e-4)
  })
})
