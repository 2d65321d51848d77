// The Starters: valid documents, stable slugs, de-energized as shipped, and the readings the
// trade expects once the main breaker is closed. Each row names where its value comes from.
import { describe, expect, it } from 'vitest'
import { parseCircuit } from '#shared/circuit/parse'
import type { Circuit } from '#shared/circuit/schema'
import { meterVolts, solve } from '#shared/engine'
import { mainBreakerAmps, primaryFuseAmps, starterBySlug, starters, starterSlugs } from '#shared/starters'

const within = (actual: number, expected: number, fraction: number) => expect(Math.abs(actual - expected)).toBeLessThanOrEqual(Math.abs(expected) * fraction)

function withBreakerClosed(doc: Circuit): Circuit {
  const copy = structuredClone(doc)
  const cb1 = copy.components.find((c) => c.id === 'CB1')
  if (cb1?.kind !== 'breaker') throw new Error('no main breaker CB1')
  cb1.closed = true
  return copy
}

const get = (slug: string) => {
  const s = starterBySlug(slug)
  if (!s) throw new Error(`no starter ${slug}`)
  return s
}

describe('the starter list', () => {
  it('has these slugs, in this order (they are links: never rename one)', () => {
    expect(starterSlugs).toEqual([
      'closed-delta-240',
      'closing-check-practice',
      'open-delta-240',
      'delta-wye-208y120',
      'high-leg-delta-240-120',
      'wye-delta-240',
      'single-unit-parallel-120',
      'single-unit-series-240-120',
      'open-high-leg-delta-240-120',
      'floating-wye-delta-closing-check',
    ])
  })

  it('slugs are unique and kebab-case', () => {
    expect(new Set(starterSlugs).size).toBe(starterSlugs.length)
    for (const slug of starterSlugs) expect(slug).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/)
  })

  it.each(starters.map((s) => [s.slug, s] as const))('%s: a title, a one-line purpose, a named document', (_, s) => {
    expect(s.title.length).toBeGreaterThan(5)
    expect(s.purpose).not.toMatch(/\n/)
    expect(s.purpose.length).toBeLessThan(140)
    expect(s.document.name).toBe(s.title)
  })
})

describe('every starter as shipped', () => {
  it.each(starters.map((s) => [s.slug, s] as const))('%s validates, has a layout for every part, and starts with CB1 open', (_, s) => {
    const parsed = parseCircuit(s.document)
    expect(parsed.ok ? [] : parsed.errors).toEqual([])
    for (const c of s.document.components) expect(s.document.layout?.[c.id], c.id).toBeDefined()
    expect(s.document.components.find((c) => c.id === 'CB1')).toMatchObject({ kind: 'breaker', closed: false })
    const r = solve(s.document)
    expect(r.energized).toBe(false)
    expect(r.hazards).toEqual([])
  })

  it('starterBySlug hands out a deep copy: editing it leaves the gallery alone', () => {
    const copy = get('closed-delta-240')
    const cb1 = copy.document.components.find((c) => c.id === 'CB1')!
    if (cb1.kind === 'breaker') cb1.closed = true
    copy.document.wires.pop()
    copy.document.layout!.S1!.x = 999
    const fresh = get('closed-delta-240')
    expect(fresh.document.components.find((c) => c.id === 'CB1')).toMatchObject({ closed: false })
    expect(fresh.document.wires.length).toBe(copy.document.wires.length + 1)
    expect(fresh.document.layout!.S1!.x).toBe(0)
    expect(starterBySlug('no-such-starter')).toBeUndefined()
  })
})

