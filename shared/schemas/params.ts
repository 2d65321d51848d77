/** Route parameters shared by the routes that take them. */
import { z } from 'zod'

export const idParams = z.object({
  id: z.coerce.number({ error: 'id must be a whole number' }).int({ error: 'id must be a whole number' }).positive({ error: 'id must be a whole number' }).max(2_147_483_647, { error: 'id is out of range' }),
})
export const tokenParams = z.object({
  token: z.string().min(20, { error: 'the link is incomplete' }).max(100, { error: 'the link is not valid' }).regex(/^[A-Za-z0-9_-]+$/, { error: 'the link is not valid' }),
})
