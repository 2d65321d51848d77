// Properties that hold for every bank, checked on random ones (fast-check): the engine never
// throws on a valid document, its solution satisfies Kirchhoff's current law and balances
// complex power, it is linear in the supply voltage, and invalid documents get errors.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec, type PrimaryConnection, type SecondaryConnection } from '#shared/banks/build'
import { parseCircuit } from '#shared/circuit/parse'
import { terminalsOf, type CircuitInput } from '#shared/circuit/schema'
import { CircuitValidationError, CLOSED_CONTACT_OHMS, LEAK_SIEMENS, solveDetailed, VOLTMETER_OHMS } from '#shared/engine'
import type { SolveDetail } from '#shared/engine'

const shapes: [PrimaryConnection, SecondaryConnection, BankSpec['coils'][]][] = [
  ['delta', 'delta', ['series', 'parallel', 'single']],
  ['delta', 'wye', ['series', 'parallel', 'single']],
  ['delta', 'high-leg', ['series']],
  ['wye', 'delta', ['series', 'parallel']],
  ['wye', 'wye', ['parallel', 'single']],
  ['open-delta', 'open-delta', ['series', 'parallel']],
  ['open-delta', 'open-high-leg', ['series']],
  ['open-wye', 'open-delta', ['series']],
  ['single', 'single', ['series', 'parallel', 'single']],
]

const unitArb = fc.record({
  kva: fc.constantFrom(3, 5, 10, 15, 25, 37.5, 50),
  primaryVolts: fc.constantFrom(240, 277, 480),
  secondaryVolts: fc.constantFrom([120, 120], [240, 240], [120, 110]),
  impedancePercent: fc.double({ min: 1, max: 8, noNaN: true }),
  xOverR: fc.double({ min: 0.5, max: 6, noNaN: true }),
  compensationPercent: fc.constantFrom(0, 0, 2, 3.5),
  // format 1.1: the exciting branch, taps and the bushing layout
  excitingPercent: fc.double({ min: 0.2, max: 5, noNaN: true }),
  coreLossPercent: fc.double({ min: 0, max: 0.2, noNaN: true }),
  tapPercent: fc.constantFrom(-5, -2.5, 0, 0, 2.5, 5),
  polarity: fc.constantFrom('subtractive' as const, 'additive' as const),
})

const specArb: fc.Arbitrary<BankSpec> = fc
  .record({
    shape: fc.constantFrom(...shapes),
    coilPick: fc.nat(2),
    supplyWye: fc.boolean(),
    lineVolts: fc.double({ min: 120, max: 900, noNaN: true }),
    rotation: fc.constantFrom('ABC' as const, 'ACB' as const),
    source: fc.record({ r: fc.double({ min: 0.001, max: 0.5, noNaN: true }), x: fc.double({ min: 0, max: 1, noNaN: true }) }),
    units: fc.array(unitArb, { minLength: 3, maxLength: 3 }),
    reversed: fc.subarray(['T1', 'T2', 'T3']),
    openCorner: fc.boolean(),
    fuseAmps: fc.option(fc.constantFrom(15, 30, 60, 100), { nil: undefined }),
    breaker: fc.option(fc.record({ amps: fc.constantFrom(20, 50, 100), closed: fc.boolean() }), { nil: undefined }),
    load: fc.option(
      fc.record({
        ohms: fc.oneof(fc.double({ min: 0.5, max: 200, noNaN: true }), fc.record({ r: fc.double({ min: 0, max: 50, noNaN: true }), x: fc.double({ min: -20, max: 20, noNaN: true }) })),
        connection: fc.constantFrom('wye' as const, 'delta' as const),
      }),
      { nil: undefined },
    ),
  })
  .map((r) => {
    const [primary, secondary, coils] = r.shape
    const count = primary === 'single' ? 1 : primary.startsWith('open') ? 2 : 3
    const load = r.load && typeof r.load.ohms === 'object' && Math.hypot(r.load.ohms.r, r.load.ohms.x) < 0.1 ? { ...r.load, ohms: 1 } : r.load
    const highLeg = secondary === 'high-leg' || secondary === 'open-high-leg'
    return {
      supply: { connection: primary.includes('wye') || r.supplyWye ? 'wye' : 'delta', lineVolts: r.lineVolts, rotation: r.rotation, sourceOhms: r.source },
      units: r.units.slice(0, count).map((u) => (highLeg ? { ...u, secondaryVolts: [120, 120] } : u)),
      primary,
      secondary,
      coils: coils[r.coilPick % coils.length]!,
      reversed: r.reversed.filter((id) => Number(id.slice(1)) <= count),
      openCorner: r.openCorner,
      fuseAmps: r.fuseAmps,
      breaker: r.breaker,
      load,
    } satisfies BankSpec
  })

