// Lab sheets: the test points a bank gives, and the tolerance and likely-cause rules.
// Cause rules are the trade's common practice (no published source); the high-leg value is
// 120 × √3 (the four-wire delta, e.g. any handbook on 240/120 V delta services).
import { describe, expect, it } from 'vitest'
import { compareSheet, likelyCause, parseReading } from '../../shared/lab-sheets/compare'
import { labPoints, type TestPoint } from '../../shared/lab-sheets/points'
import { starterBySlug } from '../../shared/starters'

const doc = (slug: string) => starterBySlug(slug)!.document

describe('labPoints', () => {
  it('lists a closed delta in the order a lab takes it: primaries, the closing check, coils, outputs', () => {
    const points = labPoints(doc('closed-delta-240'))
    expect(points.map(p => p.kind)).toEqual([
      'primary', 'primary', 'primary', 'closing-check',
      'coil', 'coil', 'coil', 'coil', 'coil', 'coil', 'coil', 'coil', 'coil',
      'line-line', 'line-line', 'line-line',
    ])
    expect(points.map(p => p.step)).toEqual(points.map((_, i) => i + 1))
    const check = points.find(p => p.kind === 'closing-check')!
    // the corner closed last in the starter (T3.X4 to T1.X1), measured with it open
    expect([check.from, check.to].sort()).toEqual(['T1.X1', 'T3.X4'])
    expect(check.expectedVolts).toBeLessThan(1)
    expect(check.referenceVolts).toBe(240)
    for (const p of points.filter(p => p.kind === 'primary')) expect(p.expectedVolts).toBeCloseTo(480, -1)
    for (const p of points.filter(p => p.label.includes('coil X'))) expect(p.expectedVolts).toBeCloseTo(120, -1)
    for (const p of points.filter(p => p.label.includes('series'))) expect(p.expectedVolts).toBeCloseTo(240, -1)
    for (const p of points.filter(p => p.kind === 'line-line')) expect(p.expectedVolts).toBeCloseTo(240, -1)
  })

  it('takes the closing check of a bank saved with its corner open, and predicts the outputs with it closed', () => {
    const points = labPoints(doc('closing-check-practice'))
    const check = points.find(p => p.kind === 'closing-check')!
    expect(check.expectedVolts).toBeLessThan(1)
    const lines = points.filter(p => p.kind === 'line-line')
    expect(lines).toHaveLength(3)
    for (const p of lines) expect(p.expectedVolts).toBeCloseTo(240, -1)
  })

  it('names the high leg of a four-wire delta: 120 × √3 ≈ 207.8 V to n, the others 120 V', () => {
    const points = labPoints(doc('high-leg-delta-240-120'))
    const high = points.filter(p => p.kind === 'high-leg')
    expect(high).toHaveLength(1)
    expect(high[0]!.expectedVolts).toBeCloseTo(207.8, 0)
    const toN = points.filter(p => p.kind === 'line-neutral')
    expect(toN).toHaveLength(2)
    for (const p of toN) expect(p.expectedVolts).toBeCloseTo(120, 0)
  })

  it('gives a wye secondary no closing check', () => {
    const points = labPoints(doc('delta-wye-208y120'))
    expect(points.some(p => p.kind === 'closing-check')).toBe(false)
    expect(points.filter(p => p.kind === 'line-line').every(p => Math.abs(p.expectedVolts - 208) < 3)).toBe(true)
  })

  it('gives nothing for a document that is not a bank', () => {
    expect(labPoints({ format: 'nope' })).toEqual([])
  })
})

describe('parseReading', () => {
  it.each([
    ['239.8', 239.8], ['239,8', 239.8], [' 240 ', 240], ['0', 0], ['', null], ['  ', null],
  ])('%j → %j', (text, value) => expect(parseReading(text)).toBe(value))
  it.each(['abc', '1.2.3', '240V', '1e3'])('%j is not a reading', text => expect(parseReading(text)).toBeNaN())
})

const point = (kind: TestPoint['kind'], expectedVolts: number, referenceVolts = expectedVolts, id = `${kind}:${expectedVolts}`): TestPoint =>
  ({ id, step: 1, kind, label: kind, from: 'A.x', to: 'B.y', expectedVolts, referenceVolts, note: '' })

describe('likely causes of a miss (common practice of the trade)', () => {
  it.each([
    ['closing check ≈ 2 × coil voltage → one unit reversed', point('closing-check', 0, 240), 478, /one unit is connected backwards/],
    ['closing check between → units that do not match', point('closing-check', 0, 240), 60, /do not match/],
    ['0 V on an output line → open coil or blown fuse', point('line-line', 240), 0.4, /open coil, a blown fuse/],
    ['√3 × on a delta line → a unit backwards', point('line-line', 240), 415.7, /√3 × the expected/],
    ['÷ √3 → a line-to-n reading', point('line-line', 240), 138.6, /line-to-n/],
    ['half → one coil of a series pair', point('coil', 240), 120, /one coil of a series pair/],
    ['double → series where parallel was meant', point('line-line', 120), 240, /series where parallel/],
    ['anything else → meter, supply, tap', point('line-line', 240), 200, /Off by -17 %/],
  ])('%s', (_, p, measured, cause) => {
    expect(likelyCause(p, p.expectedVolts, measured, [measured / (p.expectedVolts || 1)])).toMatch(cause)
  })

  it('everything a few percent high at no load → compensated windings or a high supply, normal', () => {
    const points = [point('coil', 120, 120, 'a'), point('coil', 120, 120, 'b'), point('line-line', 240, 240, 'c')]
    const c = compareSheet(points, { a: 123.5, b: 123.8, c: 247.4 }, { tolerancePercent: 2 })
    expect(c.rows.map(r => r.status)).toEqual(['miss', 'miss', 'miss'])
    for (const r of c.rows) expect(r.cause).toMatch(/compensated windings/)
  })
})

describe('compareSheet', () => {
  const points = [point('primary', 480, 480, 'p'), point('closing-check', 0.1, 240, 'cc'), point('line-line', 240, 240, 'l')]

  it('marks each reading within ± the tolerance of its reference (the coil voltage for a closing check)', () => {
    const c = compareSheet(points, { p: 470, cc: 6, l: 253 })
    expect(c.rows.map(r => r.status)).toEqual(['ok', 'ok', 'miss'])
    expect(c.rows[2]!.deviationPercent).toBe(5.4)
    expect(c.misses).toBe(1)
    expect(c.taken).toBe(3)
  })

  it('takes the class tolerance', () => {
    expect(compareSheet(points, { l: 246 }, { tolerancePercent: 2 }).rows[2]!.status).toBe('miss')
    expect(compareSheet(points, { l: 246 }, { tolerancePercent: 3 }).rows[2]!.status).toBe('ok')
  })

  it('rescales the prediction to the measured supply when asked', () => {
    const plain = compareSheet(points, { l: 228 }, { tolerancePercent: 2 })
    expect(plain.rows[2]!.status).toBe('miss')
    const scaled = compareSheet(points, { l: 228 }, { tolerancePercent: 2, rescale: true, nominalSupplyVolts: 480, measuredSupplyVolts: 456 })
    expect(scaled.scale).toBeCloseTo(0.95, 6)
    expect(scaled.rows[2]!.expectedVolts).toBe(228)
    expect(scaled.rows[2]!.status).toBe('ok')
  })

  it('leaves readings not taken out of the count', () => {
    const c = compareSheet(points, { p: 480 })
    expect(c.rows.map(r => r.status)).toEqual(['ok', 'not-taken', 'not-taken'])
    expect(c.taken).toBe(1)
  })
})
