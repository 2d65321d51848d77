/**
 * The engine's worker thread (run by piscina, see server/utils/engine-pool.ts). Each export is
 * one kind of task; each takes and returns plain data, and answers a user's mistake as a value
 * (`{ ok: false, statusCode, ... }`), never by throwing, so nothing but data crosses the thread.
 * Bundled on its own into .output/server/workers/ (server/workers/build.ts): it imports pure
 * code only (shared/ and the PDF writer), never Nitro.
 */
import type { MessagePort } from 'node:worker_threads'
import { parseCircuit } from '#shared/circuit/parse'
import { CircuitSolveError, solveCircuit } from '#shared/engine'
import { settleAttempt as settle, type SettleTask } from '#shared/hunts/settle'
import { labPoints as points } from '#shared/lab-sheets/points'
import { planSiteCheck, type SiteCheckInput, type SitePlan } from '#shared/site-check'

export interface EngineFailure {
  ok: false
  statusCode: number
  statusMessage: string
  data: Record<string, unknown>
}

/** Every task carries the port it says "started" on, so the time budget counts running time only, not the wait in the queue. */
export interface Envelope<T> {
  started: MessagePort
  task: T
}

function begin<T>(envelope: Envelope<T>): T {
  envelope.started.postMessage(0)
  envelope.started.close()
  return envelope.task
}

/** POST /api/solve: validate and solve; the result as JSON text (the main thread sends it as it is). */
export function solve(envelope: Envelope<unknown>): { ok: true, json: string } | EngineFailure {
  const body = begin(envelope)
  const parsed = parseCircuit(body)
  if (!parsed.ok) return { ok: false, statusCode: 400, statusMessage: 'Invalid circuit document', data: { errors: parsed.errors } }
  try {
    return { ok: true, json: JSON.stringify(solveCircuit(parsed.circuit).result) }
  }
  catch (e) {
    if (e instanceof CircuitSolveError) {
      return { ok: false, statusCode: 422, statusMessage: 'The circuit cannot be solved', data: { errors: [{ path: 'components', message: e.message }], parts: e.parts } }
    }
    throw e
  }
}

/** A fault-hunt attempt's energize or probe. */
export function settleAttempt(envelope: Envelope<SettleTask>) {
  return settle(begin(envelope))
}

/** A lab sheet's test points with their predictions. */
export function labPoints(envelope: Envelope<Record<string, unknown>>) {
  return points(begin(envelope))
}

function plan(input: SiteCheckInput): { ok: true, plan: SitePlan } | EngineFailure {
  try {
    return { ok: true, plan: planSiteCheck(input) }
  }
  catch (e) {
    return {
      ok: false,
      statusCode: 422,
      statusMessage: 'This bank has no solution',
      data: { errors: [{ path: '(body)', message: `the engine could not solve this bank: ${(e as Error).message}` }] },
    }
  }
}

/** The Site check's plan. */
export function sitePlan(envelope: Envelope<SiteCheckInput>) {
  return plan(begin(envelope))
}

/** The Site check's plan printed as the PDF sheet (pdf-lib is loaded only by the first sheet a worker makes). */
export async function sitePdf(envelope: Envelope<{ input: SiteCheckInput, preparedBy?: string }>): Promise<{ ok: true, pdf: Uint8Array } | EngineFailure> {
  const { input, preparedBy } = begin(envelope)
  const planned = plan(input)
  if (!planned.ok) return planned
  const { siteCheckPdf } = await import('../services/site-check-pdf')
  return { ok: true, pdf: await siteCheckPdf(planned.plan, { preparedBy }) }
}
