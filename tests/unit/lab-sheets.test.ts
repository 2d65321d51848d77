// Lab sheets: the test points a bank gives, and the tolerance and likely-cause rules.
// Cause rules are the trade's common practice (no published source); the high-leg value is
// 120 × √3 (the four-wire delta, e.g. any handbook on 240/120 V delta services). The readings
// of a wye with one unit reversed are worked here from the phasors (phasor arithmetic).
import { describe, expect, it } from 'vitest'
import { compareSheet, likelyCause, parseReading, sheetCause, type ComparedRow } from '../../shared/lab-sheets/compare'
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

describe('feeders of the output readings', () => {
  it('names the one unit on each line of a wye (from the starter’s wiring: a on T3, b on T1, c on T2)', () => {
    const lines = labPoints(doc('delta-wye-208y120')).filter(p => p.kind === 'line-line')
    expect(lines.map(p => p.feeders)).toEqual([
      { 'OUT.a': 'T3', 'OUT.b': 'T1' },
      { 'OUT.b': 'T1', 'OUT.c': 'T2' },
      { 'OUT.c': 'T2', 'OUT.a': 'T3' },
    ])
  })

  it('names none at a delta corner, where two units meet', () => {
    for (const p of labPoints(doc('closed-delta-240')).filter(p => p.kind === 'line-line')) expect(p.feeders).toBeUndefined()
  })
})

// the readings of a sheet by point id, from a few by label end ("T1 coil X1–X2", "Output a–b")
function readings(points: TestPoint[], byLabel: Record<string, number>): Record<string, number> {
  const out: Record<string, number> = {}
  for (const [label, volts] of Object.entries(byLabel)) {
    const p = points.find(q => q.label === label || q.label.startsWith(`${label} (`))
    if (!p) throw new Error(`no point ${label}`)
    out[p.id] = volts
  }
  return out
}
const causeOf = (points: TestPoint[], byLabel: Record<string, number>, label: string) =>
  compareSheet(points, readings(points, byLabel)).rows.find(r => r.point.label === label || r.point.label.startsWith(`${label} (`))!

const BUCKING = /the two coils are bucking: one coil is reversed \(check the X2–X3 jumper and the coil marking\)/

