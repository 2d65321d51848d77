// `npm test`: set up everything on a throwaway database and port, build once, type-check,
// then run every vitest project against one built server. Ends with vitest's summary;
// exits non-zero when the type check or any test fails.
//   npm test -- --project unit     extra arguments go to `vitest run`
//   PHASELOOM_REBUILD=1 npm test   build even when .output looks up to date
import { existsSync, mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ensureAptPackage } from './apt.mjs'
import { ensureMariaDB, freePort } from './db.mjs'
import { bin, buildIfStale, ensureNodeModules, root, runInherit, startServer } from './setup.mjs'

const step = message => console.log(`\n▸ ${message}`)

ensureNodeModules()
const { migrateDatabase } = await import('./migrate.mjs')
const { seedDemo } = await import('./seed.mjs')
const { startMailCatcher } = await import('./mail-catcher.mjs')

ensureAptPackage({ command: 'ngspice', pkg: 'ngspice' })
// pdftotext and pdftoppm read the Site check's PDF back in the tests
ensureAptPackage({ command: 'pdftoppm', pkg: 'poppler-utils' })
ensureAptPackage({ command: 'pdftotext', pkg: 'poppler-utils' })
if (!existsSync('/usr/bin/chromium')) ensureAptPackage({ command: 'chromium', pkg: 'chromium' })

const scratch = mkdtempSync(join(tmpdir(), 'phaseloom-test-'))
const resultsDir = join(root, 'test-results')
mkdirSync(resultsDir, { recursive: true })
const sessionPassword = 'phaseloom-test-session-password-not-secret-0123456789'

let db
let server
let mail
async function cleanUp() {
  await server?.stop().catch(() => {})
  await mail?.stop().catch(() => {})
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

  step('Built server and mail catcher')
  mail = await startMailCatcher({ port: 0, dir: join(scratch, 'outbox') })
  const serverLog = join(resultsDir, 'server.log')
  rmSync(serverLog, { force: true })
  const serverPort = await freePort()
  // production settings (Secure cookie, 15-minute sign-in window) but for mail and the outbox
  const serverEnv = {
    NUXT_DATABASE_URL: db.url,
    NUXT_SESSION_PASSWORD: sessionPassword,
    NUXT_MAIL_HOST: '127.0.0.1',
    NUXT_MAIL_PORT: String(mail.port),
    NUXT_DEV_OUTBOX_DIR: mail.dir,
    NUXT_PUBLIC_BASE_URL: `http://127.0.0.1:${serverPort}`,
    NUXT_UPLOADS_DIR: join(scratch, 'uploads'),
  }
  server = await startServer({ port: serverPort, env: serverEnv, logFile: serverLog })
  console.log(`Serving ${server.baseURL} (log: test-results/server.log); mail catcher on 127.0.0.1:${mail.port}`)

  step('vitest run')
  const vitestCode = await runInherit(bin('vitest'), ['run', ...process.argv.slice(2)], {
    env: {
      ...process.env,
      PHASELOOM_BASE_URL: server.baseURL,
      PHASELOOM_DATABASE_URL: db.url,
      PHASELOOM_TEST_TMP: scratch,
      PHASELOOM_OUTBOX_DIR: mail.dir,
      PHASELOOM_UPLOADS_DIR: join(scratch, 'uploads'),
      PHASELOOM_MAIL_PORT: String(mail.port),
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
