// The trade's common practice (no published source; each row says so), and the hazards the
// engine must raise — and must not raise on a correct bank.
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { CircuitSolveError, solve } from '#shared/engine'

const within = (actual: number, expected: number, fraction: number) => expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * fraction)
const unit = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const closedDelta: BankSpec = { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', fuseAmps: 30, breaker: { amps: 40, closed: true } }

describe('common practice of the trade (no published source)', () => {
  it('the closing check across the open corner of a correctly phased delta reads near 0 V', () => {
    const r = solve(buildBank({ ...closedDelta, openCorner: true }))
    expect(r.meters.MC!.volts).toBeLessThan(0.05 * 240)
    expect(r.closingChecks).toHaveLength(1)
    expect(r.closingChecks[0]).toMatchObject({ ok: true, energized: true, coilVolts: 240 })
    expect(r.hazards).toEqual([])
  })

  it('the open corner is found from the wiring while the bank is still dead', () => {
    const r = solve(buildBank({ ...closedDelta, openCorner: true, breaker: { amps: 40, closed: false } }))
    expect(r.closingChecks).toEqual([expect.objectContaining({ energized: false, ok: false, volts: 0, between: ['T1.X1', 'T3.X4'] })])
  })

  it.each(['T1', 'T2', 'T3'])('with %s backwards the closing check reads about 2 × the coil voltage, and the hazard names it', (unitId) => {
    const r = solve(buildBank({ ...closedDelta, openCorner: true, reversed: [unitId] }))
    within(r.meters.MC!.volts, 480, 0.01)
    const h = r.hazards.find((x) => x.code === 'reversed-winding')
    expect(h).toMatchObject({ severity: 'danger', units: [unitId] })
    within(h!.volts!, 480, 0.01)
    expect(h!.message).toContain(unitId)
    expect(h!.message).toMatch(/twice the 240\.0 V coil voltage/)
    expect(h!.message).toMatch(/Do not close/)
    expect(r.closingChecks[0]!.ok).toBe(false)
  })

  it('a delta secondary gives line voltage equal to the coil voltage', () => {
    const r = solve(buildBank(closedDelta))
    for (const m of ['Mab', 'Mbc', 'Mca']) within(r.meters[m]!.volts, 240, 0.005)
  })

  it('X2–X3 tied puts the coils in series and doubles the coil voltage; X1–X3 with X2–X4 parallels them', () => {
    const series = solve(buildBank({ supply: delta480, units: unit, primary: 'single', secondary: 'single', coils: 'series' }))
    within(series.meters.Mab!.volts, 240, 0.005)
    within(series.meters.Man!.volts, 120, 0.005)
    expect(series.bank.coils).toBe('series')
    const parallel = solve(buildBank({ supply: delta480, units: unit, primary: 'single', secondary: 'single', coils: 'parallel' }))
    within(parallel.meters.Mab!.volts, 120, 0.005)
    expect(parallel.bank.coils).toBe('parallel')
    expect(parallel.hazards).toEqual([])
  })

  it('the open-corner hazard is about closing it: energizing to take the reading is allowed', () => {
    const open = solve(buildBank({ ...closedDelta, openCorner: true, reversed: ['T1'] }))
    expect(open.hazards).toEqual([expect.objectContaining({ code: 'reversed-winding', onClosing: true })])
    const closed = solve(buildBank({ ...closedDelta, reversed: ['T1'] }))
    const ring = closed.hazards.find((h) => h.code === 'reversed-winding')!
    expect(ring.onClosing).toBeUndefined()
    // the same mistake is stated with the same number, open or closed: about twice the coil voltage
    within(ring.volts!, 480, 0.02)
    expect(ring.message).toMatch(/480\.\d V would stand across a corner/)
  })

  it('closing a delta onto a reversed unit opens the protection', () => {
    const r = solve(buildBank({ ...closedDelta, reversed: ['T2'] }))
    expect(r.hazards.map((h) => h.code)).toEqual(expect.arrayContaining(['reversed-winding', 'fault-current']))
    expect(r.events.length).toBeGreaterThan(0)
    const first = r.events[0]!
    expect(first.region).toBe('instantaneous')
    expect(first.amps).toBeGreaterThan(10 * 30)
    expect(r.devices[first.device]!.state).toMatch(/blown|tripped/)
    // the settled state no longer carries the short-circuit current
    for (const w of Object.values(r.windings)) expect(w.amps).toBeLessThan(3 * (10_000 / 120))
  })

  it('small units wound with compensation read a few percent high at no load', () => {
    const r = solve(buildBank({ supply: delta480, units: { ...unit, compensationPercent: 3 }, primary: 'single', secondary: 'single', coils: 'series' }))
    within(r.meters.Mab!.volts, 240 * 1.03, 0.002)
    expect(r.hazards).toEqual([])
  })
})

describe('no false alarm on a correct bank', () => {
  const correct: [string, BankSpec][] = [
    ['closed delta, loaded to 90 %', { ...closedDelta, load: { ohms: (3 * 240 * 240) / 27_000, connection: 'delta' } }],
    ['delta-wye 208Y/120, loaded', { supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: 2.4, connection: 'wye' }, fuseAmps: 30 }],
    ['wye-delta', { supply: { connection: 'wye', lineVolts: 831.4 }, units: unit, primary: 'wye', secondary: 'delta', coils: 'series' }],
    ['open delta', { supply: delta480, units: unit, primary: 'open-delta', secondary: 'open-delta', coils: 'series' }],
    ['high-leg delta with lighting load', { supply: delta480, units: unit, primary: 'delta', secondary: 'high-leg', coils: 'series', lightingOhms: 4 }],
    ['open high-leg delta', { supply: delta480, units: unit, primary: 'open-delta', secondary: 'open-high-leg', coils: 'series' }],
    ['ungrounded wye primary on a delta supply', { supply: delta480, units: { ...unit, primaryVolts: 277 }, primary: 'wye', secondary: 'delta', coils: 'series' }],
  ]
  it.each(correct)('%s', (_, spec) => {
    const r = solve(buildBank(spec))
    expect(r.energized).toBe(true)
    expect(r.hazards).toEqual([])
    expect(r.events).toEqual([])
  })

  it('reads the high leg: 120 × √3 ≈ 207.8 V from b to the centre tap', () => {
    const r = solve(buildBank(correct[4]![1]))
    within(r.meters.Mbn!.volts, 207.8, 0.005)
    within(r.meters.Man!.volts, 118.5, 0.02) // 120 V less the drop of the lighting load
  })
})

