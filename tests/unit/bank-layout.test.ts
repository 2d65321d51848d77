// layoutBank: every part placed, no two node boxes overlapping, and the bank reading left to
// right from supply to meters, loads below the units.
import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { layoutBank, NODE_BOX, type Layout } from '#shared/banks/layout'
import type { CircuitInput } from '#shared/circuit/schema'

type Kind = keyof typeof NODE_BOX
const boxOf = (doc: CircuitInput, layout: Layout, id: string) => {
  const kind = doc.components.find((c) => c.id === id)!.kind as Kind
  const size = NODE_BOX[kind] ?? NODE_BOX.other
  return { ...layout[id]!, ...size }
}

function overlaps(doc: CircuitInput, layout: Layout): string[] {
  const ids = doc.components.map((c) => c.id)
  const found: string[] = []
  for (let i = 0; i < ids.length; i++) {
    for (let j = i + 1; j < ids.length; j++) {
      const a = boxOf(doc, layout, ids[i]!)
      const b = boxOf(doc, layout, ids[j]!)
      if (a.x < b.x + b.width && b.x < a.x + a.width && a.y < b.y + b.height && b.y < a.y + a.height) found.push(`${ids[i]}/${ids[j]}`)
    }
  }
  return found
}

const unit = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const banks: [string, BankSpec][] = [
  ['closed delta with breaker, fuses and delta loads', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', fuseAmps: 50, breaker: { amps: 60, closed: false }, load: { ohms: 10, connection: 'delta' } }],
  ['delta with an open corner', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', openCorner: true, fuseAmps: 50 }],
  ['delta-wye with wye loads', { supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: 5, connection: 'wye' } }],
  ['high leg with lighting loads', { supply: delta480, units: unit, primary: 'delta', secondary: 'high-leg', coils: 'series', lightingOhms: 4 }],
  ['one unit, nothing else', { supply: delta480, units: unit, primary: 'single', secondary: 'single', coils: 'parallel' }],
]

describe('layoutBank on banks made by buildBank', () => {
  it.each(banks)('%s: every part placed, none overlapping', (_, spec) => {
    const doc = buildBank(spec)
    const layout = layoutBank(doc)
    expect(Object.keys(layout).sort()).toEqual(doc.components.map((c) => c.id).sort())
    expect(overlaps(doc, layout)).toEqual([])
  })

  it('reads top to bottom: supply, breaker and fuses; then the units in one row; then output block, meters and loads', () => {
    const doc = buildBank(banks[0]![1])
    const l = layoutBank(doc)
    expect(l.S1!.x).toBeLessThan(l.CB1!.x)
    expect(l.CB1!.x).toBeLessThan(l.F1!.x)
    expect([l.T1!.y, l.T2!.y, l.T3!.y]).toEqual([l.T1!.y, l.T1!.y, l.T1!.y])
    expect(l.T1!.y).toBeGreaterThanOrEqual(l.F3!.y + NODE_BOX.fuse.height)
    expect(l.T1!.x).toBeLessThan(l.T2!.x)
    expect(l.T2!.x).toBeLessThan(l.T3!.x)
    expect(l.OUT!.y).toBeGreaterThanOrEqual(l.T1!.y + NODE_BOX.transformer.height)
    for (const m of ['Mab', 'Mbc', 'Mca']) expect(l[m]!.x).toBeGreaterThan(l.OUT!.x)
    for (const load of ['La', 'Lb', 'Lc']) expect(l[load]!.y).toBeGreaterThanOrEqual(l.T1!.y + NODE_BOX.transformer.height)
  })

  it('stays about as tall as it is wide, so the canvas can show it at a readable size', () => {
    const doc = buildBank(banks[0]![1])
    const l = layoutBank(doc)
    const right = Math.max(...doc.components.map((c) => boxOf(doc, l, c.id)).map((b) => b.x + b.width))
    const bottom = Math.max(...doc.components.map((c) => boxOf(doc, l, c.id)).map((b) => b.y + b.height))
    expect(right / bottom).toBeLessThan(2)
  })

  it('puts the closing-check meter at the bottom, apart from the line meters', () => {
    const doc = buildBank(banks[1]![1])
    const l = layoutBank(doc)
    expect(l.MC!.y).toBeGreaterThanOrEqual(l.T1!.y + NODE_BOX.transformer.height)
    expect(l.MC!.x).toBeGreaterThan(l.Mab!.x)
  })
})

describe('layoutBank on any document', () => {
  it('places a hand-written example without overlaps', () => {
    const doc = JSON.parse(readFileSync(new URL('../../examples/one-unit-series.json', import.meta.url), 'utf8')) as CircuitInput
    const layout = layoutBank(doc)
    expect(Object.keys(layout).sort()).toEqual(doc.components.map((c) => c.id).sort())
    expect(overlaps(doc, layout)).toEqual([])
  })

  it('places parts of a kind it does not know, and an empty document', () => {
    const doc = {
      format: 'phaseloom.circuit',
      version: 1,
      components: [{ id: 'X1', kind: 'mystery' }, { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [240] }, { id: 'L1', kind: 'load', ohms: 5 }],
      wires: [],
    } as unknown as CircuitInput
    const layout = layoutBank(doc)
    expect(Object.keys(layout).sort()).toEqual(['L1', 'T1', 'X1'])
    expect(overlaps(doc, layout)).toEqual([])
    expect(layoutBank({ components: [], wires: [] })).toEqual({})
  })
})
