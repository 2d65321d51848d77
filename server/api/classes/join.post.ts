/** POST /api/classes/join — join by the class's code or an invitation link's token. */
import { ClassJoinSchema } from '#shared/schemas/classes'
import { joinClass } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const user = await requireRole(event, ...MEMBER_ROLES)
  const body = await readBodyWith(event, ClassJoinSchema)
  return joinClass(user, body)
})
