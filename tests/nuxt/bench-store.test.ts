// The Bench store: undo/redo, jumper rules, and the protection's result kept in the document.
import { beforeEach, describe, expect, it } from 'vitest'
import { createPinia, setActivePinia } from 'pinia'
import { HISTORY_LIMIT, normaliseJumper, useBenchStore } from '~/stores/bench'
import { starterBySlug } from '#shared/starters'

const closedDelta = () => starterBySlug('closed-delta-240')!.document

describe('bench store', () => {
  beforeEach(() => setActivePinia(createPinia()))

  it('normalises jumpers: trimmed, one order, no duplicates either way round, none to itself', () => {
    expect(normaliseJumper(' T1.X3 ', 'T1.X2')).toEqual(['T1.X2', 'T1.X3'])
    const bench = useBenchStore()
    bench.load({ format: 'phaseloom.circuit', version: 1, components: [{ id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120], impedancePercent: 3, xOverR: 1.5, compensationPercent: 0, excitingPercent: 1, coreLossPercent: 0.2, tapPercent: 0, polarity: 'subtractive' }], wires: [] })
    expect(bench.addJumper('T1.X3', 'T1.X2')).toBe(true)
    expect(bench.doc.wires).toEqual([['T1.X2', 'T1.X3']])
    expect(bench.addJumper('T1.X2', 'T1.X3')).toBe(false)
    expect(bench.notice?.text).toMatch(/already joined/)
    expect(bench.addJumper('T1.X1', 'T1.X1')).toBe(false)
    expect(bench.addJumper('T1.X1', 'T1.X9')).toBe(false)
    expect(bench.notice?.text).toMatch(/no terminal T1\.X9/)
    expect(bench.doc.wires).toHaveLength(1)
    expect(bench.result?.bank.coils).toBe('series')
  })

  it('undoes and redoes every change, and a new change clears the redo list', () => {
    const bench = useBenchStore()
    bench.load(closedDelta())
    const start = bench.doc
    bench.addJumper('T1.X1', 'T2.X2')
    bench.movePart('T1', { x: 999, y: 10 })
    expect(bench.canUndo).toBe(true)
    bench.undo()
    expect(bench.doc.layout?.T1).toEqual(start.layout?.T1)
    bench.undo()
    expect(bench.doc).toBe(start)
    expect(bench.canUndo).toBe(false)
    bench.redo()
    expect(bench.doc.wires).toContainEqual(['T1.X1', 'T2.X2'])
    bench.removePart('Mab')
    expect(bench.canRedo).toBe(false)
  })

  it(`keeps at most ${HISTORY_LIMIT} steps`, () => {
    const bench = useBenchStore()
    bench.load(closedDelta())
    for (let i = 0; i < HISTORY_LIMIT + 10; i++) bench.movePart('T1', { x: i * 10, y: 0 })
    let steps = 0
    while (bench.canUndo) {
      bench.undo()
      steps++
    }
    expect(steps).toBe(HISTORY_LIMIT)
  })

  it('a keyboard jumper: pick one terminal, then another', () => {
    const bench = useBenchStore()
    bench.load(closedDelta())
    const before = bench.doc.wires.length
    expect(bench.pickTerminal('T1.H1')).toBe('picked')
    expect(bench.pendingTerminal).toBe('T1.H1')
    expect(bench.pickTerminal('T2.X1')).toBe('made')
    expect(bench.pendingTerminal).toBeNull()
    expect(bench.doc.wires).toHaveLength(before + 1)
    expect(bench.pickTerminal('T3.X1')).toBe('picked')
    expect(bench.pickTerminal('T3.X1')).toBe('cancelled')
  })

  it('closing the main breaker onto a reversed unit blows fuses, and the document keeps them blown', () => {
    const bench = useBenchStore()
    const doc = closedDelta()
    // reverse T2: swap the ends of its series secondary wherever they are wired
    const swap = (t: string) => (t === 'T2.X1' ? 'T2.X4' : t === 'T2.X4' ? 'T2.X1' : t)
    bench.load({ ...doc, wires: doc.wires.map(([a, b]) => [swap(a), swap(b)] as [string, string]) })
    expect(bench.energized).toBe(false)
    const preview = bench.previewBreaker('CB1', true)
    expect(preview.outcome.result?.hazards.map((h) => h.code)).toContain('reversed-winding')
    bench.setBreaker('CB1', true)
    expect(bench.eventLog.length).toBeGreaterThan(0)
    const blown = bench.doc.components.filter((c) => c.kind === 'fuse' && c.blown).map((c) => c.id)
    expect(blown.length).toBeGreaterThan(0)
    // a new fuse on the still-closed, still-faulted bank blows again at once
    bench.replaceFuse(blown[0]!)
    expect(bench.doc.components.find((c) => c.id === blown[0])).toMatchObject({ blown: true })
    bench.setBreaker('CB1', false)
    bench.replaceFuse(blown[0]!)
    expect(bench.doc.components.find((c) => c.id === blown[0])).toMatchObject({ blown: false })
  })

  it('counts jumpers changed while energized and warns', () => {
    const bench = useBenchStore()
    bench.load(closedDelta())
    bench.setBreaker('CB1', true)
    expect(bench.energized).toBe(true)
    bench.addJumper('Mab.a', 'T2.H1')
    expect(bench.liveRewires).toBe(1)
    expect(bench.notice?.text).toMatch(/de-energize before rewiring/)
  })
})
