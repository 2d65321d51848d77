// Shared by the api tests (and any later route tests). `npm test` starts one built server
// and one MariaDB for the whole run and passes their addresses in the environment.

function fromEnv(name: string): string {
  const value = process.env[name]
  if (!value) {
    throw new Error(`${name} is not set: run the api and browser tests through \`npm test\` (scripts/test.mjs), which starts the server and database.`)
  }
  return value
}

/** The built server every api and browser test talks to, e.g. http://127.0.0.1:41234 */
export const baseURL = fromEnv('PHASELOOM_BASE_URL')
/** The run's MariaDB, migrated and seeded with the demo scenario. */
export const databaseURL = fromEnv('PHASELOOM_DATABASE_URL')
/** A scratch directory of this run, removed when it ends. */
export const scratchDir = fromEnv('PHASELOOM_TEST_TMP')

export interface ApiInit extends Omit<RequestInit, 'body'> {
  /** Sent as a JSON body with content-type application/json. */
  json?: unknown
  body?: RequestInit['body']
  /** Another server than the run's own (used by tests that start their own). */
  base?: string
}

export interface ApiResponse<T> {
  status: number
  headers: Headers
  /** Parsed JSON when the response is JSON, otherwise the text. */
  body: T
  text: string
}

/** fetch against the built server; never throws on an HTTP error status. */
export async function api<T = any>(path: string, init: ApiInit = {}): Promise<ApiResponse<T>> {
  const { json, base = baseURL, headers, ...rest } = init
  const requestHeaders = new Headers(headers)
  if (!requestHeaders.has('accept')) requestHeaders.set('accept', 'application/json')
  let body = rest.body
  if (json !== undefined) {
    requestHeaders.set('content-type', 'application/json')
    body = JSON.stringify(json)
  }
  const response = await fetch(new URL(path, base), { ...rest, headers: requestHeaders, body, redirect: 'manual' })
  const text = await response.text()
  const isJson = (response.headers.get('content-type') ?? '').includes('json')
  return {
    status: response.status,
    headers: response.headers,
    body: (isJson && text ? JSON.parse(text) : text) as T,
    text,
  }
}
