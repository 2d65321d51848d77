/**
 * The circuit document, version 1 (see circuit-format.md in the shared folder):
 * the one JSON form the Bench saves, the database stores, the engine solves and the
 * API accepts. Defaults here are the ones the format states.
 */
import { z } from 'zod'

export const CIRCUIT_FORMAT = 'phaseloom.circuit'
export const CIRCUIT_VERSION = 1

/** Hard limits that keep one solve bounded; far above any real bank. */
export const LIMITS = { components: 5000, wires: 20000, idLength: 32, nameLength: 200 } as const

/** a letter, then up to 31 letters, digits, "-" or "_": length and characters in one pattern */
const ID_PATTERN = new RegExp(`^[A-Za-z][A-Za-z0-9_-]{0,${LIMITS.idLength - 1}}$`)

/*
 * The ranges of the numbers and the pattern of the id are checked by one zod check per
 * component (and per layout entry), from a table of each kind's rules, rather than by a check
 * on every field: a document holds hundreds of ids and numbers, and zod's cost grows with the
 * number of checks it runs (on the 30-unit network, the per-field checks took more than half
 * of the components' validation). The field schemas keep the types; the messages are the
 * same as one check per field would give, at the same paths, and the check runs even when
 * another field of the component has the wrong type, so every error is still reported.
 */

/** A rule for one number: a message when it is out of range. */
type Rule = (value: number) => string | undefined
/** A kind's rules: a field's rule, a rule for each element of a list field, or a nested object's rules. */
interface Rules {
  [field: string]: Rule | { each: Rule } | Rules
}

// zod 4's number() already refuses NaN and ±Infinity
function positive(field: string, max: number, unit = ''): Rule {
  const tooSmall = `${field} must be greater than 0`
  const tooBig = `${field} must be at most ${max}${unit}`
  return (v) => (v > 0 ? (v <= max ? undefined : tooBig) : tooSmall)
}

/** Greater than 0 (the message for 0 and below), at least `min` and at most `max`. */
function atLeast(field: string, min: number, max: number, unit: string): Rule {
  const tooSmall = `${field} must be greater than 0`
  const belowMin = `${field} must be at least ${min}${unit}`
  const tooBig = `${field} must be at most ${max}${unit}`
  return (v) => (v > 0 ? (v < min ? belowMin : v <= max ? undefined : tooBig) : tooSmall)
}

function bounded(field: string, min: number, max: number): Rule {
  const error = `${field} must be between ${min} and ${max}`
  return (v) => (v >= min && v <= max ? undefined : error)
}

function idError(value: string): string | undefined {
  if (ID_PATTERN.test(value)) return undefined
  if (value.length === 0) return 'id must not be empty'
  if (value.length > LIMITS.idLength) return `id must be at most ${LIMITS.idLength} characters`
  return 'id must start with a letter and hold only letters, digits, "-" or "_"'
}

type Issues = { path: (string | number)[]; message: string; input: unknown }[]

function applyRules(value: Record<string, unknown>, rules: Rules, path: (string | number)[], out: Issues) {
  for (const field in rules) {
    const rule = rules[field]!
    const v = value[field]
    if (typeof rule === 'function') {
      // what is not a finite number has its type error from the field's own schema
      const message = Number.isFinite(v) ? rule(v as number) : undefined
      if (message) out.push({ path: [...path, field], message, input: v })
    } else if ('each' in rule && typeof rule.each === 'function') {
      if (!Array.isArray(v)) continue
      for (let i = 0; i < v.length; i++) {
        const message = Number.isFinite(v[i]) ? (rule.each as Rule)(v[i]) : undefined
        if (message) out.push({ path: [...path, field, i], message, input: v[i] })
      }
    } else if (typeof v === 'object' && v !== null) applyRules(v as Record<string, unknown>, rule as Rules, [...path, field], out)
  }
}

/** One check for the id (where the schema has one) and every number of an object, by its rules. */
function ruled<T extends z.ZodObject>(schema: T, rules: Rules, more?: (value: Record<string, unknown>, out: Issues) => void): T {
  const hasId = 'id' in schema.shape
  return schema.superRefine(
    (value, ctx) => {
      if (typeof value !== 'object' || value === null) return // the type error is zod's own
      const v = value as Record<string, unknown>
      const out: Issues = []
      if (hasId && typeof v.id === 'string') {
        const message = idError(v.id)
        if (message) out.push({ path: ['id'], message, input: v.id })
      }
      applyRules(v, rules, [], out)
      more?.(v, out)
      for (const issue of out) ctx.addIssue({ code: 'custom', ...issue })
    },
    // also when another field has the wrong type: its rules skip what is not a number
    { when: () => true },
  ) as T
}