/** A random bank plus a few random extra jumpers between any of its terminals. */
const docArb: fc.Arbitrary<CircuitInput> = fc.tuple(specArb, fc.array(fc.tuple(fc.nat(), fc.nat()), { maxLength: 3 })).map(([spec, extra]) => {
  const doc = buildBank(spec)
  const terminals = doc.components.flatMap((c) => terminalsOf(c).map((t) => `${c.id}.${t}`))
  const wires = [...doc.wires]
  for (const [a, b] of extra) {
    const from = terminals[a % terminals.length]!
    const to = terminals[b % terminals.length]!
    if (from !== to) wires.push([from, to])
  }
  return { ...doc, wires }
})

type C = { re: number; im: number }
const mul = (a: C, b: C): C => ({ re: a.re * b.re - a.im * b.im, im: a.re * b.im + a.im * b.re })
const conj = (a: C): C => ({ re: a.re, im: -a.im })
const sub = (a: C, b: C): C => ({ re: a.re - b.re, im: a.im - b.im })
const abs = (a: C) => Math.hypot(a.re, a.im)

/**
 * Kirchhoff's current law and the power balance, from the element laws and the solved voltages.
 * Each node's residual is taken relative to the size of the terms it sums (Σ |y|·(|Va| + |Vb|)
 * over the node's elements): the usual relative backward error, which floating point keeps
 * near 1e-16 whatever the currents, while a wrong or missing stamp gives a residual near 1.
 * The power balance is relative to the sum of the magnitudes of every element's power.
 */
function kclAndPower(detail: SolveDetail) {
  const { topo, final: sol, open } = detail
  const V = (n: number): C => (n < 0 ? { re: 0, im: 0 } : { re: sol.vRe[n]!, im: sol.vIm[n]! })
  const residual: C[] = Array.from({ length: topo.nodeCount }, () => ({ re: 0, im: 0 }))
  const size = new Float64Array(topo.nodeCount)
  const leave = (node: number, i: C, magnitude: number) => {
    if (node < 0) return
    residual[node]!.re += i.re
    residual[node]!.im += i.im
    size[node]! += magnitude
  }
  let sourcePower: C = { re: 0, im: 0 }
  let consumed: C = { re: 0, im: 0 }
  let powerSize = 0
  const add = (acc: C, x: C) => ({ re: acc.re + x.re, im: acc.im + x.im })
  const twoTerminal = (a: number, b: number, y: C) => {
    const dv = sub(V(a), V(b))
    const i = mul(y, dv)
    const magnitude = abs(y) * (abs(V(a)) + abs(V(b)))
    leave(a, i, magnitude)
    leave(b, { re: -i.re, im: -i.im }, magnitude)
    const s = mul(dv, conj(i))
    consumed = add(consumed, s)
    powerSize += abs(s)
  }
  for (let n = 0; n < topo.nodeCount; n++) twoTerminal(n, -1, { re: LEAK_SIEMENS, im: 0 })
  topo.poles.forEach((p) => {
    if (!open.has(p.device)) twoTerminal(p.a, p.b, { re: 1 / CLOSED_CONTACT_OHMS, im: 0 })
  })
  for (const l of topo.loads) twoTerminal(l.a, l.b, { re: l.y.re, im: l.y.im })
  for (const m of topo.meters) twoTerminal(m.a, m.b, { re: 1 / VOLTMETER_OHMS, im: 0 })
  topo.units.forEach((u, ui) => {
    const e = { re: sol.units[ui]!.eRe, im: sol.units[ui]!.eIm }
    u.windings.forEach((w, k) => {
      const i = sol.units[ui]!.current[k]!
      const magnitude = Math.hypot(w.yRe, w.yIm) * (abs(V(w.a)) + abs(V(w.b)) + w.turns * abs(e))
      leave(w.a, i, magnitude)
      leave(w.b, { re: -i.re, im: -i.im }, magnitude)
      const s = mul(sub(V(w.a), V(w.b)), conj(i))
      consumed = add(consumed, s)
      powerSize += abs(s)
    })
  })
  topo.phases.forEach((ph, k) => {
    const i = sol.phaseCurrent[k]!
    leave(ph.line, { re: -i.re, im: -i.im }, abs(i))
    leave(ph.star, i, abs(i))
    const s = mul({ re: ph.emf.re, im: ph.emf.im }, conj(i))
    sourcePower = add(sourcePower, s)
    const loss = mul({ re: ph.z.re, im: ph.z.im }, { re: abs(i) ** 2, im: 0 })
    consumed = add(consumed, loss)
    powerSize += abs(s) + abs(loss)
  })
  // A node whose own terms are tiny (a dead part of the bank) is measured against a floor of
  // 1e-6 × (largest admittance × largest voltage), the scale of the equations: its rounding
  // comes from the live part. The same floor, times the largest voltage, for the power.
  const maxV = Math.max(1, ...Array.from({ length: topo.nodeCount }, (_, n) => abs(V(n))))
  const maxY = Math.max(1 / CLOSED_CONTACT_OHMS, ...topo.loads.map((l) => l.y.abs()), ...topo.units.flatMap((u) => u.windings.map((w) => Math.hypot(w.yRe, w.yIm))))
  const floor = 1e-6 * maxY * maxV
  const kclRelative = Math.max(0, ...residual.map((r, n) => abs(r) / Math.max(size[n]!, floor)))
  return { kclRelative, powerRelative: abs(sub(sourcePower, consumed)) / Math.max(powerSize, floor * maxV) }
}

