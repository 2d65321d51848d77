import type { IncomingMessage } from 'node:http'
import type { H3Event } from 'h3'

import { JSON_BODY_LIMIT } from '../../shared/limits'

export { JSON_BODY_LIMIT }
/**
 * How deep a JSON body may nest objects and lists. MariaDB refuses JSON nested deeper than 32,
 * and a document is one level inside its body, so a body of 32 levels stores safely.
 */
export const JSON_DEPTH_LIMIT = 32
/**
 * Object keys in a whole JSON body. The widest real body, a bank of about 1 500 fuse-and-load
 * pairs with its layout filling the 256 KB, holds about 18 000; a body past this is not a bank.
 */
export const JSON_KEY_LIMIT = 25_000

/**
 * The request body, read chunk by chunk from the socket and never more than `limit` bytes of
 * it: past the limit (declared or as it arrives, with Content-Length or chunked alike) it
 * stops keeping it and throws `tooLarge()`; the connection is closed after the answer (see
 * refuse), so the rest of the body is never held. Undefined when the request has no body.
 */
export async function readLimitedBody(event: H3Event, limit: number, tooLarge: () => Error): Promise<Buffer | undefined> {
  const ours = (event.context as { limitedBody?: Buffer }).limitedBody
  if (ours) return ours
  const req = event.node.req as IncomingMessage & { body?: unknown, rawBody?: unknown }
  const declared = getRequestHeader(event, 'content-length')
  const chunked = /\bchunked\b/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')
  if (declared !== undefined && Number(declared) > limit) throw refuse(event, tooLarge)

  // a request made inside the server (Nitro's local fetch) carries its body already read
  if (req.body !== undefined || req.rawBody !== undefined || typeof req.on !== 'function') {
    const raw = await readRawBody(event, false)
    if (raw && raw.length > limit) throw refuse(event, tooLarge)
    return raw
  }
  if (!chunked && !Number(declared)) return undefined
  if (req.readableEnded) return undefined

  const body = await new Promise<Buffer>((resolve, reject) => {
    const chunks: Buffer[] = []
    let received = 0
    const done = (error?: Error) => {
      req.off('data', onData)
      req.off('end', onEnd)
      req.off('error', onError)
      req.off('aborted', onAborted)
      if (error) reject(error)
      else resolve(Buffer.concat(chunks, received))
    }
    const onData = (chunk: Buffer) => {
      received += chunk.length
      if (received > limit) {
        chunks.length = 0
        done(refuse(event, tooLarge))
        return
      }
      chunks.push(chunk)
    }
    const onEnd = () => done()
    const onError = (error: Error) => done(createError({ statusCode: 400, statusMessage: 'Body not received', data: { errors: [{ path: '(body)', message: `the body did not arrive whole: ${error.message}` }] } }))
    const onAborted = () => onError(new Error('the client went away'))
    req.on('data', onData).on('end', onEnd).on('error', onError).on('aborted', onAborted)
  })
  ;(event.context as { limitedBody?: Buffer }).limitedBody = body
  return body
}

// how long a refused body's connection stays open after the 413, read and thrown away, so the
// client (still sending) reads the answer before the close; a socket closed with unread bytes
// in it is reset, and a reset can reach the client before the answer does
const LINGER_MS = 2000

/**
 * The answer to an oversize body: nothing more of it is kept. Once the 413 is sent, our side
 * of the connection is closed; what still arrives is read and dropped until the client stops
 * or LINGER_MS pass, then the socket is destroyed.
 */
function refuse(event: H3Event, tooLarge: () => Error) {
  const { req, res } = event.node
  const socket = req.socket
  if (socket && !(event.context as { lingering?: boolean }).lingering) {
    (event.context as { lingering?: boolean }).lingering = true
    req.on('data', () => {})
    req.resume()
    res.once('finish', () => {
      socket.end()
      const timer = setTimeout(() => socket.destroy(), LINGER_MS)
      timer.unref()
      socket.once('close', () => clearTimeout(timer))
    })
  }
  return tooLarge()
}