export const FUSE_CURVES = ['time-delay', 'fast-acting'] as const
export type FuseCurve = (typeof FUSE_CURVES)[number]
/** IEEE C57.12.00 bushing layouts: X1 beside H1 (subtractive) or diagonally across (additive). */
export const POLARITIES = ['subtractive', 'additive'] as const

const num = (field: string) => z.number({ error: `${field} must be a number` })
const id = z.string({ error: 'id must be a string' })

const IMPEDANCE_RULES: Rules = { r: bounded('r (ohms)', 0, 1e9), x: bounded('x (ohms)', -1e9, 1e9) }
const ImpedanceShape = z.object({ r: num('r (ohms)'), x: num('x (ohms)') })
export const ImpedanceSchema = ruled(ImpedanceShape, IMPEDANCE_RULES)

export const SupplySchema = ruled(
  z.object({
    id,
    kind: z.literal('supply'),
    connection: z.enum(['wye', 'delta'], { error: 'connection must be "wye" or "delta"' }),
    lineVolts: num('lineVolts'),
    hz: num('hz').default(() => 60),
    rotation: z.enum(['ABC', 'ACB'], { error: 'rotation must be "ABC" or "ACB"' }).default(() => 'ABC' as const),
    sourceOhms: z.object({ r: num('sourceOhms.r'), x: num('sourceOhms.x') }).default(() => ({ r: 0.02, x: 0.05 })),
  }),
  {
    lineVolts: atLeast('lineVolts', 1, 1_000_000, ' V'),
    // a supply of under 1 Hz is no power system, and keeps a denormal out of every reactance
    hz: atLeast('hz', 1, 1000, ' Hz'),
    sourceOhms: { r: bounded('sourceOhms.r', 0, 1e6), x: bounded('sourceOhms.x', 0, 1e6) },
  },
)

export const BreakerSchema = ruled(
  z.object({
    id,
    kind: z.literal('breaker'),
    poles: z.literal([1, 2, 3], { error: 'poles must be 1, 2 or 3' }).default(() => 3 as const),
    amps: num('amps'),
    closed: z.boolean({ error: 'closed must be true or false' }).default(() => false),
    // (1.1) false: a disconnect or tie switch that never operates on its own
    trips: z.boolean({ error: 'trips must be true or false' }).default(() => true),
  }),
  { amps: atLeast('amps', 0.01, 100_000, ' A') },
)

export const FuseSchema = ruled(
  z.object({
    id,
    kind: z.literal('fuse'),
    amps: num('amps'),
    blown: z.boolean({ error: 'blown must be true or false' }).default(() => false),
    // (1.1) the fuse's time-current class (shared/engine/protection.ts)
    curve: z.enum(FUSE_CURVES, { error: 'curve must be "time-delay" or "fast-acting"' }).default(() => 'time-delay' as const),
  }),
  // the smallest fuses made are 1/32 A; a smaller rating would put an overflow in the study
  { amps: atLeast('amps', 0.01, 100_000, ' A') },
)

export const TransformerSchema = ruled(
  z.object({
    id,
    kind: z.literal('transformer'),
    kva: num('kva'),
    primaryVolts: num('primaryVolts'),
    secondaryVolts: z
      .array(num('secondaryVolts'), { error: 'secondaryVolts must be a list of one or two coil voltages' })
      .min(1, { error: 'secondaryVolts needs one or two coil voltages' })
      .max(2, { error: 'secondaryVolts holds at most two coil voltages' }),
    impedancePercent: num('impedancePercent').default(() => 3),
    xOverR: num('xOverR').default(() => 1.5),
    compensationPercent: num('compensationPercent').default(() => 0),
    // (1.1) the exciting branch, the primary tap and the bushing layout
    excitingPercent: num('excitingPercent').default(() => 1),
    coreLossPercent: num('coreLossPercent').default(() => 0.2),
    tapPercent: num('tapPercent').default(() => 0),
    polarity: z.enum(POLARITIES, { error: 'polarity must be "subtractive" or "additive"' }).default(() => 'subtractive' as const),
  }),
  {
    // 1 VA is below the smallest control transformer; smaller would overflow the admittances
    kva: atLeast('kva', 0.001, 100_000, ' kVA'),
    primaryVolts: positive('primaryVolts', 1_000_000, ' V'),
    secondaryVolts: { each: positive('secondaryVolts', 1_000_000, ' V') },
    impedancePercent: bounded('impedancePercent', 0.01, 50),
    xOverR: bounded('xOverR', 0, 100),
    compensationPercent: bounded('compensationPercent', -20, 20),
    // 0.01 % is all but an ideal core; 0 would leave a floating star point to the leaks alone
    excitingPercent: bounded('excitingPercent', 0.01, 50),
    coreLossPercent: bounded('coreLossPercent', 0, 50),
    tapPercent: bounded('tapPercent', -20, 20),
  },
  (v, out) => {
    const exc = v.excitingPercent
    const loss = v.coreLossPercent
    if (typeof exc === 'number' && typeof loss === 'number' && Number.isFinite(exc) && loss > exc) {
      out.push({ path: ['coreLossPercent'], message: `coreLossPercent must not exceed excitingPercent (${exc}): the core loss is part of the exciting current`, input: loss })
    }
  },
)

