/** GET /api/shared/[token] — a shared bank's name and document, for anyone with the link. */
import { tokenParams } from '#shared/schemas/params'
import { sharedBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const { token } = paramsWith(event, tokenParams)
  return sharedBank(token)
})
