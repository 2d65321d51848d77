/**
 * What the server works out for a fault-hunt attempt, as pure code (it runs in the engine's
 * worker threads): the student's document checked against the hunt's bank, the hunt's faults
 * applied to the student's wiring, the solve, and a probe's reading between two of the
 * student's terminals. Errors come back as values, with the status and the paths at fault,
 * so the server can answer them without anything crossing the thread as an exception.
 */
import { parseCircuit } from '../circuit/parse'
import { terminalsOf, type Circuit } from '../circuit/schema'
import { CircuitSolveError } from '../engine/network'
import { degreesOf, solveCircuit } from '../engine/solve'
import type { SolveResult } from '../engine/types'
import { applyFaults, type Fault } from './faults'

export interface SettleTask {
  hunt: { document: Record<string, unknown>, faults: Fault[] }
  /** the student's document as sent */
  document: Record<string, unknown>
  probe?: { from: string, to: string }
}

export interface SettleFailure {
  ok: false
  statusCode: 400 | 422 | 500
  statusMessage: string
  errors: { path: string, message: string }[]
}

export interface Settled {
  ok: true
  result: SolveResult
  /** the student's document with the protective operations applied (blown fuses, tripped breakers) */
  document: Record<string, unknown>
  /** energized with fault current or a loop closed onto a voltage */
  unsafe: boolean
  reading?: { volts: number, degrees: number }
}

const isFailure = (x: Circuit | SettleFailure): x is SettleFailure => (x as SettleFailure).ok === false

const fail = (statusCode: SettleFailure['statusCode'], statusMessage: string, errors: SettleFailure['errors']): SettleFailure => ({ ok: false, statusCode, statusMessage, errors })

/** The fields a student may change on a part: a breaker's handle and a fuse being blown or replaced. */
const STUDENT_FIELDS: Record<string, string> = { breaker: 'closed', fuse: 'blown' }

function sameValue(a: unknown, b: unknown): boolean {
  if (a === b) return true
  if (typeof a !== 'object' || typeof b !== 'object' || a === null || b === null) return false
  if (Array.isArray(a) !== Array.isArray(b)) return false
  const ka = Object.keys(a).filter(k => (a as Record<string, unknown>)[k] !== undefined)
  const kb = Object.keys(b).filter(k => (b as Record<string, unknown>)[k] !== undefined)
  if (ka.length !== kb.length) return false
  return ka.every(k => sameValue((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]))
}

/**
 * The student's document checked against the hunt: the same parts, each exactly as the hunt
 * has it (kind, connection, nameplate, everything) but for the breakers' handles and the
 * fuses; nothing added or taken away. Then the hunt's parts with the student's handles,
 * fuses and wiring.
 */
function benchOf(base: Circuit, student: Circuit): Circuit | SettleFailure {
  const errors: SettleFailure['errors'] = []
  const theirs = new Map(student.components.map((c, i) => [c.id, { c, i }]))
  for (const c of base.components) {
    const mine = theirs.get(c.id)
    if (!mine) {
      errors.push({ path: 'document.components', message: `${c.id} is missing: an attempt keeps every part of the hunt's bank` })
      continue
    }
    if (mine.c.kind !== c.kind) {
      errors.push({ path: `document.components[${mine.i}]`, message: `${c.id} is a ${c.kind} in this hunt, not a ${mine.c.kind}` })
      continue
    }
    const own = STUDENT_FIELDS[c.kind]
    const a = c as unknown as Record<string, unknown>
    const b = mine.c as unknown as Record<string, unknown>
    const changed = [...new Set([...Object.keys(a), ...Object.keys(b)])].filter(k => k !== own && !sameValue(a[k], b[k])).sort()
    if (changed.length) {
      errors.push({ path: `document.components[${mine.i}]`, message: `${c.id} differs from the hunt's bank in ${changed.join(', ')}: in a hunt only the jumpers, breaker handles and fuses are yours to change` })
    }
  }
  const known = new Set(base.components.map(c => c.id))
  student.components.forEach((c, i) => {
    if (!known.has(c.id)) errors.push({ path: `document.components[${i}]`, message: `${c.id} is not part of this hunt's bank: an attempt cannot add parts (probe with the meter instead)` })
  })
  if (errors.length) return fail(400, 'Not this hunt\'s bank', errors)
  const components = base.components.map((c) => {
    const mine = theirs.get(c.id)!.c
    if (c.kind === 'breaker' && mine.kind === 'breaker') return { ...c, closed: mine.closed }
    if (c.kind === 'fuse' && mine.kind === 'fuse') return { ...c, blown: mine.blown }
    return c
  })
  return { ...base, components, wires: student.wires }
}

