/** GET /api/banks — the signed-in user's banks (or the recently deleted ones), searched, sorted, paged. */
import { BankListQuerySchema } from '#shared/schemas/banks'
import { listBanks } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  return listBanks(owner, queryWith(event, BankListQuerySchema))
})
