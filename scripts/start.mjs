// `npm start`: everything needed to run Phaseloom locally, then serve it.
//   PORT     the app's port (3000)
//   DB_PORT  the private MariaDB's port on 127.0.0.1 (33306)
import { join } from 'node:path'
import { ensureMariaDB, DEFAULT_PORT } from './db.mjs'
import { buildIfStale, ensureNodeModules, root, sessionPassword, startServer } from './setup.mjs'

ensureNodeModules()
// These need the packages npm ci just installed.
const { migrateDatabase } = await import('./migrate.mjs')
const { databaseIsEmpty, seedDemo, DEMO_PEOPLE, DEMO_PASSWORD } = await import('./seed.mjs')

const port = Number(process.env.PORT ?? 3000)
const dbPort = Number(process.env.DB_PORT ?? DEFAULT_PORT)

const db = await ensureMariaDB({ dataDir: join(root, '.data', 'mariadb'), port: dbPort })
let server
let stopping = false
async function shutdown(code = 0) {
  if (stopping) return
  stopping = true
  console.log('\nStopping Phaseloom and its database...')
  await server?.stop()
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
  await buildIfStale()

  server = await startServer({
    port,
    env: { NUXT_DATABASE_URL: db.url, NUXT_SESSION_PASSWORD: password },
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
