/**
 * Validation of circuit documents with errors a person can act on: each names the JSON
 * path of the offending value and says what is wrong with it.
 */
import type { z } from 'zod'
import { CircuitShapeSchema, COMPONENT_KINDS, splitTerminal, terminalsOf, type Circuit } from './schema'

export interface CircuitError {
  /** Where the problem is, for example `components[2].kva` or `wires[4][1]`; `(document)` for the whole. */
  path: string
  message: string
}

/** The terminals of a document, as the wiring check found them. */
export interface TerminalIndex {
  /** the index of each terminal name: the components' terminals in turn, as terminalsOf lists them */
  index: Map<string, number>
  /** the name of each terminal by its index */
  names: string[]
  /** the terminal index of each wire's ends (wire w at 2w and 2w + 1), -1 for an unknown one */
  wireEnds: number[]
}

export type ParseResult = { ok: true; circuit: Circuit } | { ok: false; errors: CircuitError[] }

const MAX_ERRORS = 50

/** Formats a path as `components[2].kva`. */
export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let out = ''
  for (const part of path) {
    if (typeof part === 'number') out += `[${part}]`
    else out += out ? `.${String(part)}` : String(part)
  }
  return out || '(document)'
}

function isRecord(v: unknown): v is Record<string, unknown> {
  return typeof v === 'object' && v !== null && !Array.isArray(v)
}

/**
 * The checks a schema of shapes cannot make: duplicate ids, wires that name a component or
 * terminal that does not exist, and wires from a terminal to itself. Works on raw input, so
 * that these errors are reported together with any shape errors.
 */
export function crossCheck(doc: unknown): CircuitError[] {
  return crossCheckIndexed(doc).errors
}

/**
 * crossCheck, also giving every terminal name its index in document order (the components'
 * terminals in turn, as `terminalsOf` lists them): the solver's topology starts from it.
 */
function crossCheckIndexed(doc: unknown): { errors: CircuitError[]; terminals: TerminalIndex } {
  /** every terminal name a wire may use, so a sound wire is one lookup per end */
  const valid = new Map<string, number>()
  const names: string[] = []
  const wireEnds: number[] = []
  const terminals: TerminalIndex = { index: valid, names, wireEnds }
  if (!isRecord(doc) || !Array.isArray(doc.components)) return { errors: [], terminals }
  const errors: CircuitError[] = []
  const components: unknown[] = doc.components
  /** the index of the component with each id */
  const byId = new Map<string, number>()
  for (let index = 0; index < components.length; index++) {
    const c = components[index]
    if (!isRecord(c) || typeof c.id !== 'string') continue
    const seen = byId.get(c.id)
    if (seen !== undefined) {
      errors.push({ path: `components[${index}].id`, message: `duplicate id "${c.id}": components[${seen}] already uses it` })
      continue
    }
    byId.set(c.id, index)
    for (const t of terminalsOf(c as { kind: string })) {
      const name = `${c.id}.${t}`
      valid.set(name, names.length)
      names.push(name)
    }
  }
  if (!Array.isArray(doc.wires)) return { errors, terminals }
  const wires: unknown[] = doc.wires
  for (let index = 0; index < wires.length; index++) {
    const w = wires[index]
    if (!Array.isArray(w) || w.length !== 2) {
      wireEnds.push(-1, -1)
      continue
    }
    if (w[0] === w[1] && typeof w[0] === 'string') errors.push({ path: `wires[${index}]`, message: `a wire from "${w[0]}" to itself` })
    for (let side = 0; side < 2; side++) {
      const end: unknown = w[side]
      const at = typeof end === 'string' ? valid.get(end) : undefined
      wireEnds.push(at ?? -1)
      if (at !== undefined) {
        // the name as the document spells it: the same text, and the string JSON.parse made
        // is one V8 has already interned, so the result's key costs less
        names[at] = end as string
        continue
      }
      if (typeof end !== 'string') continue
      const path = `wires[${index}][${side}]`
      const parts = splitTerminal(end)
      if (!parts) {
        errors.push({ path, message: `"${end}" is not a terminal name: write it as ID.TERMINAL, for example "T1.X1"` })
        continue
      }
      const [cid] = parts
      const byIdAt = byId.get(cid)
      if (byIdAt === undefined) {
        errors.push({ path, message: `unknown terminal "${end}": there is no component "${cid}"` })
        continue
      }
      const comp = components[byIdAt] as Record<string, unknown>
      const kind = typeof comp.kind === 'string' ? comp.kind : ''
      if ((COMPONENT_KINDS as readonly string[]).includes(kind)) {
        errors.push({ path, message: `unknown terminal "${end}": a ${kind} "${cid}" has ${terminalsOf(comp as { kind: string }).join(', ')}` })
      }
    }
  }
  return { errors, terminals }
}

function issueMessage(issue: z.core.$ZodIssue): string {
  if (issue.code === 'invalid_union' && 'note' in issue && issue.note === 'No matching discriminator') {
    return `unknown kind: expected one of ${COMPONENT_KINDS.join(', ')}`
  }
  if (issue.code === 'unrecognized_keys') return `unknown field(s): ${issue.keys.join(', ')}`
  return issue.message
}

/** The document schema with its cross-reference checks, for `readValidatedBody` and the like. */
export const CircuitSchema = CircuitShapeSchema.superRefine((doc, ctx) => {
  for (const e of crossCheck(doc)) ctx.addIssue({ code: 'custom', message: e.message, path: pathFromString(e.path) })
})

function pathFromString(path: string): (string | number)[] {
  const out: (string | number)[] = []
  for (const m of path.matchAll(/([^.[\]]+)|\[(\d+)\]/g)) out.push(m[2] !== undefined ? Number(m[2]) : m[1]!)
  return out
}

/** Turns any zod error into our error list. */
export function circuitErrorsFrom(error: z.ZodError): CircuitError[] {
  return error.issues.map((issue) => ({ path: formatPath(issue.path), message: issueMessage(issue) }))
}

/**
 * Validates a circuit document (an object, or JSON text). Returns the typed document with its
 * defaults filled in, or every error found, each naming its path.
 */
export function parseCircuit(input: unknown): ParseResult {
  const r = parseCircuitIndexed(input)
  return r.ok ? { ok: true, circuit: r.circuit } : r
}

/**
 * parseCircuit, also returning the index of every terminal name (see crossCheckIndexed), valid
 * for the returned document as long as it is not changed: for a solve that follows at once.
 */
export function parseCircuitIndexed(input: unknown): { ok: true; circuit: Circuit; terminals: TerminalIndex } | { ok: false; errors: CircuitError[] } {
  let doc = input
  if (typeof input === 'string') {
    try {
      doc = JSON.parse(input)
    } catch (e) {
      return { ok: false, errors: [{ path: '(document)', message: `not valid JSON: ${(e as Error).message}` }] }
    }
  }
  if (!isRecord(doc)) return { ok: false, errors: [{ path: '(document)', message: 'a circuit document must be a JSON object' }] }
  const shape = CircuitShapeSchema.safeParse(doc)
  const errors = shape.success ? [] : circuitErrorsFrom(shape.error)
  const seen = new Set(errors.map((e) => `${e.path}\n${e.message}`))
  const cross = crossCheckIndexed(doc)
  for (const e of cross.errors) {
    const key = `${e.path}\n${e.message}`
    if (!seen.has(key)) errors.push(e)
  }
  if (errors.length > 0 || !shape.success) return { ok: false, errors: errors.slice(0, MAX_ERRORS) }
  return { ok: true, circuit: shape.data, terminals: cross.terminals }
}
