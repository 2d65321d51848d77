// Runs a netlist through ngspice in batch mode and reads back the printed vectors.
import { execFileSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

export function ngspiceAvailable(): boolean {
  try {
    execFileSync('ngspice', ['--version'], { stdio: 'ignore' })
    return true
  } catch {
    return false
  }
}

/** Every `name = value` line ngspice printed, keyed by the vector name in lower case. */
export function runNgspice(netlist: string): Map<string, number> {
  const dir = mkdtempSync(join(tmpdir(), 'phaseloom-spice-'))
  try {
    const file = join(dir, 'circuit.cir')
    writeFileSync(file, netlist)
    const out = execFileSync('ngspice', ['-b', file], { encoding: 'utf8', stdio: ['ignore', 'pipe', 'pipe'] })
    const values = new Map<string, number>()
    for (const m of out.matchAll(/^(\S+) = (\S+)$/gm)) values.set(m[1]!.toLowerCase(), Number(m[2]))
    return values
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}
