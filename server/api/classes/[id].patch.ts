/** PATCH /api/classes/[id] — rename, change the term or the lab-sheet tolerance. */
import { ClassPatchSchema } from '#shared/schemas/classes'
import { idParams } from '#shared/schemas/params'
import { updateClass } from '~~/server/services/classes'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const change = await readBodyWith(event, ClassPatchSchema)
  return updateClass(instructor, id, change)
})
