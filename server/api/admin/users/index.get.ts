/** GET /api/admin/users — people, searchable by name or e-mail, filtered by role, paged. */
import { AdminUsersQuerySchema } from '#shared/schemas/account'
import { listUsers } from '~~/server/services/admin'

export default defineEventHandler(async (event) => {
  await requireRole(event, 'admin')
  return listUsers(queryWith(event, AdminUsersQuerySchema))
})
