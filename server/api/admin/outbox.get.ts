/**
 * GET /api/admin/outbox — the messages the development mail catcher captured, newest first.
 * Absent (404 for everyone) unless runtime config `devOutboxDir` is set, as `npm start` and
 * `npm test` do; a production server leaves it unset.
 */
import { outboxDir, readOutbox } from '~~/server/services/outbox'

export default defineEventHandler(async (event) => {
  if (!outboxDir()) throw createError({ statusCode: 404, statusMessage: 'Page not found' })
  await requireRole(event, 'admin')
  return { items: await readOutbox() }
})
