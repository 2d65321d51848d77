/**
 * POST /api/solve — solve a circuit document (circuit-format.md) and return the result.
 * Open to anyone (no sign-in: the Bench's preview and the command line's peers use it);
 * anonymous callers are limited per address (server/utils/solve-limit.ts), signed-in ones not.
 */
import { solveDocument } from '~~/server/services/solve'

export default defineEventHandler(async (event) => {
  const user = await currentUser(event)
  if (!user) await consumeAnonymousSolve(event)
  const body = await readJsonBody(event)
  const json = await solveDocument(body)
  setResponseHeader(event, 'content-type', 'application/json; charset=utf-8')
  return json
})
