/** PATCH /api/account — the signed-in user's name, or password (with the current one). */
import { AccountPatchSchema } from '#shared/schemas/account'
import { updateAccount, userNotice } from '~~/server/services/accounts'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event)
  const body = await readBodyWith(event, AccountPatchSchema)
  return userNotice(await updateAccount(event, user, body))
})
