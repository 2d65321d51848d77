/** POST /api/banks/[id]/share — a read-only link to the bank: 201 with its token and url. */
import { idParams } from '#shared/schemas/params'
import { shareBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  const link = await shareBank(owner, id)
  setResponseStatus(event, 201)
  return link
})
