// The command line: `npm run --silent solve -- FILE.json` and `--spice`.
import { spawnSync } from 'node:child_process'
import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'
import { solve } from '#shared/engine'

const root = new URL('../..', import.meta.url).pathname
const example = new URL('../../examples/one-unit-series.json', import.meta.url).pathname
const run = (...args: string[]) => spawnSync('npm', ['run', '--silent', 'solve', '--', ...args], { cwd: root, encoding: 'utf8' })

// each case starts npm and tsx: seconds, more on a busy machine
describe('npm run solve', { timeout: 30_000 }, () => {
  it('prints the result of the example document as JSON, the same as the engine', () => {
    const out = run(example)
    expect(out.status).toBe(0)
    const result = JSON.parse(out.stdout)
    expect(result).toEqual(solve(JSON.parse(readFileSync(example, 'utf8'))))
    expect(result.meters.M1.volts).toBeCloseTo(240, 1) // circuit-format.md: 240.0 V ∠ 30°
    expect(result.meters.M1.degrees).toBeCloseTo(30, 1)
  })

  it('--spice prints an ngspice netlist of the same circuit', () => {
    const out = run('--spice', example)
    expect(out.status).toBe(0)
    expect(out.stdout).toMatch(/^\* Phaseloom netlist: One unit, coils in series/)
    expect(out.stdout).toContain('.control')
    expect(out.stdout).toMatch(/^K_T1_01 LC_T1_H1H2 LC_T1_X1X2 0\.999999999/m)
  })

  it('invalid input: exit 2, each error with its path on stderr, no stack trace', () => {
    const dir = mkdtempSync(join(tmpdir(), 'phaseloom-cli-'))
    const file = join(dir, 'bad.json')
    writeFileSync(file, JSON.stringify({ format: 'phaseloom.circuit', version: 1, components: [{ id: 'T1', kind: 'transformer', kva: -1, primaryVolts: 480, secondaryVolts: [120] }], wires: [['T1.X1', 'T1.X9']] }))
    const out = run(file)
    expect(out.status).toBe(2)
    expect(out.stdout).toBe('')
    expect(out.stderr).toContain('components[0].kva: kva must be greater than 0')
    expect(out.stderr).toContain('wires[0][1]: unknown terminal "T1.X9"')
    expect(out.stderr).not.toMatch(/\bat .*\.ts:\d+/)
  })

  it('a missing file or malformed JSON is exit 2 with a readable message', () => {
    const missing = run('/nonexistent/bank.json')
    expect(missing.status).toBe(2)
    expect(missing.stderr).toMatch(/cannot read .*no such file/)
    const dir = mkdtempSync(join(tmpdir(), 'phaseloom-cli-'))
    writeFileSync(join(dir, 'broken.json'), '{ "format": ')
    const broken = run(join(dir, 'broken.json'))
    expect(broken.status).toBe(2)
    expect(broken.stderr).toMatch(/not valid JSON/)
  })
})