describe('protection sizes', () => {
  // NEC Table 450.3(B), primary only, 9 A or more: 125 %, Note 1 next standard size up (NEC 240.6(A)); from memory.
  it.each([
    ['closed-delta-240', '3 × 10 kVA at 480 V = 36.1 A; × 1.25 = 45.1 A → 50 A', 50],
    ['open-delta-240', '√3 × 10 kVA at 480 V = 20.8 A; × 1.25 = 26.0 A → 30 A', 30],
    ['wye-delta-240', '3 × 10 kVA at 480 V = 36.1 A → 50 A', 50],
    ['floating-wye-delta-closing-check', '3 × 10 kVA at 480 V = 36.1 A → 50 A', 50],
    ['single-unit-parallel-120', '10 kVA at 480 V single-phase = 20.8 A → 30 A', 30],
  ])('%s: primary fuses %s', (slug, _, amps) => {
    const fuses = get(slug).document.components.filter((c) => c.kind === 'fuse')
    expect(fuses.length).toBeGreaterThan(0)
    for (const f of fuses) expect(f).toMatchObject({ amps })
  })

  it('the main breaker is the smallest standard rating of at least twice the fuses (common practice: the time-delay fuse clears a bank fault below the main\'s magnetic trip)', () => {
    expect(mainBreakerAmps(50)).toBe(100)
    expect(mainBreakerAmps(30)).toBe(60)
    expect(mainBreakerAmps(35)).toBe(70)
    expect(primaryFuseAmps({ primary: 'delta', supply: { connection: 'delta', lineVolts: 480 }, units: { kva: 25, primaryVolts: 480, secondaryVolts: [240] } })).toBe(125)
  })

  it('a single unit uses two lines: a 2-pole breaker and two fuses', () => {
    const doc = get('single-unit-parallel-120').document
    expect(doc.components.find((c) => c.id === 'CB1')).toMatchObject({ poles: 2 })
    expect(doc.components.filter((c) => c.kind === 'fuse').map((c) => c.id)).toEqual(['F1', 'F2'])
  })

  it('closing the closed delta with T2 reversed opens a fuse, not the main breaker', () => {
    const doc = withBreakerClosed(get('closed-delta-240').document)
    // swap T2's secondary ends: the leads on X1 and X4 trade places
    doc.wires = doc.wires.map((w) => w.map((t) => (t === 'T2.X1' ? 'T2.X4' : t === 'T2.X4' ? 'T2.X1' : t)) as [string, string])
    const r = solve(doc)
    expect(r.hazards.map((h) => h.code)).toContain('reversed-winding')
    expect(r.events.length).toBeGreaterThan(0)
    expect(r.events[0]!.device).toMatch(/^F[123]$/)
    expect(r.devices.CB1!.state).toBe('closed')
  })
})

