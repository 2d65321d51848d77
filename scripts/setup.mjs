// Steps shared by start.mjs and test.mjs. Node built-ins only.
import { spawn, spawnSync } from 'node:child_process'
import { createWriteStream, existsSync, mkdirSync, readFileSync, readdirSync, statSync, writeFileSync } from 'node:fs'
import { randomBytes } from 'node:crypto'
import { join } from 'node:path'
import { setTimeout as sleep } from 'node:timers/promises'
import { fileURLToPath } from 'node:url'

export const root = fileURLToPath(new URL('..', import.meta.url))
export const bin = name => join(root, 'node_modules', '.bin', name)
export const serverEntry = join(root, '.output', 'server', 'index.mjs')

/** Run a command in the repo, output to our terminal; resolves to its exit code. */
export function runInherit(command, args, { env = process.env } = {}) {
  return new Promise((resolveCode) => {
    const child = spawn(command, args, { cwd: root, stdio: 'inherit', env })
    child.once('exit', code => resolveCode(code ?? 1))
    child.once('error', () => resolveCode(1))
  })
}

/** `npm ci` when node_modules is missing (a fresh clone). */
export function ensureNodeModules(log = console.log) {
  if (existsSync(join(root, 'node_modules', '.bin', 'nuxt'))) return
  log('node_modules is missing: running npm ci')
  const result = spawnSync('npm', ['ci'], { cwd: root, stdio: 'inherit' })
  if (result.status !== 0) {
    console.error('npm ci failed')
    process.exit(1)
  }
}

// Everything the build reads. A change to any of these makes the build stale.
const buildInputs = ['app', 'server', 'shared', 'public', 'nuxt.config.ts', 'app.config.ts',
  'tailwind.config.ts', 'tsconfig.json', 'package.json', 'package-lock.json']

function newestMtime(path) {
  if (!existsSync(path)) return 0
  const stat = statSync(path)
  if (!stat.isDirectory()) return stat.mtimeMs
  let newest = stat.mtimeMs
  for (const entry of readdirSync(path)) {
    if (entry === 'node_modules' || entry.startsWith('.')) continue
    newest = Math.max(newest, newestMtime(join(path, entry)))
  }
  return newest
}

/** True when .output is missing or older than any source file. */
export function buildIsStale() {
  const marker = join(root, '.output', 'nitro.json')
  if (!existsSync(marker) || !existsSync(serverEntry)) return true
  const builtAt = statSync(marker).mtimeMs
  return buildInputs.some(input => newestMtime(join(root, input)) > builtAt)
}

export async function buildIfStale({ force = false, log = console.log } = {}) {
  if (!force && !buildIsStale()) {
    log('Build is up to date (.output is newer than the sources).')
    return
  }
  log('Building the app (nuxt build)...')
  const code = await runInherit(bin('nuxt'), ['build'])
  if (code !== 0) {
    console.error(`nuxt build failed (exit ${code})`)
    process.exit(1)
  }
}

/** NUXT_SESSION_PASSWORD from the environment, else from .data/, else made once and kept there. */
export function sessionPassword() {
  if (process.env.NUXT_SESSION_PASSWORD) return process.env.NUXT_SESSION_PASSWORD
  const file = join(root, '.data', 'session-password')
  if (existsSync(file)) {
    const saved = readFileSync(file, 'utf8').trim()
    if (saved.length >= 32) return saved
  }
  mkdirSync(join(root, '.data'), { recursive: true })
  const made = randomBytes(32).toString('hex')
  writeFileSync(file, `${made}\n`, { mode: 0o600 })
  return made
}

/**
 * Start the built server (`node .output/server/index.mjs`) and wait until /api/health
 * answers. `logFile` takes its output; without it, output goes to our terminal. `nodeArgs` go
 * to node before the entry (e.g. `--cpu-prof`).
 */
export async function startServer({ port, env, logFile, timeoutMs = 60_000, nodeArgs = [] }) {
  let stdio = 'inherit'
  let logStream
  if (logFile) {
    logStream = createWriteStream(logFile, { flags: 'a' })
    await new Promise(resolveOpen => logStream.once('open', resolveOpen))
    stdio = ['ignore', logStream, logStream]
  }
  const child = spawn(process.execPath, [...nodeArgs, serverEntry], {
    cwd: root,
    stdio,
    env: { ...process.env, ...env, PORT: String(port), NITRO_PORT: String(port) },
  })
  let exited = false
  child.once('exit', () => { exited = true })
  const baseURL = `http://127.0.0.1:${port}`
  const deadline = Date.now() + timeoutMs
  for (;;) {
    if (exited) throw new Error(`The server exited while starting${logFile ? ` (see ${logFile})` : ''}`)
    try {
      const response = await fetch(`${baseURL}/api/health`)
      if (response.ok) break
    }
    catch { /* not listening yet */ }
    if (Date.now() > deadline) {
      child.kill('SIGKILL')
      throw new Error(`The server did not become healthy within ${timeoutMs} ms`)
    }
    await sleep(200)
  }
  async function stop() {
    if (!exited) {
      child.kill('SIGTERM')
      const killAt = Date.now() + 10_000
      while (!exited && Date.now() < killAt) await sleep(50)
      if (!exited) child.kill('SIGKILL')
      while (!exited) await sleep(50)
    }
    logStream?.end()
  }
  return { baseURL, child, stop, exited: () => exited }
}