describe('a unit’s two coils in series, read with its coils (common practice of the trade)', () => {
  const series = labPoints(doc('single-unit-series-240-120'))
  const delta = labPoints(doc('closed-delta-240'))

  it.each([
    ['common practice: each coil right, X1–X4 ≈ 0 V → bucking, one coil reversed', series, { 'T1 coil X1–X2': 120.2, 'T1 coil X3–X4': 119.8, 'T1 X1–X4': 0.4 }, 'T1 X1–X4', BUCKING],
    ['common practice: the same in a closed delta, unit T2', delta, { 'T2 coil X1–X2': 121, 'T2 coil X3–X4': 120.5, 'T2 X1–X4': 1.2 }, 'T2 X1–X4', /coil of T2 .*the two coils are bucking/],
    ['common practice: a few volts across a bucking pair of slightly unlike coils is still bucking', series, { 'T1 coil X1–X2': 121, 'T1 coil X3–X4': 116, 'T1 X1–X4': 5 }, 'T1 X1–X4', BUCKING],
    ['common practice: the 120/240 V output a–b across that pair at 0 V → bucking too', series, { 'T1 coil X1–X2': 120, 'T1 coil X3–X4': 120, 'Output a–b': 0.3 }, 'Output a–b', BUCKING],
    ['common practice: X1–X2 ≈ 0 V, X3–X4 right → X1–X2 is an open coil', series, { 'T1 coil X1–X2': 0.2, 'T1 coil X3–X4': 120, 'T1 X1–X4': 0.3 }, 'T1 coil X1–X2', /X1–X2 of T1 reads about 0 V while X3–X4 reads right: an open coil/],
    ['common practice: the series pair beside that open coil → the open coil, not bucking', series, { 'T1 coil X1–X2': 0.2, 'T1 coil X3–X4': 120, 'T1 X1–X4': 0.3 }, 'T1 X1–X4', /X1–X2 of T1 .*an open coil/],
    ['common practice: X3–X4 open, X1–X2 right', delta, { 'T3 coil X1–X2': 119.9, 'T3 coil X3–X4': 0, 'T3 X1–X4': 0.1 }, 'T3 X1–X4', /X3–X4 of T3 reads about 0 V while X1–X2 reads right: an open coil/],
    ['common practice: X1–X4 ≈ 0 V with the coils not read → open or bucking: read each coil', series, { 'T1 X1–X4': 0.2 }, 'T1 X1–X4', /an open coil, or the two coils bucking .*Read each coil on its own/],
    ['common practice: both coils and the pair at 0 V → nothing reaches the unit: fuse, breaker, upstream', series, { 'T1 coil X1–X2': 0, 'T1 coil X3–X4': 0, 'T1 X1–X4': 0 }, 'T1 X1–X4', /an open coil, a blown fuse, an open breaker/],
    ['common practice: half across the pair with both coils right → only one coil in the reading (the X2–X3 jumper)', series, { 'T1 coil X1–X2': 120, 'T1 coil X3–X4': 120, 'T1 X1–X4': 120 }, 'T1 X1–X4', /one coil of a series pair/],
  ] as const)('%s', (_, points, byLabel, label, cause) => {
    const row = causeOf(points, byLabel, label)
    expect(row.status).toBe('miss')
    expect(row.cause).toMatch(cause)
  })

  it('common practice: a bucking pair is not called an open coil, and the coils that read right carry no cause', () => {
    const c = compareSheet(series, readings(series, { 'T1 coil X1–X2': 120, 'T1 coil X3–X4': 120, 'T1 X1–X4': 0.4 }))
    const pair = c.rows.find(r => r.point.label.startsWith('T1 X1–X4'))!
    expect(pair.cause).not.toMatch(/open coil/)
    expect(c.rows.filter(r => r.point.label.includes('coil X')).map(r => [r.status, r.cause])).toEqual([['ok', null], ['ok', null]])
  })
})

// line to line of a 208Y/120 V wye with the unit on one phase turned round (its coil phasor + 180°):
// e.g. b reversed: |120∠0° − 120∠60°| = 120 V (a–b), |120∠60° − 120∠120°| = 120 V (b–c), c–a stays 208 V
function wyeWithReversed(phase: 'a' | 'b' | 'c' | null, coilVolts = 119.4): Record<'a–b' | 'b–c' | 'c–a', number> {
  const degrees = { a: 0, b: -120, c: 120 }
  const at = (x: 'a' | 'b' | 'c') => {
    const d = ((degrees[x] + (x === phase ? 180 : 0)) * Math.PI) / 180
    return [coilVolts * Math.cos(d), coilVolts * Math.sin(d)] as const
  }
  const across = (x: 'a' | 'b' | 'c', y: 'a' | 'b' | 'c') => Math.round(Math.hypot(at(x)[0] - at(y)[0], at(x)[1] - at(y)[1]) * 10) / 10
  return { 'a–b': across('a', 'b'), 'b–c': across('b', 'c'), 'c–a': across('c', 'a') }
}
const wyeLines = (v: Record<string, number>) => Object.fromEntries(Object.entries(v).map(([pair, volts]) => [`Output ${pair}`, volts]))

