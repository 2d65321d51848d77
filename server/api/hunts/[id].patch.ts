/** PATCH /api/hunts/[id] — change the settings; the faults only until a student starts. */
import { HuntPatchSchema } from '#shared/schemas/hunts'
import { idParams } from '#shared/schemas/params'
import { updateHunt } from '~~/server/services/hunts'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const change = await readBodyWith(event, HuntPatchSchema)
  return updateHunt(instructor, id, change)
})
