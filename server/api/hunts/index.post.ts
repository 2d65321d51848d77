/** POST /api/hunts — a hunt from one of the instructor's banks, with its hidden faults (201). */
import { HuntCreateSchema } from '#shared/schemas/hunts'
import { createHunt } from '~~/server/services/hunts'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const body = await readBodyWith(event, HuntCreateSchema)
  const hunt = await createHunt(instructor, body)
  setResponseStatus(event, 201)
  return hunt
})
