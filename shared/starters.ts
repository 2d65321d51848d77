/**
 * The Starters: banks of our own that ship with Phaseloom, each ready to open on the Bench
 * (`/bench?starter=SLUG`). Every one has a main breaker CB1 that starts open, so a starter
 * opens de-energized, and primary fuses F1–F3 sized by NEC 450.3(B), primary protection only.
 *
 * Slugs are stable: links, saved lessons and tests use them. Add new starters at the end and
 * never rename one.
 */
import { buildBank, type BankSpec, type UnitSpec } from './banks/build'
import { layoutBank } from './banks/layout'
import { parseCircuit } from './circuit/parse'
import type { Circuit } from './circuit/schema'
import { bankKva, fullLoadAmps, primaryOnlyProtection, STANDARD_AMPS, type BankConnection } from './engine/ratings'

/** The shape a starter card draws for each side of the bank. */
export type StarterShape = 'delta' | 'wye' | 'open-delta' | 'open-corner' | 'high-leg' | 'open-high-leg' | 'coils-series' | 'coils-parallel' | 'single'

export interface Starter {
  /** stable, kebab-case */
  slug: string
  title: string
  /** one line, in plain words for an apprentice */
  purpose: string
  tags?: string[]
  shape: { primary: StarterShape; secondary: StarterShape }
  /** a valid circuit document, defaults filled in, with a layout */
  document: Circuit
}

/** A 10 kVA unit, 480 V primary, two 120 V secondary coils (a 120/240 V secondary). */
const UNIT_480: UnitSpec = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
/** The same unit wound for 277 V, for the line-to-neutral primaries of a 480Y/277 V supply. */
const UNIT_277: UnitSpec = { kva: 10, primaryVolts: 277, secondaryVolts: [120, 120] }
const DELTA_480 = { connection: 'delta' as const, lineVolts: 480 }
const WYE_480 = { connection: 'wye' as const, lineVolts: 480 }

const PROTECTION_CONNECTION: Record<BankSpec['primary'], BankConnection> = {
  delta: 'delta',
  wye: 'wye',
  'open-delta': 'open-delta',
  'open-wye': 'open-wye',
  single: 'single-phase',
}

/** Primary fuses by NEC Table 450.3(B), primary protection only, from the bank's full-load current. */
export function primaryFuseAmps(spec: Pick<BankSpec, 'primary' | 'supply' | 'units'>): number {
  const units = Array.isArray(spec.units) ? spec.units : [spec.units]
  const connection = PROTECTION_CONNECTION[spec.primary]
  const kva = bankKva(connection, units.map((u) => u.kva))
  const amps = fullLoadAmps(kva, spec.supply.lineVolts, connection === 'single-phase' ? 1 : 3)
  const fuse = primaryOnlyProtection(amps).maxDeviceAmps
  if (fuse === null) throw new Error(`no standard fuse for ${amps.toFixed(1)} A`)
  return fuse
}

/**
 * The main breaker: the smallest NEC 240.6(A) standard rating of at least twice the fuses, so
 * that a fault in the bank opens a fuse and the main stays in (coordination, common practice):
 * a time-delay fuse takes tenths of a second at 15 × its rating, and the main's magnetic trip
 * (10 × its own rating) must sit above the fault current the fuse clears.
 */
export function mainBreakerAmps(fuseAmps: number): number {
  const amps = STANDARD_AMPS.find((a) => a >= 2 * fuseAmps)
  if (amps === undefined) throw new Error(`no standard breaker above ${fuseAmps} A`)
  return amps
}

/** A single-phase bank uses two lines: take line C out of the breaker and drop fuse F3. */
function twoLine(doc: ReturnType<typeof buildBank>): ReturnType<typeof buildBank> {
  const dropped = (t: string) => t.startsWith('F3.') || t === 'CB1.L3' || t === 'CB1.T3'
  return {
    ...doc,
    components: doc.components.filter((c) => c.id !== 'F3').map((c) => (c.id === 'CB1' && c.kind === 'breaker' ? { ...c, poles: 2 } : c)),
    wires: doc.wires.filter(([a, b]) => !dropped(a) && !dropped(b)),
  }
}

type StarterSpec = Omit<BankSpec, 'breaker' | 'fuseAmps' | 'name'>

function starter(slug: string, title: string, purpose: string, shape: Starter['shape'], spec: StarterSpec, tags?: string[]): Starter {
  const fuseAmps = primaryFuseAmps(spec)
  let doc = buildBank({ ...spec, name: title, fuseAmps, breaker: { amps: mainBreakerAmps(fuseAmps), closed: false } })
  if (spec.primary === 'single') doc = twoLine(doc)
  doc.layout = layoutBank(doc)
  const parsed = parseCircuit(doc)
  if (!parsed.ok) throw new Error(`starter ${slug} is not a valid circuit: ${parsed.errors.map((e) => `${e.path}: ${e.message}`).join('; ')}`)
  return { slug, title, purpose, ...(tags && { tags }), shape, document: parsed.circuit }
}

