// POST /api/solve against the built server.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { api } from './helpers'

const example = JSON.parse(readFileSync(new URL('../../examples/one-unit-series.json', import.meta.url), 'utf8'))

describe('POST /api/solve', () => {
  it('solves the example of circuit-format.md without a sign-in', async () => {
    const r = await api('/api/solve', { method: 'POST', json: example })
    expect(r.status).toBe(200)
    expect(r.body.energized).toBe(true)
    expect(r.body.meters.M1.volts).toBeCloseTo(240, 1)
    expect(r.body.bank).toMatchObject({ primary: 'single-phase', secondary: 'single-phase', coils: 'series' })
  })

  it('accepts the kinds and fields of format 1.1 (ammeter, rotation meter, fuse class, disconnect, tap, polarity)', async () => {
    const doc = {
      format: 'phaseloom.circuit',
      version: 1,
      components: [
        { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480, rotation: 'ACB' },
        { id: 'SW1', kind: 'breaker', poles: 2, amps: 30, closed: true, trips: false },
        { id: 'F1', kind: 'fuse', amps: 30, curve: 'fast-acting' },
        { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [240], tapPercent: 2.5, polarity: 'additive', excitingPercent: 1.5, coreLossPercent: 0.3 },
        { id: 'A1', kind: 'ammeter' },
        { id: 'L1', kind: 'load', ohms: 12 },
        { id: 'R1', kind: 'rotation-meter' },
      ],
      wires: [['S1.A', 'SW1.L1'], ['S1.B', 'SW1.L2'], ['SW1.T1', 'F1.a'], ['F1.b', 'T1.H1'], ['SW1.T2', 'T1.H2'], ['T1.X1', 'A1.a'], ['A1.b', 'L1.a'], ['L1.b', 'T1.X2'], ['R1.a', 'S1.A'], ['R1.b', 'S1.B'], ['R1.c', 'S1.C']],
    }
    const r = await api('/api/solve', { method: 'POST', json: doc })
    expect(r.status).toBe(200)
    // 240 V / 1.025 on the tap, across 12 Ω: about 19.5 A
    expect(r.body.meters.A1.amps).toBeCloseTo(240 / 1.025 / 12, 0)
    expect(r.body.meters.R1).toEqual({ sequence: 'ACB' })
    // no output block: no displacement, so no vector group
    expect(r.body.bank.vectorGroup).toBeNull()
    // a 30 A fast-acting fuse on a 10 kVA unit's 250 A inrush (12 × 20.8 A, common practice)
    expect(r.body.cautions.map((c: { units: string[] }) => c.units[0])).toEqual(['F1'])
  })

  it('400 with every error and its path for an invalid document', async () => {
    const bad = { ...example, components: [...example.components, { id: 'T1', kind: 'transformer', kva: 'ten' }] }
    const r = await api('/api/solve', { method: 'POST', json: bad })
    expect(r.status).toBe(400)
    const paths = r.body.data.errors.map((e: { path: string }) => e.path)
    expect(paths).toEqual(expect.arrayContaining(['components[3].kva', 'components[3].id']))
    expect(r.text).not.toMatch(/\.ts:\d+|at Object\./)
  })

  it('400 naming the body for malformed JSON, and for no body', async () => {
    const broken = await api('/api/solve', { method: 'POST', body: '{"format":', headers: { 'content-type': 'application/json' } })
    expect(broken.status).toBe(400)
    expect(broken.body.data.errors[0].message).toMatch(/not valid JSON/)
    const empty = await api('/api/solve', { method: 'POST' })
    expect(empty.status).toBe(400)
  })

  it('413 for a body over 256 KB', async () => {
    const huge = { ...example, name: 'x'.repeat(300 * 1024) }
    const r = await api('/api/solve', { method: 'POST', json: huge })
    expect(r.status).toBe(413)
  })

  it('422 naming the parts for a circuit with no solution', async () => {
    const loop = {
      format: 'phaseloom.circuit',
      version: 1,
      components: [{ id: 'S9', kind: 'supply', connection: 'wye', lineVolts: 208, sourceOhms: { r: 0, x: 0 } }],
      wires: [['S9.A', 'S9.N']],
    }
    const r = await api('/api/solve', { method: 'POST', json: loop })
    expect(r.status).toBe(422)
    expect(r.body.data.parts).toEqual(['S9'])
  })
})
