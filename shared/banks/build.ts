/**
 * Builds the circuit document of a standard bank: a supply, optional main breaker and
 * primary fuses, one to three units, the secondary as asked, an output block, meters on
 * every line pair and loads. Used by the starters, the site check and the tests.
 */
import type { CircuitInput, ComponentInput, Impedance } from '../circuit/schema'
import { CIRCUIT_FORMAT, CIRCUIT_VERSION } from '../circuit/schema'

export type PrimaryConnection = 'delta' | 'wye' | 'open-delta' | 'open-wye' | 'single'
export type SecondaryConnection = 'delta' | 'wye' | 'open-delta' | 'high-leg' | 'open-high-leg' | 'single'

export interface UnitSpec {
  kva: number
  primaryVolts: number
  secondaryVolts: number[]
  impedancePercent?: number
  xOverR?: number
  compensationPercent?: number
  excitingPercent?: number
  coreLossPercent?: number
  tapPercent?: number
  polarity?: 'subtractive' | 'additive'
}

export interface BankSpec {
  name?: string
  supply: { connection: 'wye' | 'delta'; lineVolts: number; hz?: number; rotation?: 'ABC' | 'ACB'; sourceOhms?: Impedance }
  /** one unit for single, two for open connections, three otherwise; a single spec is repeated */
  units: UnitSpec | UnitSpec[]
  primary: PrimaryConnection
  secondary: SecondaryConnection
  coils: 'series' | 'parallel' | 'single'
  /** where a 30° shift exists: IEEE C57.12.00's low side lagging (default), or leading */
  shift?: 'lag' | 'lead'
  /** units whose secondary leads are swapped (a reversed unit) */
  reversed?: string[]
  /** leave the last corner of a delta secondary open, with voltmeter MC across it */
  openCorner?: boolean
  /** primary fuses F1–F3 in the lines feeding the bank */
  fuseAmps?: number
  /** a main breaker CB1 between the supply and the fuses */
  breaker?: { amps: number; closed: boolean }
  /** a load on each output phase, wye (to n) or delta (line to line) */
  load?: { ohms: number | Impedance; connection: 'wye' | 'delta' }
  /** single-phase loads on the lighting side of a high-leg bank: a–n and c–n */
  lightingOhms?: number
}

const unitCount = (primary: PrimaryConnection) => (primary === 'single' ? 1 : primary.startsWith('open') ? 2 : 3)

