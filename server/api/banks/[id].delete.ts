/** DELETE /api/banks/[id] — move to "recently deleted" (restorable for 30 days). */
import { idParams } from '#shared/schemas/params'
import { softDeleteBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  await softDeleteBank(owner, id)
  setResponseStatus(event, 204)
  return null
})