describe('a wye’s line pairs read together (common practice of the trade)', () => {
  const wye = labPoints(doc('delta-wye-208y120'))
  const REVERSED = /one unit in the wye is connected backwards/

  it('works the phasors: one unit reversed leaves two pairs at ÷ √3 and the third right', () => {
    expect(wyeWithReversed(null)).toEqual({ 'a–b': 206.8, 'b–c': 206.8, 'c–a': 206.8 })
    expect(wyeWithReversed('b')).toEqual({ 'a–b': 119.4, 'b–c': 119.4, 'c–a': 206.8 })
  })

  it.each([
    // the starter's wiring: line a on T3, b on T1, c on T2
    ['common practice + phasors: b reversed → a–b and b–c low → the unit on phase b (T1)', 'b', 'T1', ['Output a–b', 'Output b–c'], 'Output c–a'],
    ['common practice + phasors: c reversed → b–c and c–a low → the unit on phase c (T2)', 'c', 'T2', ['Output b–c', 'Output c–a'], 'Output a–b'],
    ['common practice + phasors: a reversed → a–b and c–a low → the unit on phase a (T3)', 'a', 'T3', ['Output a–b', 'Output c–a'], 'Output b–c'],
  ] as const)('%s', (_, phase, unit, low, right) => {
    const c = compareSheet(wye, readings(wye, wyeLines(wyeWithReversed(phase))))
    for (const label of low) {
      const row = c.rows.find(r => r.point.label === label)!
      expect(row.status).toBe('miss')
      expect(row.cause).toMatch(REVERSED)
      expect(row.cause).toContain(`the unit on phase ${phase} (${unit}) is the one reversed`)
      expect(row.cause).not.toMatch(/line-to-n voltage/)
    }
    expect(c.rows.find(r => r.point.label === right)!).toMatchObject({ status: 'ok', cause: null })
  })

  it.each([
    ['common practice: the pattern holds with the third pair off too (everything doubled: coils in series)', { 'a–b': 238.8, 'b–c': 238.8, 'c–a': 413.6 }, 'Output a–b', /÷ √3 of what c–a reads: one unit in the wye is connected backwards.*phase b \(T1\)/],
    ['common practice: …and the third pair then gets its own cause', { 'a–b': 238.8, 'b–c': 238.8, 'c–a': 413.6 }, 'Output c–a', /twice the expected/],
    ['common practice: the line to n readings right beside two low pairs do not change it', { 'a–b': 119.6, 'b–c': 119.2, 'c–a': 207, 'a–n': 119.5, 'b–n': 119.4, 'c–n': 119.3 }, 'Output b–c', REVERSED],
    ['common practice: two pairs low, the third not read → most likely a unit reversed; read the third', { 'a–b': 119.4, 'b–c': 119.4 }, 'Output a–b', /most likely one unit in the wye is connected backwards.*phase b \(T1\).*Read the third line pair/],
    ['common practice: one pair at ÷ √3, the others right → line to n read by mistake', { 'a–b': 119.4, 'b–c': 206.8, 'c–a': 206.8 }, 'Output a–b', /this reads like a line-to-n voltage/],
    ['common practice: all three at ÷ √3 → the leads are on line and n', { 'a–b': 119.4, 'b–c': 119.5, 'c–a': 119.3 }, 'Output b–c', /All three line pairs read about ÷ √3.*on a line and n/],
  ] as const)('%s', (_, pairs, label, cause) => {
    const row = causeOf(wye, wyeLines(pairs), label)
    expect(row.status).toBe('miss')
    expect(row.cause).toMatch(cause)
  })

  it('common practice: on a delta, two pairs at ÷ √3 keep the one-reading cause (no wye to reverse a unit in)', () => {
    const delta = labPoints(doc('closed-delta-240'))
    const row = causeOf(delta, { 'Output a–b': 138.6, 'Output b–c': 138.5, 'Output c–a': 240 }, 'Output a–b')
    expect(row.cause).toMatch(/line-to-n voltage/)
    expect(row.cause).not.toMatch(/in the wye/)
  })

  it('common practice: a wye known by its line-to-n predictions alone (no feeders) reads the same', () => {
    const bare = wye.map(p => ({ ...p, feeders: undefined }))
    expect(causeOf(bare, wyeLines(wyeWithReversed('b')), 'Output a–b').cause).toMatch(/one unit in the wye is connected backwards.*the unit on phase b is the one reversed/)
  })
})

describe('sheetCause', () => {
  it('with only the one reading to go on, says what likelyCause says', () => {
    const p = point('line-line', 240)
    const row: ComparedRow = { point: p, expectedVolts: 240, measuredVolts: 138.6, deviationPercent: -42.3, status: 'miss', cause: null }
    expect(sheetCause(row, [row])).toBe(likelyCause(p, 240, 138.6, [138.6 / 240]))
    expect(sheetCause({ ...row, measuredVolts: null }, [row])).toBeNull()
  })
})