/** Solves the student's bank with the hunt's faults in it (and reads the probe, when there is one). */
export function settleAttempt(task: SettleTask): Settled | SettleFailure {
  const hunt = parseCircuit(task.hunt.document)
  if (!hunt.ok) return fail(500, 'A stored hunt does not parse', [])
  const parsed = parseCircuit(task.document)
  if (!parsed.ok) return fail(400, 'Invalid circuit document', parsed.errors.map(e => ({ path: `document.${e.path}`, message: e.message })))
  const bench = benchOf(hunt.circuit, parsed.circuit)
  if (isFailure(bench)) return bench
  if (task.probe) {
    // the hunt's own terminals only: the faulted bank has parts of its own (an open coil's break)
    const terminals = new Set(hunt.circuit.components.flatMap(c => terminalsOf(c).map(t => `${c.id}.${t}`)))
    const unknown = (['from', 'to'] as const).filter(end => !terminals.has(task.probe![end]))
    if (unknown.length) return fail(400, 'Invalid input', unknown.map(end => ({ path: end, message: `"${task.probe![end]}" is not a terminal of this bank` })))
  }
  const faulted = applyFaults(bench, task.hunt.faults)
  const inner = parseCircuit(faulted.document)
  if (!inner.ok) return fail(500, 'A faulted bank does not parse', [])
  let detail: ReturnType<typeof solveCircuit>
  try {
    detail = solveCircuit(inner.circuit)
  }
  catch (error) {
    if (error instanceof CircuitSolveError) {
      return fail(422, 'This wiring cannot be solved', [{ path: 'document.wires', message: 'a jumper shorts a source or a coil with nothing to limit the current: remove it and try again' }])
    }
    throw error
  }
  const { result, topo, final } = detail
  const document = structuredClone(task.document) as { components: { id: string, kind: string, closed?: boolean, blown?: boolean }[] }
  for (const e of result.events) {
    const part = document.components.find(c => c.id === e.device)
    if (part?.kind === 'fuse') part.blown = true
    if (part?.kind === 'breaker') part.closed = false
  }
  const settled: Settled = {
    ok: true,
    result,
    document: document as unknown as Record<string, unknown>,
    unsafe: result.energized && result.hazards.some(h =>
      h.code === 'fault-current' || ((h.code === 'reversed-winding' || h.code === 'loop-voltage') && !h.onClosing)),
  }
  if (task.probe) {
    const voltage = (label: string): [number, number] => {
      const node = topo.terminalNode.get(faulted.terminalOf(label))
      return node === undefined || node < 0 ? [0, 0] : [final.vRe[node]!, final.vIm[node]!]
    }
    const [ar, ai] = voltage(task.probe.from)
    const [br, bi] = voltage(task.probe.to)
    const re = ar - br
    const im = ai - bi
    const volts = Math.hypot(re, im)
    settled.reading = volts < 1e-6 ? { volts: 0, degrees: 0 } : { volts: Math.round(volts * 1e4) / 1e4, degrees: Math.round(degreesOf(re, im) * 100) / 100 }
  }
  return settled
}
