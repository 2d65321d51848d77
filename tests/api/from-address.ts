// Requests from another loopback address (127.0.0.2, 127.0.0.3, ...): the server sees a
// different client IP, as it would for a person on another network.
import { request } from 'node:http'
import { baseURL } from './helpers'

export interface AddressResponse {
  status: number
  headers: Record<string, string | string[] | undefined>
  body: any
  text: string
}

/** A JSON request to the run's server (or `base`) sent from `localAddress`. */
export function fromAddress(localAddress: string, path: string, { method = 'GET', json, cookie, base = baseURL }: { method?: string, json?: unknown, cookie?: string, base?: string } = {}): Promise<AddressResponse> {
  const url = new URL(path, base)
  const payload = json === undefined ? undefined : Buffer.from(JSON.stringify(json))
  return new Promise((resolve, reject) => {
    const req = request({
      host: url.hostname,
      port: url.port,
      path: url.pathname + url.search,
      method,
      localAddress,
      agent: false,
      headers: {
        accept: 'application/json',
        ...(payload ? { 'content-type': 'application/json', 'content-length': String(payload.length) } : {}),
        ...(cookie ? { cookie } : {}),
      },
    }, (res) => {
      const chunks: Buffer[] = []
      res.on('data', (chunk: Buffer) => chunks.push(chunk))
      res.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8')
        const isJson = String(res.headers['content-type'] ?? '').includes('json')
        resolve({ status: res.statusCode ?? 0, headers: res.headers, body: isJson && text ? JSON.parse(text) : text, text })
      })
      res.on('error', reject)
    })
    req.on('error', reject)
    req.end(payload)
  })
}

/** The `nuxt-session=...` pair from a response's Set-Cookie. */
export function cookieOf(response: AddressResponse): string {
  const headers = response.headers['set-cookie'] ?? []
  for (const header of Array.isArray(headers) ? headers : [headers]) {
    const pair = header.split(';')[0]!
    if (pair.startsWith('nuxt-session=')) return pair
  }
  return ''
}

/**
 * A loopback address of its own for a test (127.x.y.z, never 127.0.0.1), so that the failures
 * it makes count against no other test's address (the per-address count lasts a day).
 */
export function loopbackAddress(): string {
  const byte = (low: number) => low + Math.floor(Math.random() * (250 - low))
  return `127.${byte(10)}.${byte(0)}.${byte(1)}`
}
