/** The development outbox: what the local mail catcher (scripts/mail-catcher.mjs) captured. */
import { readdir, readFile } from 'node:fs/promises'
import { join } from 'node:path'
import type { OutboxMessage } from '#shared/schemas/account'

/** The catcher's directory, or '' when the outbox is off (production: runtime config `devOutboxDir` unset). */
export function outboxDir(): string {
  return String(useRuntimeConfig().devOutboxDir || '')
}

export async function readOutbox(limit = 100): Promise<OutboxMessage[]> {
  const dir = outboxDir()
  const names = (await readdir(dir).catch(() => [] as string[])).filter(name => name.endsWith('.json')).sort().reverse().slice(0, limit)
  const messages: OutboxMessage[] = []
  for (const name of names) {
    try {
      messages.push(JSON.parse(await readFile(join(dir, name), 'utf8')) as OutboxMessage)
    }
    catch { /* removed or unreadable meanwhile */ }
  }
  return messages
}