describe('hazards', () => {
  it('winding-overvoltage: a 240 V primary across a 480 V line', () => {
    const r = solve(buildBank({ supply: delta480, units: { ...unit, primaryVolts: 240 }, primary: 'single', secondary: 'single', coils: 'series' }))
    const h = r.hazards.find((x) => x.code === 'winding-overvoltage')
    expect(h).toMatchObject({ severity: 'danger', units: ['T1'] })
    expect(h!.message).toMatch(/200 %/)
  })

  it('overload: a load above rating that would open a fuse in seconds to minutes, not at once', () => {
    // 10 kVA at 240 V is 41.7 A; a 2.9 Ω load draws about 80 A through a 50 A secondary fuse
    const r = solve({
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] },
        { id: 'F1', kind: 'fuse', amps: 50 },
        { id: 'L1', kind: 'load', ohms: 2.9 },
      ],
      wires: [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['T1.X2', 'T1.X3'], ['T1.X1', 'F1.a'], ['F1.b', 'L1.a'], ['L1.b', 'T1.X4']],
    })
    const codes = r.hazards.map((h) => `${h.code}:${h.units.join()}`)
    expect(codes).toEqual(expect.arrayContaining(['overload:T1', 'overload:F1']))
    expect(r.events).toHaveLength(1)
    expect(r.events[0]).toMatchObject({ device: 'F1', region: 'inverse-time' })
    expect(r.events[0]!.seconds).toBeGreaterThan(1)
    expect(r.events[0]!.seconds).toBeLessThan(600)
  })

  it('loop-voltage: coils about to be paralleled with different voltages', () => {
    const r = solve({
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 110] },
      ],
      wires: [['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['T1.X1', 'T1.X3']],
    })
    const h = r.hazards.find((x) => x.code === 'loop-voltage')
    expect(h).toMatchObject({ units: ['T1'] })
    within(h!.volts!, 10, 0.01)
  })

  it('loop-voltage: an open corner of units not fed from three phases', () => {
    const r = solve({
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        ...['T1', 'T2', 'T3'].map((id) => ({ id, kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [240] })),
      ],
      // every primary on A–B: the three secondaries in a chain add up instead of cancelling
      wires: [
        ['S1.A', 'T1.H1'], ['S1.B', 'T1.H2'], ['S1.A', 'T2.H1'], ['S1.B', 'T2.H2'], ['S1.A', 'T3.H1'], ['S1.B', 'T3.H2'],
        ['T1.X2', 'T2.X1'], ['T2.X2', 'T3.X1'],
      ],
    })
    const h = r.hazards.find((x) => x.code === 'loop-voltage')
    expect(h).toBeDefined()
    within(h!.volts!, 720, 0.01)
  })

  it('an open wye is not mistaken for a parallel', () => {
    const r = solve(buildBank({ supply: { connection: 'wye', lineVolts: 480 }, units: { ...unit, primaryVolts: 277 }, primary: 'open-wye', secondary: 'open-delta', coils: 'series' }))
    expect(r.hazards).toEqual([])
    expect(r.bank.primary).toBe('open-wye')
  })

  it('the whole bank stays dead with the main breaker open', () => {
    const r = solve(buildBank({ ...closedDelta, breaker: { amps: 40, closed: false }, reversed: ['T1'] }))
    expect(r.energized).toBe(false)
    expect(r.hazards).toEqual([])
    expect(r.devices.CB1).toEqual({ state: 'open', amps: 0 })
    expect(r.meters.Mab!.volts).toBeLessThan(0.01)
  })
})

describe('what cannot be solved gets a clear error, never NaN', () => {
  it('a jumper across an ideal supply names the supply', () => {
    const doc = {
      format: 'phaseloom.circuit',
      version: 1,
      components: [{ id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480, sourceOhms: { r: 0, x: 0 } }],
      wires: [['S1.A', 'S1.B']],
    }
    expect(() => solve(doc)).toThrow(CircuitSolveError)
    try {
      solve(doc)
    } catch (e) {
      expect((e as CircuitSolveError).parts).toEqual(['S1'])
      expect((e as Error).message).toMatch(/zero-impedance/)
    }
  })

  it('the same jumper on a supply with source impedance is a fault the protection sees', () => {
    const r = solve({
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
        { id: 'CB1', kind: 'breaker', poles: 2, amps: 20, closed: true },
      ],
      wires: [['S1.A', 'CB1.L1'], ['S1.B', 'CB1.L2'], ['CB1.T1', 'CB1.T2']],
    })
    expect(r.events).toEqual([expect.objectContaining({ device: 'CB1', state: 'tripped', region: 'instantaneous' })])
    expect(r.devices.CB1!.state).toBe('tripped')
    expect(Number.isFinite(r.events[0]!.amps)).toBe(true)
  })
})
