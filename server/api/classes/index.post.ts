/** POST /api/classes — an instructor makes a class: 201 with its roster (empty) and join code. */
import { ClassCreateSchema } from '#shared/schemas/classes'
import { createClass } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const body = await readBodyWith(event, ClassCreateSchema)
  const created = await createClass(instructor, body)
  setResponseStatus(event, 201)
  return created
})
