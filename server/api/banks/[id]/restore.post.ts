/** POST /api/banks/[id]/restore — bring back a recently deleted bank. */
import { idParams } from '#shared/schemas/params'
import { restoreBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  return restoreBank(owner, id)
})
