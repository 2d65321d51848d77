import type { H3Event } from 'h3'

/** The largest JSON body a route accepts unless it says otherwise: 256 KB. */
export const JSON_BODY_LIMIT = 256 * 1024

/**
 * Reads a JSON body with a size limit: 413 past the limit (checked on the declared length
 * first, then on what arrived), 400 naming the problem for a missing or malformed body.
 */
export async function readJsonBody(event: H3Event, limit = JSON_BODY_LIMIT): Promise<unknown> {
  const declared = Number(getRequestHeader(event, 'content-length') ?? 0)
  if (declared > limit) throw tooLarge(limit)
  const raw = await readRawBody(event, 'utf8')
  if (raw && Buffer.byteLength(raw, 'utf8') > limit) throw tooLarge(limit)
  if (!raw || raw.trim() === '') {
    throw createError({ statusCode: 400, statusMessage: 'Missing body', data: { errors: [{ path: '(body)', message: 'the request has no JSON body' }] } })
  }
  try {
    return JSON.parse(raw)
  }
  catch (e) {
    throw createError({
      statusCode: 400,
      statusMessage: 'Malformed JSON',
      data: { errors: [{ path: '(body)', message: `the body is not valid JSON: ${(e as Error).message}` }] },
    })
  }
}

function tooLarge(limit: number) {
  return createError({
    statusCode: 413,
    statusMessage: 'Body too large',
    data: { errors: [{ path: '(body)', message: `the body is larger than ${Math.round(limit / 1024)} KB` }] },
  })
}