export function buildBank(spec: BankSpec): CircuitInput {
  const count = unitCount(spec.primary)
  const specs = Array.isArray(spec.units) ? spec.units : Array.from({ length: count }, () => spec.units as UnitSpec)
  if (specs.length !== count) throw new Error(`a ${spec.primary} primary takes ${count} unit(s), got ${specs.length}`)
  const components: ComponentInput[] = []
  const wires: [string, string][] = []
  const wire = (a: string, b: string) => wires.push([a, b])

  components.push({ id: 'S1', kind: 'supply', ...spec.supply })
  // the point each supply line reaches after the breaker and fuses
  const line: Record<'A' | 'B' | 'C', string> = { A: 'S1.A', B: 'S1.B', C: 'S1.C' }
  if (spec.breaker) {
    components.push({ id: 'CB1', kind: 'breaker', poles: 3, amps: spec.breaker.amps, closed: spec.breaker.closed })
    ;(['A', 'B', 'C'] as const).forEach((p, i) => {
      wire(line[p], `CB1.L${i + 1}`)
      line[p] = `CB1.T${i + 1}`
    })
  }
  if (spec.fuseAmps) {
    ;(['A', 'B', 'C'] as const).forEach((p, i) => {
      components.push({ id: `F${i + 1}`, kind: 'fuse', amps: spec.fuseAmps! })
      wire(line[p], `F${i + 1}.a`)
      line[p] = `F${i + 1}.b`
    })
  }

  const ids = specs.map((_, i) => `T${i + 1}`)
  specs.forEach((u, i) => components.push({ id: ids[i]!, kind: 'transformer', ...u }))

  // primaries: which supply points each unit's H1 and H2 go to
  const neutral = spec.supply.connection === 'wye' ? 'S1.N' : undefined
  const primaries: [string, string | undefined][] = {
    delta: [[line.A, line.B], [line.B, line.C], [line.C, line.A]],
    wye: [[line.A, neutral], [line.B, neutral], [line.C, neutral]],
    'open-delta': spec.secondary === 'open-high-leg' ? [[line.C, line.A], [line.A, line.B]] : [[line.A, line.B], [line.B, line.C]],
    'open-wye': [[line.A, neutral], [line.B, neutral]],
    single: [[line.A, line.B]],
  }[spec.primary] as [string, string | undefined][]
  ids.forEach((id, i) => {
    const [h1, h2] = primaries[i]!
    wire(h1, `${id}.H1`)
    if (h2) wire(h2, `${id}.H2`)
  })
  // a wye primary on a delta supply: the star point floats (an ungrounded wye)
  if ((spec.primary === 'wye' || spec.primary === 'open-wye') && !neutral) ids.slice(1).forEach((id) => wire(`${ids[0]}.H2`, `${id}.H2`))

  // each unit's secondary as one pair of ends: p (in phase with H1) and q
  const ends = ids.map((id) => {
    const two = specs[ids.indexOf(id)]!.secondaryVolts.length === 2
    if (spec.coils === 'series' && two) {
      wire(`${id}.X2`, `${id}.X3`)
      return { p: `${id}.X1`, q: `${id}.X4`, tap: `${id}.X2` }
    }
    if (spec.coils === 'parallel' && two) {
      wire(`${id}.X1`, `${id}.X3`)
      wire(`${id}.X2`, `${id}.X4`)
    }
    return { p: `${id}.X1`, q: `${id}.X2`, tap: undefined as string | undefined }
  })
  ids.forEach((id, i) => {
    if (spec.reversed?.includes(id)) ends[i] = { ...ends[i]!, p: ends[i]!.q, q: ends[i]!.p }
  })

  components.push({ id: 'OUT', kind: 'output' })
  const out = { a: 'OUT.a', b: 'OUT.b', c: 'OUT.c', n: 'OUT.n' }
  let hasNeutral = false
  let closing: [string, string] | undefined
  const lead = spec.shift === 'lead'
  const [e1, e2, e3] = ends
  switch (spec.secondary) {
    case 'delta':
    case 'high-leg': {
      // Dd0 / Yd1 order: T1 a–b, T2 b–c, T3 c–a; Yd11: T1 a–c, T3 c–b, T2 b–a
      const order = spec.primary === 'wye' && lead ? [e1!, e3!, e2!] : [e1!, e2!, e3!]
      wire(order[0]!.q, order[1]!.p)
      wire(order[1]!.q, order[2]!.p)
      closing = [order[2]!.q, order[0]!.p]
      if (spec.primary === 'wye' && lead) {
        wire(out.a, e1!.p)
        wire(out.c, e3!.p)
        wire(out.b, e2!.p)
      } else {
        wire(out.a, e1!.p)
        wire(out.b, e2!.p)
        wire(out.c, e3!.p)
      }
      if (spec.secondary === 'high-leg') {
        // the lighting unit T3 sits across c–a, so b is the high leg (NEC 408.3(E))
        const tap = e3!.tap
        if (!tap) throw new Error('a high-leg delta needs the lighting unit T3 with two coils in series')
        wire(tap, out.n)
        hasNeutral = true
      }
      break
    }
    case 'open-delta':
    case 'open-high-leg': {
      wire(e1!.q, e2!.p)
      if (spec.secondary === 'open-high-leg') {
        // T1 (lighting) across c–a, T2 across a–b: b is the high leg
        wire(out.c, e1!.p)
        wire(out.a, e1!.q)
        wire(out.b, e2!.q)
        if (!e1!.tap) throw new Error('an open high-leg delta needs the lighting unit T1 with two coils in series')
        wire(e1!.tap, out.n)
        hasNeutral = true
      } else {
        wire(out.a, e1!.p)
        wire(out.b, e1!.q)
        wire(out.c, e2!.q)
      }
      break
    }
    case 'wye': {
      if (spec.primary === 'delta' && !lead) {
        // Dyn1 (IEEE C57.12.00: low side lags 30°): a on T3 reversed, b on T1, c on T2
        for (const e of [e1!, e2!, e3!]) wire(e.p, out.n)
        wire(out.a, e3!.q)
        wire(out.b, e1!.q)
        wire(out.c, e2!.q)
      } else {
        for (const e of [e1!, e2!, e3!]) wire(e.q, out.n)
        wire(out.a, e1!.p)
        wire(out.b, e2!.p)
        wire(out.c, e3!.p)
      }
      hasNeutral = true
      break
    }
    case 'single': {
      wire(out.a, e1!.p)
      wire(out.b, e1!.q)
      if (e1!.tap) {
        wire(out.n, e1!.tap)
        hasNeutral = true
      }
      break
    }
  }
  if (closing) {
    if (spec.openCorner) {
      components.push({ id: 'MC', kind: 'voltmeter' })
      wire('MC.a', closing[0])
      wire('MC.b', closing[1])
    } else wire(closing[0], closing[1])
  }
  if (hasNeutral) {
    components.push({ id: 'G1', kind: 'ground' })
    wire(out.n, 'G1.g')
  }

  const threePhase = spec.secondary !== 'single'
  const pairs: [string, string, string][] = threePhase
    ? [['Mab', 'a', 'b'], ['Mbc', 'b', 'c'], ['Mca', 'c', 'a']]
    : [['Mab', 'a', 'b']]
  if (hasNeutral) {
    for (const p of threePhase ? ['a', 'b', 'c'] : ['a', 'b']) pairs.push([`M${p}n`, p, 'n'])
  }
  for (const [id, a, b] of pairs) {
    components.push({ id, kind: 'voltmeter' })
    wire(`${id}.a`, `OUT.${a}`)
    wire(`${id}.b`, `OUT.${b}`)
  }
  if (spec.load) {
    const phases = threePhase ? ['a', 'b', 'c'] : ['a']
    const wye = spec.load.connection === 'wye' && threePhase
    phases.forEach((p, i) => {
      const id = `L${p}`
      components.push({ id, kind: 'load', ohms: spec.load!.ohms })
      wire(`${id}.a`, `OUT.${p}`)
      if (wye && hasNeutral) wire(`${id}.b`, 'OUT.n')
      else if (wye) {
        // a wye load with no neutral to go to: its star point floats
        if (i > 0) wire(`${id}.b`, 'La.b')
      } else wire(`${id}.b`, `OUT.${threePhase ? phases[(i + 1) % 3]! : 'b'}`)
    })
  }
  if (spec.lightingOhms && hasNeutral) {
    for (const p of ['a', 'c']) {
      components.push({ id: `LL${p}`, kind: 'load', ohms: spec.lightingOhms })
      wire(`LL${p}.a`, `OUT.${p}`)
      wire(`LL${p}.b`, 'OUT.n')
    }
  }

  return {
    format: CIRCUIT_FORMAT,
    version: CIRCUIT_VERSION,
    name: spec.name ?? `${spec.primary}–${spec.secondary} bank`,
    components,
    wires,
  }
}