/** Below this a load is a short: draw a jumper instead (it keeps the equations well conditioned). */
export const MIN_LOAD_OHMS = 1e-4

const OHMS_POSITIVE = positive('ohms', 1e9, ' Ω')
const OHMS_MINIMUM = `ohms must be at least ${MIN_LOAD_OHMS} Ω; for a bolted short use a jumper`

export const LoadSchema = ruled(
  z.object({
    id,
    kind: z.literal('load'),
    ohms: z.union([num('ohms'), ImpedanceShape], { error: 'ohms must be a positive number or { "r": .., "x": .. }' }),
  }),
  {},
  (v, out) => {
    const o = v.ohms
    if (typeof o === 'number') {
      const message = OHMS_POSITIVE(o)
      if (message) out.push({ path: ['ohms'], message, input: o })
      if (o < MIN_LOAD_OHMS) out.push({ path: ['ohms'], message: OHMS_MINIMUM, input: o })
    } else if (typeof o === 'object' && o !== null) {
      const imp = o as { r: unknown; x: unknown }
      applyRules(imp as Record<string, unknown>, IMPEDANCE_RULES, ['ohms'], out)
      if (typeof imp.r === 'number' && typeof imp.x === 'number' && Math.hypot(imp.r, imp.x) < MIN_LOAD_OHMS) out.push({ path: ['ohms'], message: OHMS_MINIMUM, input: o })
    }
  },
)
export const VoltmeterSchema = ruled(z.object({ id, kind: z.literal('voltmeter') }), {})
/** (1.1) zero ohms in series, reading the current from a to b. */
export const AmmeterSchema = ruled(z.object({ id, kind: z.literal('ammeter') }), {})
/** (1.1) three 10 MΩ leads to a common point, reading the phase sequence of a, b, c. */
export const RotationMeterSchema = ruled(z.object({ id, kind: z.literal('rotation-meter') }), {})
export const OutputSchema = ruled(z.object({ id, kind: z.literal('output') }), {})
export const GroundSchema = ruled(z.object({ id, kind: z.literal('ground') }), {})

export const COMPONENT_KINDS = ['supply', 'breaker', 'fuse', 'transformer', 'load', 'voltmeter', 'ammeter', 'rotation-meter', 'output', 'ground'] as const
export type ComponentKind = (typeof COMPONENT_KINDS)[number]

export const ComponentSchema = z.discriminatedUnion(
  'kind',
  [SupplySchema, BreakerSchema, FuseSchema, TransformerSchema, LoadSchema, VoltmeterSchema, AmmeterSchema, RotationMeterSchema, OutputSchema, GroundSchema],
  { error: (issue) => (issue.code === 'invalid_union' ? `kind must be one of ${COMPONENT_KINDS.join(', ')}` : undefined) },
)

const WIRE_END = 'a wire end must be a terminal name such as "T1.X1"'
const WIRE_PAIR = 'a wire must be a pair of terminal names, such as ["T1.X2", "T1.X3"]'

/**
 * A pair of terminal names: one check of zod's rather than a tuple of two string schemas (a
 * document holds hundreds of wires; the tuple's three schema runs per wire took a third more
 * time). The errors are the tuple's: at the wire's path, or at the end's ([i][0] or [i][1]).
 */
export const WireSchema = z.custom<[string, string]>().check((ctx) => {
  const w = ctx.value
  if (!Array.isArray(w) || w.length !== 2) {
    ctx.issues.push({ code: 'custom', message: WIRE_PAIR, input: w })
    return
  }
  if (typeof w[0] !== 'string') ctx.issues.push({ code: 'custom', message: WIRE_END, input: w[0], path: [0] })
  if (typeof w[1] !== 'string') ctx.issues.push({ code: 'custom', message: WIRE_END, input: w[1], path: [1] })
})

