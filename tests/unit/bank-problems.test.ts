// Whether the wiring makes a proper connection (bankProblems): a reversed unit, an open
// unit, units that make no three-phase set. Every row follows from the polarity convention
// of circuit-format.md (X1–X2 in phase with H1–H2) and the trade's common practice that a
// delta's coils cancel around the loop and a wye's cancel out of the star point.
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { solve } from '#shared/engine'
import { starters } from '#shared/starters'

const unit = { kva: 25, primaryVolts: 480, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const wye480 = { connection: 'wye' as const, lineVolts: 480 * Math.sqrt(3) }
const base = { supply: delta480, units: unit, primary: 'delta', coils: 'series', fuseAmps: 125 } as const
const dead = { breaker: { amps: 150, closed: false } }
const live = { breaker: { amps: 150, closed: true } }

type Doc = ReturnType<typeof buildBank>
const without = (doc: Doc, a: string, b: string): Doc => ({ ...doc, wires: doc.wires!.filter((w) => !(w.includes(a) && w.includes(b))) })

describe('a proper bank has no problems', () => {
  it.each(starters.map((s) => [s.slug, s.document] as const))('starter %s', (_slug, document) => {
    expect(solve(document).bankProblems).toEqual([])
  })
  it.each([
    ['delta–wye, ACB rotation (polarity convention)', { ...base, supply: { ...delta480, rotation: 'ACB' }, secondary: 'wye', ...live }],
    ['wye–wye (polarity convention)', { ...base, supply: wye480, primary: 'wye', secondary: 'wye', ...live }],
    ['open wye–open delta (polarity convention)', { ...base, supply: wye480, primary: 'open-wye', secondary: 'open-delta', ...live }],
    ['delta with one corner open (common practice: the closing check reads near 0 V)', { ...base, secondary: 'delta', openCorner: true, ...live }],
  ] as [string, BankSpec][])('%s', (_name, spec) => {
    expect(solve(buildBank(spec)).bankProblems).toEqual([])
  })
})

describe('a faulted bank says what is wrong, energized or not', () => {
  it.each([
    ['closed delta, T3 reversed', { ...base, secondary: 'delta', reversed: ['T3'] }, ['T3']],
    ['delta with an open corner, T2 reversed', { ...base, secondary: 'delta', openCorner: true, reversed: ['T2'] }, ['T2']],
    ['delta–wye, T2 reversed (no hazard is raised for it)', { ...base, secondary: 'wye', reversed: ['T2'] }, ['T2']],
    ['wye–wye, T1 reversed', { ...base, supply: wye480, primary: 'wye', secondary: 'wye', reversed: ['T1'] }, ['T1']],
    ['high-leg delta, the lighting unit T1 reversed', { ...base, secondary: 'high-leg', reversed: ['T1'] }, ['T1']],
    ['open delta, T2 reversed: either unit turned round would do', { ...base, primary: 'open-delta', secondary: 'open-delta', reversed: ['T2'] }, ['T1', 'T2']],
  ] as [string, BankSpec, string[]][])('%s', (_name, spec, units) => {
    for (const state of [dead, live]) {
      const r = solve(buildBank({ ...spec, ...state }))
      expect(r.bankProblems).toEqual([expect.objectContaining({ code: 'reversed-unit', side: 'secondary', units })])
      expect(r.bankProblems[0]!.message).toContain(units[0])
    }
  })

  it.each([
    ['delta, T2 X2–X3 missing', { ...base, secondary: 'delta' }, 'T2.X2', 'T2.X3'],
    ['delta–wye, T2 X2–X3 missing', { ...base, secondary: 'wye' }, 'T2.X2', 'T2.X3'],
    ['delta–wye, T2 X1 off the star point', { ...base, secondary: 'wye' }, 'T2.X1', 'OUT.n'],
  ] as [string, BankSpec, string, string][])('an open coil: %s', (_name, spec, a, b) => {
    const r = solve(without(buildBank({ ...spec, ...live }), a, b))
    expect(r.bankProblems).toEqual([expect.objectContaining({ code: 'open-coil', units: ['T2'] })])
    expect(r.bankProblems[0]!.message).toMatch(/T2's secondary is open/)
  })

  it('two units fed from the same pair of lines make no three-phase set', () => {
    const doc = buildBank({ ...base, secondary: 'delta', ...live })
    // T2's primary moved from B–C onto A–B, beside T1
    const wires = doc.wires!.map(([x, y]): [string, string] => (x === 'F2.b' && y === 'T2.H1' ? ['F1.b', 'T2.H1'] : x === 'F3.b' && y === 'T2.H2' ? ['F2.b', 'T2.H2'] : [x, y]))
    const r = solve({ ...doc, wires })
    expect(r.bankProblems.map((p) => p.code)).toContain('not-three-phase')
  })
})
