/** POST /api/banks — save a new bank: 201 with its id and version 1. */
import { BankCreateSchema } from '#shared/schemas/banks'
import { createBank } from '~~/server/services/banks'

export default defineEventHandler(async (event) => {
  const owner = await requireRole(event, ...BANK_ROLES)
  const { data, raw } = await readBodyAndRaw(event, BankCreateSchema)
  // the document is kept as sent (validated, but without the schema's defaults filled in)
  const created = await createBank(owner, data.name, raw.document as Record<string, unknown>)
  setResponseStatus(event, 201)
  return created
})
