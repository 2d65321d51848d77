/**
 * The sender loop: every POLL_MS, deliver what is due in `mail_queue` (see sendDueMail in
 * server/utils/mail.ts). Several app instances may run it against one database: each claims
 * rows with SELECT ... FOR UPDATE SKIP LOCKED, so a message goes out once. An instance with no
 * SMTP host set up sends nothing and leaves the queue to one that has.
 */
const POLL_MS = 500

export default defineNitroPlugin((nitroApp) => {
  if (import.meta.prerender) return
  if (!useRuntimeConfig().databaseUrl) return
  if (!mailConfigured()) {
    console.warn('[mail] no SMTP host (NUXT_MAIL_HOST): messages stay in the mail queue until an instance with one sends them')
    return
  }
  let timer: ReturnType<typeof setTimeout> | undefined
  let stopped = false
  let failing = false

  async function tick() {
    let again = false
    try {
      again = (await sendDueMail()) > 0
      if (failing) console.log('[mail] the mail queue is reachable again')
      failing = false
    }
    catch (error) {
      // the database away: said once, then tried again quietly until it is back
      if (!failing) console.error('[mail] could not read the mail queue:', (error as Error).message)
      failing = true
    }
    if (!stopped) timer = setTimeout(tick, again ? 0 : POLL_MS)
  }

  timer = setTimeout(tick, POLL_MS)
  nitroApp.hooks.hook('close', () => {
    stopped = true
    if (timer) clearTimeout(timer)
  })
})
