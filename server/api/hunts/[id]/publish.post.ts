/** POST /api/hunts/[id]/publish — publish to some of the instructor's classes; each student is mailed. */
import { HuntPublishSchema } from '#shared/schemas/hunts'
import { idParams } from '#shared/schemas/params'
import { publishHunt } from '~~/server/services/hunts'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const { classIds } = await readBodyWith(event, HuntPublishSchema)
  return publishHunt(instructor, id, classIds)
})
