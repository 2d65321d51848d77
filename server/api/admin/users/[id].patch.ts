/** PATCH /api/admin/users/[id] — change a user's role or switch them off (signs them out). */
import { AdminUserPatchSchema } from '#shared/schemas/account'
import { idParams } from '#shared/schemas/params'
import { changeUser } from '~~/server/services/admin'

export default defineEventHandler(async (event) => {
  const admin = await requireRole(event, 'admin')
  const { id } = paramsWith(event, idParams)
  const body = await readBodyWith(event, AdminUserPatchSchema)
  return changeUser(admin, id, body)
})
