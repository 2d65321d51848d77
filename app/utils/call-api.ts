type PlainFetch = (path: string, options: { method?: string, body?: Record<string, unknown> }) => Promise<unknown>

/**
 * `$fetch` for our JSON routes with the answer's type named by the caller. Seen as a plain
 * function, so that vue-tsc does not infer through every typed route (with this many routes
 * it runs out of stack doing so).
 */
export function callApi<T = unknown>(path: string, options: { method?: 'GET' | 'POST' | 'PATCH' | 'DELETE', body?: Record<string, unknown> } = {}): Promise<T> {
  return ($fetch as unknown as PlainFetch)(path, options) as Promise<T>
}