describe('properties of random valid banks', () => {
  it('never throw, and give finite readings', () => {
    fc.assert(
      fc.property(docArb, (doc) => {
        const { result } = solveDetailed(doc)
        for (const r of [...Object.values(result.meters), ...Object.values(result.terminals), ...Object.values(result.windings)]) {
          expect(Number.isFinite(r.volts) && Number.isFinite(r.degrees)).toBe(true)
        }
        for (const e of result.events) expect(Number.isFinite(e.seconds) && e.seconds >= 0).toBe(true)
      }),
      { numRuns: 300 },
    )
  })

  it("satisfy Kirchhoff's current law at every node (relative residual < 1e-9)", () => {
    fc.assert(
      fc.property(docArb, (doc) => {
        expect(kclAndPower(solveDetailed(doc)).kclRelative).toBeLessThan(1e-9)
      }),
      { numRuns: 200 },
    )
  })

  it('balance complex power: what the sources deliver is what loads, windings and contacts take', () => {
    fc.assert(
      fc.property(docArb, (doc) => {
        // 1e-7: a bolted short across a near-ideal source (hundreds of kA through milliohms)
        // leaves about 1e-8 of rounding in the sum; any missing element shows far above that
        expect(kclAndPower(solveDetailed(doc)).powerRelative).toBeLessThan(1e-7)
      }),
      { numRuns: 200 },
    )
  })

  it('scale every voltage linearly with the supply voltage while no device operates', () => {
    fc.assert(
      fc.property(specArb, fc.double({ min: 0.25, max: 3, noNaN: true }), (spec, k) => {
        const low = { ...spec, fuseAmps: undefined, breaker: undefined }
        const a = solveDetailed(buildBank(low)).result
        const b = solveDetailed(buildBank({ ...low, supply: { ...low.supply, lineVolts: low.supply.lineVolts * k } })).result
        fc.pre(a.events.length === 0 && b.events.length === 0)
        // meter readings (differences) scale to 1e-6; a terminal's voltage to ground on an
        // ungrounded system is set only by the 1 GΩ leaks, which floating point resolves to
        // about 1e-4 of the line voltage
        for (const [name, r] of Object.entries(a.meters)) {
          expect(Math.abs(b.meters[name]!.volts - k * r.volts)).toBeLessThanOrEqual(1e-6 * k * r.volts + 1e-3)
        }
        for (const [name, r] of Object.entries(a.terminals)) {
          expect(Math.abs(b.terminals[name]!.volts - k * r.volts)).toBeLessThanOrEqual(1e-4 * k * low.supply.lineVolts)
        }
      }),
      { numRuns: 100 },
    )
  })
})

// Mutations that make a document invalid: a wrong type at a random place, an unknown kind,
// a missing field, a wire to a terminal that does not exist.
const junk = fc.oneof(fc.string(), fc.integer(), fc.constant(null), fc.constant(-1), fc.array(fc.nat(), { maxLength: 2 }), fc.object({ maxDepth: 1 }))
const invalidArb = fc
  .tuple(docArb, fc.nat(), fc.constantFrom('field', 'kind', 'drop', 'wire', 'root'), junk)
  .map(([doc, pick, how, value]) => {
    const copy = JSON.parse(JSON.stringify(doc)) as { components: Record<string, unknown>[]; wires: unknown[]; [k: string]: unknown }
    const c = copy.components[pick % copy.components.length]!
    const fields = Object.keys(c).filter((k) => k !== 'id' && k !== 'kind')
    if (how === 'kind') c.kind = `not-${String(c.kind)}`
    else if (how === 'drop') delete copy.components
    else if (how === 'wire') copy.wires.push([`${String(c.id)}.ZZ`, `${String(c.id)}.ZZ9`])
    else if (how === 'root') copy.format = value
    else if (fields.length > 0) c[fields[pick % fields.length]!] = typeof value === 'number' && value > 0 ? -value : value === null ? 'x' : value
    else c.kind = 42
    return copy
  })

describe('random invalid documents', () => {
  it('get structured errors naming a path, never an exception', () => {
    fc.assert(
      fc.property(invalidArb, (doc) => {
        const parsed = parseCircuit(doc)
        if (parsed.ok) return // a mutation can happen to stay valid (a number for a number)
        expect(parsed.errors.length).toBeGreaterThan(0)
        for (const e of parsed.errors) {
          expect(typeof e.path).toBe('string')
          expect(e.path.length).toBeGreaterThan(0)
          expect(e.message.length).toBeGreaterThan(3)
        }
        expect(() => solveDetailed(doc)).toThrow(CircuitValidationError)
      }),
      { numRuns: 300 },
    )
  })
})
