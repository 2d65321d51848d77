/**
 * The hidden faults of a fault hunt, and how they change a bank.
 *
 * A fault never lives in the circuit document the student sees: the server keeps it apart and
 * builds, for every reading, a second document with the fault applied. Terminals keep the
 * names printed on the bushings; what changes is what is behind them:
 * - a marking fault swaps which winding end a bushing label leads to (X1 ↔ X4, X2 ↔ X3 on a
 *   two-coil secondary; X1 ↔ X2 on a single coil; H1 ↔ H2),
 * - a broken coil is an open point at one end of the coil (modelled as a blown fuse of our
 *   own between the bushing and the winding),
 * - a wrong tap scales every secondary coil's voltage, an off-nameplate coil sets one,
 * - relabelled supply phases swap two of the supply's terminal labels.
 */
import { z } from 'zod'
import type { Circuit, Transformer } from '../circuit/schema'

export const FAULT_KINDS = ['secondary-reversed', 'primary-reversed', 'open-coil', 'wrong-tap', 'coil-volts', 'phases-relabelled'] as const
export type FaultKind = (typeof FAULT_KINDS)[number]

/** What the interface calls each fault (our own words). */
export const FAULT_LABELS: Record<FaultKind, string> = {
  'secondary-reversed': 'Secondary leads marked backwards',
  'primary-reversed': 'Primary leads marked backwards',
  'open-coil': 'Broken coil',
  'wrong-tap': 'Wrong tap (ratio off)',
  'coil-volts': 'Coil wound off its nameplate',
  'phases-relabelled': 'Supply phases relabelled',
}

/**
 * What a student may name in a diagnosis. A primary and a secondary marking fault read the
 * same at every terminal of the bank, so both are "polarity reversed".
 */
export const DIAGNOSES = ['polarity-reversed', 'coil-open', 'ratio-wrong', 'coils-unequal', 'supply-phasing'] as const
export type Diagnosis = (typeof DIAGNOSES)[number]
export const DIAGNOSIS_LABELS: Record<Diagnosis, string> = {
  'polarity-reversed': 'A unit connected with its polarity reversed',
  'coil-open': 'A coil is open (no continuity)',
  'ratio-wrong': 'A unit has the wrong ratio (tap)',
  'coils-unequal': "A unit's two coils give different voltages",
  'supply-phasing': 'The supply lines are labelled wrong',
}
export const DIAGNOSIS_OF: Record<FaultKind, Diagnosis> = {
  'secondary-reversed': 'polarity-reversed',
  'primary-reversed': 'polarity-reversed',
  'open-coil': 'coil-open',
  'wrong-tap': 'ratio-wrong',
  'coil-volts': 'coils-unequal',
  'phases-relabelled': 'supply-phasing',
}

const component = z.string({ error: 'name the unit (its id)' }).min(1, { error: 'name the unit (its id)' }).max(32, { error: 'component id is too long' })
const PHASE = z.enum(['A', 'B', 'C'], { error: 'a supply phase is A, B or C' })

export const FaultSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('secondary-reversed'), component }),
  z.object({ kind: z.literal('primary-reversed'), component }),
  z.object({ kind: z.literal('open-coil'), component, coil: z.enum(['H1-H2', 'X1-X2', 'X3-X4'], { error: 'coil is H1-H2, X1-X2 or X3-X4' }) }),
  z.object({
    kind: z.literal('wrong-tap'),
    component,
    percent: z.number({ error: 'percent must be a number' }).gte(-20, { error: 'a tap is at most 20 % off' }).lte(20, { error: 'a tap is at most 20 % off' })
      .refine(p => Math.abs(p) >= 0.5, { error: 'a tap fault of under 0.5 % cannot be told from a normal unit' }),
  }),
  z.object({
    kind: z.literal('coil-volts'),
    component,
    volts: z.array(z.number({ error: 'coil volts must be numbers' }).gt(0, { error: 'coil volts must be above 0' }).lte(100_000, { error: 'coil volts are too high' }), { error: 'volts is a list of coil voltages' })
      .min(1, { error: 'give each coil its voltage' }).max(2, { error: 'a unit has at most two coils' }),
  }),
  z.object({ kind: z.literal('phases-relabelled'), component, swap: z.tuple([PHASE, PHASE], { error: 'swap names two supply phases, e.g. ["B", "C"]' }).refine(([a, b]) => a !== b, { error: 'swap two different phases' }) }),
], { error: issue => (issue.code === 'invalid_union' ? `kind must be one of ${FAULT_KINDS.join(', ')}` : undefined) })
export type Fault = z.infer<typeof FaultSchema>

export const FaultListSchema = z.array(FaultSchema).max(6, { error: 'at most six faults in one hunt' })

