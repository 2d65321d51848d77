// Finding and installing the Debian packages the two commands need (MariaDB, ngspice,
// Chromium, poppler-utils): node built-ins only.
import { spawnSync } from 'node:child_process'
import { accessSync, constants } from 'node:fs'
import { delimiter, join } from 'node:path'

/** Where an executable lives on PATH (plus the sbin dirs Debian puts mariadbd in), or null. */
export function findExecutable(name) {
  const dirs = [...(process.env.PATH ?? '').split(delimiter), '/usr/sbin', '/usr/local/sbin', '/sbin']
  for (const dir of dirs) {
    if (!dir) continue
    const candidate = join(dir, name)
    try {
      accessSync(candidate, constants.X_OK)
      return candidate
    }
    catch { /* keep looking */ }
  }
  return null
}

export function isRoot() {
  return typeof process.getuid === 'function' && process.getuid() === 0
}

/**
 * Install Debian packages when a command is missing. As root it runs apt-get (and
 * `apt-get update` first if the plain install fails); otherwise it prints the exact
 * command and exits 1.
 */
export function ensureAptPackage({ command, pkg, log = console.log }) {
  if (findExecutable(command)) return
  const installCommand = `apt-get install -y ${pkg}`
  if (!isRoot()) {
    console.error(`\`${command}\` is missing. Install it with:\n\n  sudo apt-get update && sudo ${installCommand}\n`)
    process.exit(1)
  }
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  log(`\`${command}\` is missing: running ${installCommand}`)
  let result = spawnSync('apt-get', ['install', '-y', pkg], { stdio: 'inherit', env })
  if (result.status !== 0) {
    log('apt-get install failed: running apt-get update and trying again')
    spawnSync('apt-get', ['update'], { stdio: 'inherit', env })
    result = spawnSync('apt-get', ['install', '-y', pkg], { stdio: 'inherit', env })
  }
  if (result.status !== 0 || !findExecutable(command)) {
    console.error(`Could not install ${pkg} (apt-get exited ${result.status}).`)
    process.exit(1)
  }
}