/**
 * Reads a JSON body with a size limit: 413 past the limit (declared, or as the bytes arrive),
 * 400 naming the problem for a missing or malformed body, or one nested too deep or with too
 * many keys (JSON_DEPTH_LIMIT, JSON_KEY_LIMIT).
 */
export async function readJsonBody(event: H3Event, limit = JSON_BODY_LIMIT): Promise<unknown> {
  const bytes = await readLimitedBody(event, limit, () => tooLarge(limit))
  const raw = bytes?.toString('utf8')
  if (!raw || raw.trim() === '') {
    throw createError({ statusCode: 400, statusMessage: 'Missing body', data: { errors: [{ path: '(body)', message: 'the request has no JSON body' }] } })
  }
  let value: unknown
  try {
    value = JSON.parse(raw)
  }
  catch (e) {
    throw createError({
      statusCode: 400,
      statusMessage: 'Malformed JSON',
      data: { errors: [{ path: '(body)', message: `the body is not valid JSON: ${(e as Error).message}` }] },
    })
  }
  const problem = checkJsonShape(value)
  if (problem) throw createError({ statusCode: 400, statusMessage: 'Body too deep or too wide', data: { errors: [problem] } })
  return value
}

interface Visit {
  value: unknown
  depth: number
  parent: Visit | undefined
  key: string | number
}

function pathOf(visit: Visit): string {
  const parts: (string | number)[] = []
  for (let v: Visit | undefined = visit; v?.parent; v = v.parent) parts.push(v.key)
  let out = ''
  for (const part of parts.reverse()) {
    if (typeof part === 'number') out += `[${part}]`
    else if (/^[A-Za-z_$][\w$]*$/.test(part)) out += out ? `.${part}` : part
    else out += `[${JSON.stringify(part)}]`
  }
  return out || '(body)'
}

/**
 * The first place a parsed JSON value nests deeper than JSON_DEPTH_LIMIT, or where it passes
 * JSON_KEY_LIMIT keys in all; undefined when it does neither. An explicit stack, not
 * recursion: a body of 100 000 nested lists parses fine and must not overflow the stack here.
 */
export function checkJsonShape(value: unknown, depthLimit = JSON_DEPTH_LIMIT, keyLimit = JSON_KEY_LIMIT): { path: string, message: string } | undefined {
  const stack: Visit[] = [{ value, depth: 1, parent: undefined, key: '' }]
  let keys = 0
  while (stack.length > 0) {
    const visit = stack.pop()!
    const { value: node, depth } = visit
    if (typeof node !== 'object' || node === null) continue
    if (depth > depthLimit) {
      return { path: pathOf(visit), message: `nested too deep: a body may nest objects and lists ${depthLimit} levels at most` }
    }
    if (Array.isArray(node)) {
      for (let i = node.length - 1; i >= 0; i--) {
        if (typeof node[i] === 'object' && node[i] !== null) stack.push({ value: node[i], depth: depth + 1, parent: visit, key: i })
      }
      continue
    }
    const names = Object.keys(node)
    keys += names.length
    if (keys > keyLimit) {
      return { path: pathOf(visit), message: `too many keys: a body may hold ${keyLimit} object keys in all` }
    }
    for (let i = names.length - 1; i >= 0; i--) {
      const child = (node as Record<string, unknown>)[names[i]!]
      if (typeof child === 'object' && child !== null) stack.push({ value: child, depth: depth + 1, parent: visit, key: names[i]! })
    }
  }
  return undefined
}

function tooLarge(limit: number) {
  return createError({
    statusCode: 413,
    statusMessage: 'Body too large',
    data: { errors: [{ path: '(body)', message: `the body is larger than ${Math.round(limit / 1024)} KB` }] },
  })
}
