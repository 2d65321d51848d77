// `npm test`: set up everything on a throwaway database and port, build once, type-check,
// then run every vitest project against one built server. Ends with vitest's summary;
// exits non-zero when the type check or any test fails.
//   npm test -- --project unit     extra arguments go to `vitest run`
//   PHASELOOM_REBUILD=1 npm test   build even when .output looks up to date
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ensureAptPackage, ensureMariaDB, freePort } from './db.mjs'
import { bin, buildIfStale, ensureNodeModules, root, runInherit, startServer } from './setup.mjs'

const step = message => console.log(`\n▸ ${message}`)

ensureNodeModules()
const { migrateDatabase } = await import('./migrate.mjs')
const { seedDemo } = await import('./seed.mjs')

ensureAptPackage({ command: 'ngspice', pkg: 'ngspice' })
if (!existsSync('/usr/bin/chromium')) ensureAptPackage({ command: 'chromium', pkg: 'chromium' })

const scratch = mkdtempSync(join(tmpdir(), 'phaseloom-test-'))
const resultsDir = join(root, 'test-results')
mkdirSync(resultsDir, { recursive: true })
const sessionPassword = 'phaseloom-test-session-password-not-secret-0123456789'

let db
let server
async function cleanUp() {
  await server?.stop().catch(() => {})
  await db?.stop().catch(() => {})
  rmSync(scratch, { recursive: true, force: true })
}
process.on('SIGINT', async () => { await cleanUp(); process.exit(130) })
process.on('SIGTERM', async () => { await cleanUp(); process.exit(143) })

let exitCode = 0
try {
  step('MariaDB on a throwaway data dir')
  db = await ensureMariaDB({ dataDir: join(scratch, 'mariadb'), port: await freePort() })
  await migrateDatabase(db.url)
  await seedDemo(db.url)
  console.log(`MariaDB ready on 127.0.0.1:${db.port}, migrated and seeded`)

  step('Build')
  await buildIfStale({ force: process.env.PHASELOOM_REBUILD === '1' })

  step('Type check (nuxi typecheck)')
  const typecheckCode = await runInherit(bin('nuxi'), ['typecheck'])
  if (typecheckCode !== 0) {
    console.error(`Type check failed (exit ${typecheckCode}); running the tests anyway.`)
    exitCode = 1
  }
  else {
    console.log('Type check passed.')
  }

  step('Built server')
  const serverLog = join(resultsDir, 'server.log')
  rmSync(serverLog, { force: true })
  server = await startServer({
    port: await freePort(),
    env: { NUXT_DATABASE_URL: db.url, NUXT_SESSION_PASSWORD: sessionPassword },
    logFile: serverLog,
  })
  console.log(`Serving ${server.baseURL} (log: test-results/server.log)`)

  step('vitest run')
  const vitestCode = await runInherit(bin('vitest'), ['run', ...process.argv.slice(2)], {
    env: {
      ...process.env,
      PHASELOOM_BASE_URL: server.baseURL,
      PHASELOOM_DATABASE_URL: db.url,
      PHASELOOM_TEST_TMP: scratch,
      NUXT_SESSION_PASSWORD: sessionPassword,
    },
  })
  if (vitestCode !== 0) exitCode = vitestCode
}
catch (error) {
  console.error(error instanceof Error ? error.stack : error)
  exitCode = 1
}
finally {
  await cleanUp()
}
process.exit(exitCode)
