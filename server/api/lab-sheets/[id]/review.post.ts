/** POST /api/lab-sheets/[id]/review — the class instructor accepts or sends back; the student is mailed. */
import { LabSheetReviewSchema } from '#shared/schemas/lab-sheets'
import { idParams } from '#shared/schemas/params'
import { reviewSheet } from '~~/server/services/lab-sheets'

export default defineEventHandler(async (event) => {
  const instructor = await requireRole(event, 'instructor')
  const { id } = paramsWith(event, idParams)
  const { verdict, comment } = await readBodyWith(event, LabSheetReviewSchema)
  return reviewSheet(instructor, id, verdict, comment)
})
