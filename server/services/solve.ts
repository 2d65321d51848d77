/**
 * Validates and solves a circuit document in the engine's worker pool, turning user errors
 * into 4xx answers. The result comes back as JSON text, made in the worker, so the request
 * thread neither copies nor serializes a large result.
 */
export async function solveDocument(body: unknown): Promise<string> {
  const outcome = await runEngine('solve', body)
  if (!outcome.ok) throw engineFailure(outcome)
  return outcome.json
}