const STARTERS: readonly Starter[] = [
  starter(
    'closed-delta-240',
    'Closed delta, 480 V to 240 V',
    'Three units in delta on both sides, coils in series: the everyday 240 V three-phase bank.',
    { primary: 'delta', secondary: 'delta' },
    { supply: DELTA_480, units: UNIT_480, primary: 'delta', secondary: 'delta', coils: 'series' },
    ['delta–delta', '3 units', '240 V'],
  ),
  starter(
    'closing-check-practice',
    'Closing check practice',
    'The same delta with its last corner left open and a meter across the gap: read near 0 V before you close it.',
    { primary: 'delta', secondary: 'open-corner' },
    { supply: DELTA_480, units: UNIT_480, primary: 'delta', secondary: 'delta', coils: 'series', openCorner: true },
    ['closing check', 'delta–delta', '3 units'],
  ),
  starter(
    'open-delta-240',
    'Open delta, 480 V to 240 V',
    'Two units give three-phase 240 V, at 57.7 % of what a three-unit bank could carry.',
    { primary: 'open-delta', secondary: 'open-delta' },
    { supply: DELTA_480, units: UNIT_480, primary: 'open-delta', secondary: 'open-delta', coils: 'series' },
    ['open delta', '2 units', '240 V'],
  ),
  starter(
    'delta-wye-208y120',
    'Delta–wye, 480 V to 208Y/120 V',
    'Coils in parallel at 120 V, joined in a grounded wye: four-wire 208Y/120 V, shifted 30° from the line.',
    { primary: 'delta', secondary: 'wye' },
    // a 2.5 kVA heater on each phase (120² / 2500 = 5.76 Ω), about a quarter of the bank
    { supply: DELTA_480, units: UNIT_480, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: 5.76, connection: 'wye' } },
    ['delta–wye', '3 units', '208Y/120 V', 'loaded'],
  ),
  starter(
    'high-leg-delta-240-120',
    'High-leg delta, 240/120 V',
    'A 240 V delta with a centre tap on one unit for 120 V lighting; the high leg reads about 208 V to neutral.',
    { primary: 'delta', secondary: 'high-leg' },
    { supply: DELTA_480, units: UNIT_480, primary: 'delta', secondary: 'high-leg', coils: 'series' },
    ['high leg', '4-wire delta', '3 units', '240/120 V'],
  ),
  starter(
    'wye-delta-240',
    'Wye–delta, 480Y/277 V to 240 V',
    'Primaries from line to neutral on a four-wire supply, secondaries in delta for 240 V, shifted 30°.',
    { primary: 'wye', secondary: 'delta' },
    { supply: WYE_480, units: UNIT_277, primary: 'wye', secondary: 'delta', coils: 'series' },
    ['wye–delta', '3 units', '240 V'],
  ),
  starter(
    'single-unit-parallel-120',
    'One unit, coils in parallel, 120 V',
    'Both 120 V coils side by side, X1 to X3 and X2 to X4: 120 V with the full rating on two wires.',
    { primary: 'single', secondary: 'coils-parallel' },
    { supply: DELTA_480, units: UNIT_480, primary: 'single', secondary: 'single', coils: 'parallel' },
    ['single-phase', '1 unit', '120 V'],
  ),
  starter(
    'single-unit-series-240-120',
    'One unit, coils in series, 120/240 V',
    'X2 tied to X3 puts the coils in series: 240 V end to end and 120 V from each end to the centre tap.',
    { primary: 'single', secondary: 'coils-series' },
    { supply: DELTA_480, units: UNIT_480, primary: 'single', secondary: 'single', coils: 'series' },
    ['single-phase', '1 unit', '120/240 V'],
  ),
  starter(
    'open-high-leg-delta-240-120',
    'Open high-leg delta, 240/120 V',
    'Two units, one of them centre-tapped: three-phase 240 V and 120 V lighting, with the high leg at about 208 V.',
    { primary: 'open-delta', secondary: 'open-high-leg' },
    { supply: DELTA_480, units: UNIT_480, primary: 'open-delta', secondary: 'open-high-leg', coils: 'series' },
    ['high leg', 'open delta', '2 units', '240/120 V'],
  ),
  starter(
    'floating-wye-delta-closing-check',
    'Floating wye–delta, 480 V three-wire to 240 V, corner open',
    '277 V primaries in a wye whose star point goes nowhere, on a supply with no neutral: take the closing check before the delta is closed.',
    { primary: 'wye', secondary: 'open-corner' },
    // the star point is held only by the three cores' exciting current (circuit-format.md 1.1)
    { supply: DELTA_480, units: UNIT_277, primary: 'wye', secondary: 'delta', coils: 'series', openCorner: true },
    ['wye–delta', 'floating wye', 'closing check', '3 units'],
  ),
]

/** Every starter, in gallery order. Treat as read-only; use `starterBySlug` for a copy to edit. */
export const starters: readonly Starter[] = STARTERS

export const starterSlugs: readonly string[] = STARTERS.map((s) => s.slug)

/** A deep copy of the starter, safe to edit on the Bench; undefined for an unknown slug. */
export function starterBySlug(slug: string): Starter | undefined {
  const found = STARTERS.find((s) => s.slug === slug)
  return found ? structuredClone(found) : undefined
}
