import { parseCircuit } from '#shared/circuit/parse'
import { CircuitSolveError, solveCircuit } from '#shared/engine'
import type { SolveResult } from '#shared/engine'

/** Validates and solves a circuit document, turning user errors into 4xx answers. */
export function solveDocument(body: unknown): SolveResult {
  const parsed = parseCircuit(body)
  if (!parsed.ok) {
    throw createError({ statusCode: 400, statusMessage: 'Invalid circuit document', data: { errors: parsed.errors } })
  }
  try {
    return solveCircuit(parsed.circuit).result
  }
  catch (e) {
    if (e instanceof CircuitSolveError) {
      throw createError({ statusCode: 422, statusMessage: 'The circuit cannot be solved', data: { errors: [{ path: 'components', message: e.message }], parts: e.parts } })
    }
    throw e
  }
}