/** Checks each fault against the bank it hides in: errors as { path, message }, path from `faults`. */
export function faultErrors(circuit: Circuit, faults: Fault[], prefix = 'faults'): { path: string, message: string }[] {
  const errors: { path: string, message: string }[] = []
  const seen = new Set<string>()
  faults.forEach((f, i) => {
    const path = `${prefix}[${i}]`
    const c = circuit.components.find(x => x.id === f.component)
    const wantSupply = f.kind === 'phases-relabelled'
    if (!c) {
      errors.push({ path: `${path}.component`, message: `the bank has no component "${f.component}"` })
      return
    }
    if (wantSupply ? c.kind !== 'supply' : c.kind !== 'transformer') {
      errors.push({ path: `${path}.component`, message: wantSupply ? `"${f.component}" is not a supply` : `"${f.component}" is not a transformer unit` })
      return
    }
    if (c.kind === 'transformer') {
      const coils = c.secondaryVolts.length
      if (f.kind === 'open-coil' && f.coil === 'X3-X4' && coils < 2) errors.push({ path: `${path}.coil`, message: `${c.id} has one secondary coil (X1-X2)` })
      if (f.kind === 'coil-volts' && f.volts.length !== coils) errors.push({ path: `${path}.volts`, message: `${c.id} has ${coils} secondary coil${coils === 1 ? '' : 's'}: give ${coils} voltage${coils === 1 ? '' : 's'}` })
    }
    const key = `${f.component}:${f.kind === 'primary-reversed' || f.kind === 'secondary-reversed' ? f.kind : DIAGNOSIS_OF[f.kind]}`
    if (seen.has(key)) errors.push({ path, message: `${f.component} already has this kind of fault` })
    seen.add(key)
  })
  return errors
}

/** The bank with its faults applied, and where each printed terminal really leads. */
export interface FaultedBank {
  document: Record<string, unknown>
  /** the terminal of `document` behind a terminal label the student sees */
  terminalOf(label: string): string
}

function swapPairs(unit: Transformer, side: 'primary' | 'secondary'): [string, string][] {
  if (side === 'primary') return [['H1', 'H2']]
  return unit.secondaryVolts.length === 2 ? [['X1', 'X4'], ['X2', 'X3']] : [['X1', 'X2']]
}

/**
 * Applies `faults` to a validated bank (`circuit`, defaults filled in). The result is a plain
 * circuit document for the engine; it names the terminals the student wired exactly as the
 * student did, so readings map back through `terminalOf`.
 */
export function applyFaults(circuit: Circuit, faults: Fault[]): FaultedBank {
  const components = circuit.components.map(c => ({ ...c })) as Record<string, unknown>[]
  const byId = new Map(components.map(c => [c.id as string, c]))
  const relabel = new Map<string, string>()
  const breakAt = new Map<string, string>()
  const extraWires: [string, string][] = []
  const usedIds = new Set(byId.keys())
  let hidden = 0
  const hiddenId = () => {
    let id: string
    do id = `open${++hidden}`; while (usedIds.has(id))
    usedIds.add(id)
    return id
  }
  const swap = (id: string, a: string, b: string) => {
    const ta = `${id}.${a}`
    const tb = `${id}.${b}`
    const ra = relabel.get(ta) ?? ta
    const rb = relabel.get(tb) ?? tb
    relabel.set(ta, rb)
    relabel.set(tb, ra)
  }

  for (const f of faults) {
    const c = byId.get(f.component)
    if (!c) continue
    switch (f.kind) {
      case 'secondary-reversed':
      case 'primary-reversed':
        for (const [a, b] of swapPairs(c as unknown as Transformer, f.kind === 'primary-reversed' ? 'primary' : 'secondary')) swap(f.component, a, b)
        break
      case 'phases-relabelled':
        swap(f.component, f.swap[0], f.swap[1])
        break
      case 'wrong-tap':
        c.secondaryVolts = (c.secondaryVolts as number[]).map(v => v * (1 + f.percent / 100))
        break
      case 'coil-volts':
        c.secondaryVolts = [...f.volts]
        break
      case 'open-coil': {
        // the break sits at the coil's first end: the bushing wires land on a dead stub
        const end = f.coil === 'H1-H2' ? 'H1' : f.coil === 'X1-X2' ? 'X1' : 'X4'
        const winding = `${f.component}.${end}`
        if (breakAt.has(winding)) break
        const id = hiddenId()
        components.push({ id, kind: 'fuse', amps: 1, blown: true })
        breakAt.set(winding, `${id}.a`)
        extraWires.push([`${id}.b`, winding])
        break
      }
    }
  }

  const terminalOf = (label: string) => {
    const winding = relabel.get(label) ?? label
    return breakAt.get(winding) ?? winding
  }
  const wires = [...circuit.wires.map(([a, b]) => [terminalOf(a), terminalOf(b)] as [string, string]), ...extraWires]
  return {
    document: { format: circuit.format, version: circuit.version, name: circuit.name, components, wires },
    terminalOf,
  }
}