export const LayoutSchema = z.record(
  z.string(),
  ruled(z.object({ x: num('x'), y: num('y') }).loose(), { x: bounded('x', -1e7, 1e7), y: bounded('y', -1e7, 1e7) }),
)

/** The document without the cross-reference checks (ids, terminals); see `CircuitSchema`. */
export const CircuitShapeSchema = z
  .object({
    format: z.literal(CIRCUIT_FORMAT, { error: `format must be "${CIRCUIT_FORMAT}"` }),
    version: z.literal(CIRCUIT_VERSION, { error: `version must be ${CIRCUIT_VERSION}` }),
    name: z.string({ error: 'name must be a string' }).max(LIMITS.nameLength, { error: `name must be at most ${LIMITS.nameLength} characters` }).optional(),
    components: z
      .array(ComponentSchema, { error: 'components must be a list' })
      .max(LIMITS.components, { error: `at most ${LIMITS.components} components` }),
    wires: z.array(WireSchema, { error: 'wires must be a list' }).max(LIMITS.wires, { error: `at most ${LIMITS.wires} wires` }),
    layout: LayoutSchema.optional(),
  })
  // later versions may add optional fields: keep what we do not know rather than drop it
  .loose()

export type Impedance = z.infer<typeof ImpedanceSchema>
export type Supply = z.infer<typeof SupplySchema>
export type Breaker = z.infer<typeof BreakerSchema>
export type Fuse = z.infer<typeof FuseSchema>
export type Transformer = z.infer<typeof TransformerSchema>
export type Load = z.infer<typeof LoadSchema>
export type Voltmeter = z.infer<typeof VoltmeterSchema>
export type Ammeter = z.infer<typeof AmmeterSchema>
export type RotationMeter = z.infer<typeof RotationMeterSchema>
export type Output = z.infer<typeof OutputSchema>
export type Ground = z.infer<typeof GroundSchema>
export type Component = z.infer<typeof ComponentSchema>
export type Wire = [string, string]
export type Circuit = z.infer<typeof CircuitShapeSchema>
/** A document as a user may write it: fields with defaults may be left out. */
export type CircuitInput = z.input<typeof CircuitShapeSchema>
export type ComponentInput = z.input<typeof ComponentSchema>

const SUPPLY_WYE = ['A', 'B', 'C', 'N'] as const
const SUPPLY_DELTA = ['A', 'B', 'C'] as const
const BREAKER_POLES = [[], ['L1', 'T1'], ['L1', 'L2', 'T1', 'T2'], ['L1', 'L2', 'L3', 'T1', 'T2', 'T3']] as const
const ONE_COIL = ['H1', 'H2', 'X1', 'X2'] as const
const TWO_COILS = ['H1', 'H2', 'X1', 'X2', 'X3', 'X4'] as const
const TWO_ENDS = ['a', 'b'] as const
const THREE_LEADS = ['a', 'b', 'c'] as const
const OUTPUT = ['a', 'b', 'c', 'n'] as const
const GROUND = ['g'] as const
const NONE = [] as const

/** Terminal names of a component, in the order a drawing shows them (shared lists: do not modify). */
export function terminalsOf(c: { kind: string; poles?: unknown; secondaryVolts?: unknown; connection?: unknown }): readonly string[] {
  switch (c.kind) {
    case 'supply':
      return c.connection === 'wye' ? SUPPLY_WYE : SUPPLY_DELTA
    case 'breaker':
      return BREAKER_POLES[c.poles === 1 || c.poles === 2 || c.poles === 3 ? c.poles : 3]
    case 'transformer':
      return Array.isArray(c.secondaryVolts) && c.secondaryVolts.length === 1 ? ONE_COIL : TWO_COILS
    case 'fuse':
    case 'load':
    case 'voltmeter':
    case 'ammeter':
      return TWO_ENDS
    case 'rotation-meter':
      return THREE_LEADS
    case 'output':
      return OUTPUT
    case 'ground':
      return GROUND
    default:
      return NONE
  }
}

/** Splits "T1.X3" into ["T1", "X3"]; null when there is no dot. */
export function splitTerminal(name: string): [string, string] | null {
  const dot = name.lastIndexOf('.')
  if (dot <= 0 || dot === name.length - 1) return null
  return [name.slice(0, dot), name.slice(dot + 1)]
}
