/**
 * POST /api/solve — solve a circuit document (circuit-format.md) and return the result.
 * Open to anyone (no sign-in: the Bench's preview and the command line's peers use it).
 */
import { solveDocument } from '~~/server/services/solve'

export default defineEventHandler(async (event) => {
  const body = await readJsonBody(event)
  return solveDocument(body)
})
