/** DELETE /api/banks/[id]/share — revoke the read-only link. */
import { idParams } from '#shared/schemas/params'
import { unshareBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  await unshareBank(owner, id)
  setResponseStatus(event, 204)
  return null
})
