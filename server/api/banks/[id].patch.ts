/** PATCH /api/banks/[id] — rename and/or save a document, if `version` is still current (else 409). */
import { BankPatchSchema } from '#shared/schemas/banks'
import { idParams } from '#shared/schemas/params'
import { updateBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { id } = paramsWith(event, idParams)
  const { data, raw } = await readBodyAndRaw(event, BankPatchSchema)
  // the document is kept as sent (validated, but without the schema's defaults filled in)
  return updateBank(owner, id, { name: data.name, version: data.version, document: raw.document as Record<string, unknown> | undefined })
})