describe('with CB1 closed: no hazards, no events, and the readings the trade expects', () => {
  const ROOT3 = Math.sqrt(3)
  // [slug, source, { meter: volts }, tolerance, clock]
  const rows: [string, string, Record<string, number>, number, number][] = [
    ['closed-delta-240', 'delta line voltage = coil voltage, 2 × 120 V in series (common practice)', { Mab: 240, Mbc: 240, Mca: 240 }, 0.01, 0],
    ['closing-check-practice', 'closing check near 0 V on a correctly phased delta (common practice)', { Mab: 240, Mbc: 240, Mca: 240 }, 0.01, 0],
    ['open-delta-240', 'an open delta keeps all three line voltages (common practice)', { Mab: 240, Mbc: 240, Mca: 240 }, 0.01, 0],
    ['delta-wye-208y120', 'wye: line = √3 × phase, 120 V coils → 208Y/120; IEEE C57.12.00 low side lags 30° (IEC 60076-1 Dyn1)', { Man: 120, Mbn: 120, Mcn: 120, Mab: 120 * ROOT3, Mbc: 120 * ROOT3, Mca: 120 * ROOT3 }, 0.01, 1],
    ['high-leg-delta-240-120', 'high leg to neutral = 120 × √3 ≈ 207.8 V (common practice; NEC 110.15 marks it)', { Mab: 240, Mbc: 240, Mca: 240, Man: 120, Mcn: 120, Mbn: 120 * ROOT3 }, 0.01, 0],
    ['wye-delta-240', '277 V primaries line to neutral of 480Y/277 V; IEEE C57.12.00 low side lags 30° (IEC 60076-1 Yd1)', { Mab: 240, Mbc: 240, Mca: 240 }, 0.01, 1],
    ['single-unit-parallel-120', 'X1–X3 and X2–X4 tied: coils in parallel, 120 V (circuit-format.md polarity convention)', { Mab: 120 }, 0.01, 0],
    ['single-unit-series-240-120', 'X2–X3 tied: coils in series, 240 V with a 120 V centre tap (circuit-format.md)', { Mab: 240, Man: 120, Mbn: 120 }, 0.01, 0],
    ['open-high-leg-delta-240-120', 'open high leg ≈ 207.8 V to neutral (common practice)', { Mab: 240, Mbc: 240, Mca: 240, Man: 120, Mcn: 120, Mbn: 120 * ROOT3 }, 0.01, 0],
    ['floating-wye-delta-closing-check', '277 V primaries across 480 V ÷ √3 with the star point floating, held by the cores; IEC 60076-1 Yd1', { Mab: 240, Mbc: 240, Mca: 240, MC: 0 }, 0.01, 1],
  ]

  it('covers every starter', () => {
    expect(rows.map((r) => r[0]).sort()).toEqual([...starterSlugs].sort())
  })

  it.each(rows)('%s: %s', (slug, _, expected, tolerance, clock) => {
    const r = solve(withBreakerClosed(get(slug).document))
    expect(r.energized).toBe(true)
    expect(r.hazards).toEqual([])
    expect(r.events).toEqual([])
    expect(Object.keys(r.meters)).toEqual(expect.arrayContaining(Object.keys(expected)))
    for (const [meter, volts] of Object.entries(expected)) {
      // a closing check reads near 0 V: within 5 % of the coil voltage (common practice)
      if (volts === 0) expect(meterVolts(r.meters[meter])).toBeLessThan(0.05 * 240)
      else within(meterVolts(r.meters[meter])!, volts, tolerance)
    }
    expect(r.bank.clock).toBe(clock)
  })

  it('closing-check-practice: the meter across the open corner reads under 5 % of the 240 V coil voltage (common practice)', () => {
    const r = solve(withBreakerClosed(get('closing-check-practice').document))
    expect(meterVolts(r.meters.MC)).toBeLessThan(0.05 * 240)
    expect(r.closingChecks).toEqual([expect.objectContaining({ ok: true, coilVolts: 240 })])
  })

  it('floating-wye-delta-closing-check: the star point goes nowhere, the supply has no neutral, and the open corner reads under 3 V (common practice: near 0 V on a correctly phased delta)', () => {
    const doc = get('floating-wye-delta-closing-check').document
    const supply = doc.components.find((c) => c.kind === 'supply')
    expect(supply).toMatchObject({ connection: 'delta', lineVolts: 480 })
    // the H2 ends are joined to one another and to nothing else
    const starPoint = doc.wires.filter((w) => w.some((t) => t.endsWith('.H2')))
    expect(starPoint.flat().every((t) => /^T[123]\.H2$/.test(t))).toBe(true)
    expect(doc.components.filter((c) => c.kind === 'transformer')).toEqual(Array.from({ length: 3 }, () => expect.objectContaining({ primaryVolts: 277, secondaryVolts: [120, 120] })))
    const r = solve(withBreakerClosed(doc))
    expect(meterVolts(r.meters.MC)).toBeLessThan(3)
    expect(r.closingChecks).toEqual([expect.objectContaining({ ok: true, energized: true, coilVolts: 240 })])
    expect(r.bank.vectorGroup).toBe('Yd1')
    expect(r.hazards.filter((h) => h.severity === 'danger')).toEqual([])
  })

  it.each([
    ['closed-delta-240', 'delta', 'delta', 'series'],
    ['open-delta-240', 'open-delta', 'open-delta', 'series'],
    ['delta-wye-208y120', 'delta', 'wye', 'parallel'],
    ['wye-delta-240', 'wye', 'delta', 'series'],
    ['floating-wye-delta-closing-check', 'wye', 'delta', 'series'],
    ['single-unit-parallel-120', 'single-phase', 'single-phase', 'parallel'],
  ])('%s is read from its wiring as %s–%s, coils %s', (slug, primary, secondary, coils) => {
    const r = solve(withBreakerClosed(get(slug).document))
    expect(r.bank).toMatchObject({ primary, secondary, coils })
  })
})
