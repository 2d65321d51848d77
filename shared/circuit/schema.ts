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

// One check per field, not one per rule: zod's cost grows with the number of checks, and a
// document holds a few hundred ids and numbers. The error function says which rule failed.
const id = z.string({ error: 'id must be a string' }).regex(ID_PATTERN, {
  error: (issue) => {
    const value = String(issue.input ?? '')
    if (value.length === 0) return 'id must not be empty'
    if (value.length > LIMITS.idLength) return `id must be at most ${LIMITS.idLength} characters`
    return 'id must start with a letter and hold only letters, digits, "-" or "_"'
  },
})

// zod 4's number() already refuses NaN and ±Infinity
function positive(field: string, max: number, unit = '') {
  const tooSmall = `${field} must be greater than 0`
  const tooBig = `${field} must be at most ${max}${unit}`
  return z
    .number({ error: `${field} must be a number` })
    .refine((v) => v > 0 && v <= max, { error: (issue) => ((issue.input as number) > 0 ? tooBig : tooSmall) })
}

function bounded(field: string, min: number, max: number) {
  const error = `${field} must be between ${min} and ${max}`
  return z.number({ error: `${field} must be a number` }).refine((v) => v >= min && v <= max, { error })
}

export const ImpedanceSchema = z.object({
  r: bounded('r (ohms)', 0, 1e9),
  x: bounded('x (ohms)', -1e9, 1e9),
})

export const SupplySchema = z.object({
  id,
  kind: z.literal('supply'),
  connection: z.enum(['wye', 'delta'], { error: 'connection must be "wye" or "delta"' }),
  lineVolts: positive('lineVolts', 1_000_000, ' V'),
  hz: positive('hz', 1000, ' Hz').default(() => 60),
  rotation: z.enum(['ABC', 'ACB'], { error: 'rotation must be "ABC" or "ACB"' }).default(() => 'ABC' as const),
  sourceOhms: z
    .object({ r: bounded('sourceOhms.r', 0, 1e6), x: bounded('sourceOhms.x', 0, 1e6) })
    .default(() => ({ r: 0.02, x: 0.05 })),
})

export const BreakerSchema = z.object({
  id,
  kind: z.literal('breaker'),
  poles: z.literal([1, 2, 3], { error: 'poles must be 1, 2 or 3' }).default(() => 3 as const),
  amps: positive('amps', 100_000, ' A'),
  closed: z.boolean({ error: 'closed must be true or false' }).default(() => false),
})

export const FuseSchema = z.object({
  id,
  kind: z.literal('fuse'),
  amps: positive('amps', 100_000, ' A'),
  blown: z.boolean({ error: 'blown must be true or false' }).default(() => false),
})

export const TransformerSchema = z.object({
  id,
  kind: z.literal('transformer'),
  kva: positive('kva', 100_000, ' kVA'),
  primaryVolts: positive('primaryVolts', 1_000_000, ' V'),
  secondaryVolts: z
    .array(positive('secondaryVolts', 1_000_000, ' V'), { error: 'secondaryVolts must be a list of one or two coil voltages' })
    .min(1, { error: 'secondaryVolts needs one or two coil voltages' })
    .max(2, { error: 'secondaryVolts holds at most two coil voltages' }),
  impedancePercent: bounded('impedancePercent', 0.01, 50).default(() => 3),
  xOverR: bounded('xOverR', 0, 100).default(() => 1.5),
  compensationPercent: bounded('compensationPercent', -20, 20).default(() => 0),
})

/** Below this a load is a short: draw a jumper instead (it keeps the equations well conditioned). */
export const MIN_LOAD_OHMS = 1e-4

const LoadOhmsSchema = z.union([positive('ohms', 1e9, ' Ω'), ImpedanceSchema], {
  error: 'ohms must be a positive number or { "r": .., "x": .. }',
}).refine((o) => (typeof o === 'number' ? o : Math.hypot(o.r, o.x)) >= MIN_LOAD_OHMS, {
  error: `ohms must be at least ${MIN_LOAD_OHMS} Ω; for a bolted short use a jumper`,
})

export const LoadSchema = z.object({ id, kind: z.literal('load'), ohms: LoadOhmsSchema })
export const VoltmeterSchema = z.object({ id, kind: z.literal('voltmeter') })
export const OutputSchema = z.object({ id, kind: z.literal('output') })
export const GroundSchema = z.object({ id, kind: z.literal('ground') })

export const COMPONENT_KINDS = ['supply', 'breaker', 'fuse', 'transformer', 'load', 'voltmeter', 'output', 'ground'] as const
export type ComponentKind = (typeof COMPONENT_KINDS)[number]

export const ComponentSchema = z.discriminatedUnion(
  'kind',
  [SupplySchema, BreakerSchema, FuseSchema, TransformerSchema, LoadSchema, VoltmeterSchema, OutputSchema, GroundSchema],
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
  z.object({ x: bounded('x', -1e7, 1e7), y: bounded('y', -1e7, 1e7) }).loose(),
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
      return TWO_ENDS
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
