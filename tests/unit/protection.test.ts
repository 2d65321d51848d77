// Fuse and breaker curves at the conventional points they are built on (UL 248 / UL 489,
// IEC 60269-1; from memory, see shared/engine/protection.ts), and the order of operations.
import { describe, expect, it } from 'vitest'
import { CURVES, HORIZON_SECONDS, operatingTime, solve } from '#shared/engine'

describe('time-current curves', () => {
  it.each([
    ['time-delay', 'UL 248: carries 110 % indefinitely', 1.1, null],
    ['fast-acting', 'UL 248: carries 110 % indefinitely', 1.1, null],
    ['breaker', 'UL 489: carries its rating', 1.0, null],
  ] as const)('%s: %s', (kind, _, multiple, expected) => {
    expect(operatingTime(kind, 30, 30 * multiple, 60)).toBe(expected)
  })

  it.each([
    ['time-delay', 'UL 248: opens at 135 % within one hour', 1.35, 3600],
    ['time-delay', 'UL 248: opens at 200 % within two minutes (≤ 30 A)', 2, 120],
    ['time-delay', 'IEC 60269-1 gG: conventional fusing current 1.6 × In within one hour', 1.6, 3600],
    ['fast-acting', 'UL 248: opens at 135 % within one hour', 1.35, 3600],
    ['fast-acting', 'UL 248: opens at 200 % within two minutes (≤ 30 A)', 2, 120],
    ['breaker', 'UL 489: trips at 135 % within one hour', 1.35, 3600],
    ['breaker', 'UL 489: trips at 200 % within two minutes (≤ 30 A frame)', 2, 120],
  ] as const)('%s: %s', (kind, _, multiple, limitSeconds) => {
    const op = operatingTime(kind, 30, 30 * multiple, 60)
    expect(op).not.toBeNull()
    expect(op!.region).toBe('inverse-time')
    expect(op!.seconds).toBeLessThanOrEqual(limitSeconds)
  })

  it.each(['time-delay', 'fast-acting', 'breaker'] as const)('%s is inverse: more current, sooner', (curve) => {
    const times = [1.4, 1.5, 2, 3, 5, 8, 12, 20].map((m) => operatingTime(curve, 20, 20 * m, 60)!.seconds)
    for (let i = 1; i < times.length; i++) expect(times[i]!).toBeLessThanOrEqual(times[i - 1]!)
    expect(times.at(-1)!).toBeLessThan(times[0]!)
  })

  it('UL 248: a time-delay (dual element) fuse holds at least 10 s at 500 %; a fast-acting one opens within a second', () => {
    expect(operatingTime('time-delay', 30, 150, 60)!.seconds).toBeGreaterThanOrEqual(10)
    expect(operatingTime('fast-acting', 30, 150, 60)!.seconds).toBeLessThan(1)
  })

  it('current-limiting, half a cycle: a fast-acting fuse from 10 × rating, a time-delay fuse only from 30 × (common practice, from memory); a breaker trips magnetically in one cycle from 10 ×', () => {
    expect(operatingTime('fast-acting', 20, 200, 60)).toEqual({ seconds: 0.5 / 60, region: 'instantaneous' })
    expect(operatingTime('time-delay', 20, 200, 60)!.region).toBe('inverse-time')
    expect(operatingTime('time-delay', 20, 200, 60)!.seconds).toBeGreaterThan(1)
    expect(operatingTime('time-delay', 20, 600, 60)).toEqual({ seconds: 0.5 / 60, region: 'instantaneous' })
    expect(operatingTime('breaker', 20, 250, 50)).toEqual({ seconds: 1 / 50, region: 'instantaneous' })
    expect(CURVES['fast-acting'].instantaneousMultiple).toBe(10)
  })

  it('rides through energizing inrush (12 × for 0.1 s, common practice) when time-delay and sized by NEC 450.3(B) at 125 %; a fast-acting fuse does not', () => {
    const fullLoad = 36.1
    const inrush = 12 * fullLoad
    expect(operatingTime('time-delay', 50, inrush, 60)!.seconds).toBeGreaterThan(0.1)
    expect(operatingTime('fast-acting', 50, inrush, 60)!.seconds).toBeLessThan(0.1)
  })

  it('looks no further ahead than one hour', () => {
    expect(operatingTime('time-delay', 30, 30 * 1.105, 60)).toBeNull() // it would take longer than the horizon
    expect(HORIZON_SECONDS).toBe(3600)
  })
})

describe('protection study: solve, open the first device, solve again', () => {
  // a 480 V supply through a 60 A breaker and a 15 A fuse into a 10 Ω load: 48 A
  const feeder = (ohms: number) => ({
    format: 'phaseloom.circuit',
    version: 1,
    components: [
      { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
      { id: 'CB1', kind: 'breaker', poles: 2, amps: 60, closed: true },
      { id: 'F1', kind: 'fuse', amps: 15 },
      { id: 'L1', kind: 'load', ohms },
    ],
    wires: [['S1.A', 'CB1.L1'], ['S1.B', 'CB1.L2'], ['CB1.T1', 'F1.a'], ['F1.b', 'L1.a'], ['L1.b', 'CB1.T2']],
  })

  it('the smaller device in series opens first and the larger one then carries nothing', () => {
    const r = solve(feeder(10))
    expect(r.events.map((e) => e.device)).toEqual(['F1'])
    expect(r.events[0]!.amps).toBeCloseTo(48, 0)
    expect(r.devices.F1!.state).toBe('blown')
    expect(r.devices.CB1).toEqual({ state: 'closed', amps: 0 })
    expect(r.energized).toBe(true)
  })

  it('a fault above both instantaneous regions opens both, fuse first (half a cycle against one)', () => {
    const r = solve(feeder(0.01))
    expect(r.events.map((e) => e.device)).toEqual(['F1'])
    expect(r.events[0]!.region).toBe('instantaneous')
    expect(r.events[0]!.seconds).toBeCloseTo(0.5 / 60, 6)
  })

  it('events are in time order and carry the current that opened each device', () => {
    // three parallel branches of different fuse sizes on one breaker: each branch overloaded
    const doc = {
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 240 },
        { id: 'F1', kind: 'fuse', amps: 10 },
        { id: 'F2', kind: 'fuse', amps: 20 },
        { id: 'L1', kind: 'load', ohms: 12 },
        { id: 'L2', kind: 'load', ohms: 6 },
      ],
      wires: [['S1.A', 'F1.a'], ['F1.b', 'L1.a'], ['L1.b', 'S1.B'], ['S1.A', 'F2.a'], ['F2.b', 'L2.a'], ['L2.b', 'S1.B']],
    }
    const r = solve(doc)
    expect(r.events.map((e) => e.device)).toEqual(['F1', 'F2'])
    expect(r.events[0]!.seconds).toBeLessThan(r.events[1]!.seconds)
    expect(r.events[0]!.amps).toBeCloseTo(20, 0)
    expect(r.events[1]!.amps).toBeCloseTo(40, 0)
    // both loads still touch line B: still energized, as anyone touching them would find
    expect(r.energized).toBe(true)
    for (const id of ['F1', 'F2']) expect(r.devices[id]!.state).toBe('blown')
  })
})
