/** GET /api/banks/[id] — one of the user's banks with its document. */
import { idParams } from '#shared/schemas/params'
import { bankDetail } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  return bankDetail(await requireBankOwner(owner, id))
})
