// `npm start`: everything needed to run Phaseloom locally, then serve it.
//   PORT     the app's port (3000)
//   DB_PORT  the private MariaDB's port on 127.0.0.1 (33306)
//   MAIL_PORT  the local mail catcher's SMTP port on 127.0.0.1 (2525); messages in .data/outbox
import { join } from 'node:path'
import { ensureMariaDB, DEFAULT_PORT } from './db.mjs'
import { buildIfStale, ensureNodeModules, root, sessionPassword, startServer } from './setup.mjs'

ensureNodeModules()
// These need the packages npm ci just installed.
const { migrateDatabase } = await import('./migrate.mjs')
const { databaseIsEmpty, seedDemo, DEMO_PEOPLE, DEMO_PASSWORD } = await import('./seed.mjs')
const { startMailCatcher } = await import('./mail-catcher.mjs')

const port = Number(process.env.PORT ?? 3000)
const dbPort = Number(process.env.DB_PORT ?? DEFAULT_PORT)
const mailPort = Number(process.env.MAIL_PORT ?? 2525)

const db = await ensureMariaDB({ dataDir: join(root, '.data', 'mariadb'), port: dbPort })
let server
let mail
let stopping = false
async function shutdown(code = 0) {
  if (stopping) return
  stopping = true
  console.log('\nStopping Phaseloom and its database...')
  await server?.stop()
  await mail?.stop()
  await db.stop()
  process.exit(code)
}
process.on('SIGINT', () => shutdown(0))
process.on('SIGTERM', () => shutdown(0))
process.on('SIGHUP', () => shutdown(0))

try {
  console.log(`MariaDB ready on 127.0.0.1:${dbPort} (data in .data/mariadb)`)
  await migrateDatabase(db.url)
  console.log('Migrations applied.')
  if (await databaseIsEmpty(db.url)) {
    await seedDemo(db.url)
    console.log('Empty database: demo scenario seeded.')
  }
  const password = sessionPassword()
  mail = await startMailCatcher({ port: mailPort, dir: join(root, '.data', 'outbox') })
  console.log(`Mail catcher on 127.0.0.1:${mail.port} (messages in .data/outbox, shown at /admin/outbox)`)
  await buildIfStale()

  server = await startServer({
    port,
    env: {
      NUXT_DATABASE_URL: db.url,
      NUXT_SESSION_PASSWORD: password,
      NUXT_MAIL_HOST: '127.0.0.1',
      NUXT_MAIL_PORT: String(mail.port),
      NUXT_DEV_OUTBOX_DIR: mail.dir,
      NUXT_PUBLIC_BASE_URL: process.env.NUXT_PUBLIC_BASE_URL ?? `http://localhost:${port}`,
      // plain HTTP here: a Secure cookie would not come back from every browser
      NUXT_SESSION_COOKIE_SECURE: process.env.NUXT_SESSION_COOKIE_SECURE ?? 'false',
    },
  })
  server.child.once('exit', (code) => {
    // On Ctrl-C the terminal signals the server too; give our own SIGINT handler a moment.
    setTimeout(() => {
      if (stopping) return
      console.error(`The server stopped (exit ${code}).`)
      shutdown(code || 1)
    }, 300)
  })

  const width = Math.max(...DEMO_PEOPLE.map(person => person.email.length))
  console.log(`
Phaseloom is running at http://localhost:${port}

Demo sign-ins (development only), password "${DEMO_PASSWORD}":
${DEMO_PEOPLE.map(person => `  ${person.email.padEnd(width)}  ${person.role.padEnd(12)} ${person.name}, ${person.about}`).join('\n')}

Ctrl-C stops the app and the database.`)
}
catch (error) {
  console.error(error instanceof Error ? error.message : error)
  await shutdown(1)
}
