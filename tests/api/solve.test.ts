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
