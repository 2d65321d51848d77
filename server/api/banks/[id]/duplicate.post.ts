/** POST /api/banks/[id]/duplicate — a copy named "Copy of …": 201 with its id and version. */
import { idParams } from '#shared/schemas/params'
import { duplicateBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  const copy = await duplicateBank(owner, id)
  setResponseStatus(event, 201)
  return copy
})
