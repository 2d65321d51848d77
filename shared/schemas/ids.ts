/** The one rule for a database id and for a link's token, used by every schema that takes one. */
import { z } from 'zod'

/** MariaDB's INT: the largest id a table of ours can hold. */
export const MAX_ID = 2_147_483_647

/** An id in a JSON body: a positive whole number ("classId must be an id", "classId is out of range"). */
export function idField(field: string, mustBe = `${field} must be an id`) {
  return z.number({ error: mustBe }).int({ error: mustBe }).positive({ error: mustBe }).max(MAX_ID, { error: `${field} is out of range` })
}

/** An id in a route parameter or a query string: text read as a positive whole number. */
export function idParam(field: string, mustBe = `${field} must be a whole number`) {
  return z.coerce.number({ error: mustBe }).int({ error: mustBe }).positive({ error: mustBe }).max(MAX_ID, { error: `${field} is out of range` })
}

/** The random token of a mailed link (an invitation, a reset): URL-safe base64. */
export const linkToken = z
  .string({ error: 'token must be text' })
  .min(20, { error: 'the link is incomplete' })
  .max(100, { error: 'the link is not valid' })
  .regex(/^[A-Za-z0-9_-]+$/, { error: 'the link is not valid' })
