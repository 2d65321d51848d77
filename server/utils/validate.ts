import type { H3Event } from 'h3'
import type { z } from 'zod'
import { circuitErrorsFrom } from '#shared/circuit/parse'

export interface FieldError {
  path: string
  message: string
}

/** A 400 whose data names every field at fault, as the forms expect. */
export function invalidInput(errors: FieldError[], statusMessage = 'Invalid input') {
  return createError({ statusCode: 400, statusMessage, data: { errors } })
}

function parseWith<S extends z.ZodType>(schema: S, input: unknown, statusMessage: string, prefix = ''): z.output<S> {
  const result = schema.safeParse(input)
  if (result.success) return result.data
  const errors = circuitErrorsFrom(result.error).map(e => ({
    path: prefix ? (e.path === '(document)' ? prefix : `${prefix}.${e.path}`) : e.path === '(document)' ? '(body)' : e.path,
    message: e.message,
  }))
  throw invalidInput(errors, statusMessage)
}

/** The JSON body (256 KB at most: 413 past it), validated: 400 naming each field otherwise. */
export async function readBodyWith<S extends z.ZodType>(event: H3Event, schema: S): Promise<z.output<S>> {
  return (await readBodyAndRaw(event, schema)).data
}

/**
 * Like readBodyWith, but also hands back the body as it came: a saved bank keeps the
 * document exactly as the editor sent it, not with the schema's defaults filled in.
 */
export async function readBodyAndRaw<S extends z.ZodType>(event: H3Event, schema: S): Promise<{ data: z.output<S>, raw: Record<string, unknown> }> {
  const raw = await readJsonBody(event)
  if (typeof raw !== 'object' || raw === null || Array.isArray(raw)) {
    throw invalidInput([{ path: '(body)', message: 'the body must be a JSON object' }], 'Invalid body')
  }
  return { data: parseWith(schema, raw, 'Invalid body'), raw: raw as Record<string, unknown> }
}

/** The query string, validated: 400 naming the parameter otherwise. */
export function queryWith<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseWith(schema, getQuery(event), 'Invalid query')
}

/** The route parameters, validated: 400 naming the parameter otherwise. */
export function paramsWith<S extends z.ZodType>(event: H3Event, schema: S): z.output<S> {
  return parseWith(schema, getRouterParams(event, { decode: true }), 'Invalid address')
}
