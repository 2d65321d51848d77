// npm run --silent solve -- FILE.json          → the engine's result as JSON on stdout
// npm run --silent solve -- --spice FILE.json  → the same circuit as an ngspice netlist
// FILE may be "-" for standard input. Invalid input: exit 2, each error with its path on stderr.
import { readFileSync } from 'node:fs'
import { parseCircuit } from '../shared/circuit/parse'
import { CircuitSolveError, solveCircuit, toSpiceNetlist } from '../shared/engine'

function fail(message: string): never {
  process.stderr.write(`${message}\n`)
  process.exit(2)
}

const args = process.argv.slice(2)
const spice = args.includes('--spice')
const files = args.filter((a) => a !== '--spice')
if (files.length !== 1) fail('usage: npm run --silent solve -- [--spice] FILE.json   (FILE may be - for standard input)')

let text: string
try {
  text = readFileSync(files[0] === '-' ? 0 : files[0]!, 'utf8')
} catch (e) {
  fail(`cannot read ${files[0]}: ${(e as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : (e as Error).message}`)
}

const parsed = parseCircuit(text)
if (!parsed.ok) {
  fail([`${files[0] === '-' ? 'standard input' : files[0]} is not a valid circuit document:`, ...parsed.errors.map((e) => `  ${e.path}: ${e.message}`)].join('\n'))
}
try {
  if (spice) process.stdout.write(toSpiceNetlist(parsed.circuit))
  else process.stdout.write(`${JSON.stringify(solveCircuit(parsed.circuit).result, null, 2)}\n`)
} catch (e) {
  if (e instanceof CircuitSolveError) fail(`${files[0]} cannot be solved: ${e.message}`)
  fail(`${files[0]} could not be solved: ${(e as Error).message}`)
}
