import nodemailer, { type Transporter } from 'nodemailer'
import { and, eq, inArray, isNull, lt, lte, sql } from 'drizzle-orm'

let transport: Transporter | undefined

export interface Mail {
  to: string
  subject: string
  text: string
  html: string
}

type Inserter = Pick<ReturnType<typeof useDB>, 'insert'>

/**
 * Puts a message in the queue (table `mail_queue`); the sender loop (server/plugins/mail-sender.ts)
 * delivers it. No request waits for the mail service, so neither an answer nor its timing says
 * whether a message was sent. `db` may be the caller's transaction: the message is then queued
 * only if the rest commits.
 */
export async function queueMail(mail: Mail, db: Inserter = useDB()): Promise<void> {
  await db.insert(tables.mailQueue).values({ message: { to: mail.to, subject: mail.subject, text: mail.text, html: mail.html } })
}

/** True when an SMTP host is set up (runtime config `mail.host`); without one, queued mail waits. */
export function mailConfigured(): boolean {
  return Boolean(useRuntimeConfig().mail.host)
}

/**
 * Sends a message over SMTP (runtime config `mail`: host, port, secure, user, password, from).
 * Only the sender loop calls this. In development and tests the host is the local mail catcher
 * that `npm start` and `npm test` run (scripts/mail-catcher.mjs).
 */
export async function deliverMail(mail: Mail): Promise<void> {
  const config = useRuntimeConfig().mail
  if (!config.host) throw new Error('mail is not set up: set NUXT_MAIL_HOST (and NUXT_MAIL_PORT, NUXT_MAIL_USER, NUXT_MAIL_PASSWORD)')
  transport ??= nodemailer.createTransport({
    host: config.host,
    port: Number(config.port),
    secure: String(config.secure) === 'true',
    auth: config.user ? { user: config.user, pass: config.password } : undefined,
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 20_000,
  })
  await transport.sendMail({ from: config.from, ...mail })
}

/** Tries per message before it is left in the queue, unsent, with its last error. */
export const MAIL_MAX_ATTEMPTS = 8
/** How long a claimed message is held by the instance sending it; after that (it crashed) another may. */
const CLAIM_SECONDS = 120

/** Seconds to wait before try number `attempts + 1`: 10 s, 20 s, 40 s ... up to an hour. */
export function mailBackoffSeconds(attempts: number): number {
  return Math.min(3600, 10 * 2 ** Math.max(0, attempts - 1))
}

interface Claimed { id: number, message: Mail, attempts: number }

/**
 * Claims up to `limit` due messages for this instance: SELECT ... FOR UPDATE SKIP LOCKED
 * (MariaDB 10.6+) skips rows another instance is claiming at that moment, and the claim moves
 * each row's next_attempt_at past CLAIM_SECONDS, so no other instance takes it while it is sent.
 * READ COMMITTED: InnoDB then locks only the rows read, not the gaps between them, so a request
 * queueing a message never waits for (or deadlocks with) a sender's claim.
 */
async function claimDueMail(limit: number): Promise<Claimed[]> {
  const { mailQueue } = tables
  return useDB().transaction(async (tx) => {
    const rows = await tx.select({ id: mailQueue.id, message: mailQueue.message, attempts: mailQueue.attempts })
      .from(mailQueue)
      .where(and(isNull(mailQueue.sentAt), lte(mailQueue.nextAttemptAt, sql`NOW(3)`), lt(mailQueue.attempts, MAIL_MAX_ATTEMPTS)))
      .orderBy(mailQueue.id)
      .limit(limit)
      .for('update', { skipLocked: true })
    if (rows.length === 0) return []
    await tx.update(mailQueue)
      .set({ attempts: sql`${mailQueue.attempts} + 1`, nextAttemptAt: sql`NOW(3) + INTERVAL ${CLAIM_SECONDS} SECOND` })
      .where(inArray(mailQueue.id, rows.map(r => r.id)))
    return rows.map(r => ({ id: r.id, message: r.message as unknown as Mail, attempts: r.attempts + 1 }))
  }, { isolationLevel: 'read committed' })
}

/** Sends what is due; resolves to the number of messages claimed (a full batch means: look again at once). */
export async function sendDueMail(limit = 10): Promise<number> {
  const { mailQueue } = tables
  const claimed = await claimDueMail(limit)
  for (const item of claimed) {
    try {
      await deliverMail(item.message)
      await useDB().update(mailQueue).set({ sentAt: sql`NOW(3)`, lastError: null }).where(eq(mailQueue.id, item.id))
    }
    catch (error) {
      const message = (error as Error).message.slice(0, 1000)
      const giveUp = item.attempts >= MAIL_MAX_ATTEMPTS
      console.error(`[mail] message ${item.id} not sent (try ${item.attempts} of ${MAIL_MAX_ATTEMPTS}${giveUp ? ', giving up' : ''}): ${message}`)
      await useDB().update(mailQueue)
        .set({ lastError: message, nextAttemptAt: sql`NOW(3) + INTERVAL ${mailBackoffSeconds(item.attempts)} SECOND` })
        .where(eq(mailQueue.id, item.id))
    }
  }
  return claimed.length
}

/** Escapes text for the HTML part of a message. */
export function escapeHtml(text: string): string {
  return text.replace(/[&<>"']/g, c => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', '\'': '&#39;' })[c]!)
}
