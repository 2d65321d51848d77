// A stand-in for the mail service in development and tests: an SMTP server on 127.0.0.1 that
// accepts every message and keeps it as a JSON file in a directory, where the app's
// development outbox (GET /api/admin/outbox) and the tests read it.
//   node scripts/mail-catcher.mjs [port] [dir]     (2525 and .data/outbox by default)
// Imported by start.mjs and test.mjs after `npm ci` (it needs smtp-server and mailparser).
import { mkdirSync, renameSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { SMTPServer } from 'smtp-server'
import { simpleParser } from 'mailparser'

const MAX_MESSAGE_BYTES = 2 * 1024 * 1024

function addresses(field) {
  if (!field) return []
  const list = Array.isArray(field) ? field : [field]
  return list.flatMap(group => group.value.map(entry => entry.address)).filter(Boolean)
}

/** Start the catcher; resolves to { port, dir, stop() }. Port 0 picks a free one. */
export async function startMailCatcher({ port = 2525, dir }) {
  mkdirSync(dir, { recursive: true })
  const server = new SMTPServer({
    name: 'phaseloom-mail-catcher',
    banner: 'Phaseloom development mail catcher: nothing leaves this machine',
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    size: MAX_MESSAGE_BYTES,
    logger: false,
    onAuth(auth, session, callback) {
      callback(null, { user: auth.username || 'anyone' })
    },
    onData(stream, session, callback) {
      simpleParser(stream)
        .then((mail) => {
          const receivedAt = new Date()
          const id = `${receivedAt.getTime()}-${randomBytes(4).toString('hex')}`
          const message = {
            id,
            receivedAt: receivedAt.toISOString(),
            from: mail.from?.text ?? session.envelope.mailFrom?.address ?? '',
            to: addresses(mail.to).length ? addresses(mail.to) : session.envelope.rcptTo.map(r => r.address),
            subject: mail.subject ?? '',
            text: mail.text ?? '',
            html: typeof mail.html === 'string' ? mail.html : '',
          }
          // written whole, then renamed, so a reader never sees half a file
          const file = join(dir, `${id}.json`)
          writeFileSync(`${file}.part`, JSON.stringify(message, null, 2))
          renameSync(`${file}.part`, file)
          callback()
        })
        .catch(error => callback(error))
    },
  })
  await new Promise((resolveListen, reject) => {
    server.once('error', reject)
    server.listen(port, '127.0.0.1', () => {
      server.off('error', reject)
      resolveListen()
    })
  })
  server.on('error', error => console.error('[mail-catcher]', error.message))
  const actualPort = server.server.address().port
  return {
    port: actualPort,
    dir,
    stop: () => new Promise(resolveClose => server.close(() => resolveClose())),
  }
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const port = Number(process.argv[2] ?? 2525)
  const dir = resolve(process.argv[3] ?? join(fileURLToPath(new URL('..', import.meta.url)), '.data', 'outbox'))
  const catcher = await startMailCatcher({ port, dir })
  console.log(`Mail catcher on 127.0.0.1:${catcher.port}, messages in ${dir}`)
}
