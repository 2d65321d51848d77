// Runs a TypeScript entry the way production runs the engine: bundled by esbuild into plain
// JavaScript first (no tsx loader in the loop, no keep-names wrappers), then imported.
// `node scripts/run-bundled.mjs scripts/bench.ts [args...]` — used by `npm run bench`.
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { fileURLToPath, pathToFileURL } from 'node:url'
import { build } from 'esbuild'

const [entry, ...rest] = process.argv.slice(2)
if (!entry) {
  console.error('usage: node scripts/run-bundled.mjs ENTRY.ts [args...]')
  process.exit(2)
}
// inside the project, so that the bundle's bare imports (zod, complex.js) resolve to node_modules
const cache = join(fileURLToPath(new URL('..', import.meta.url)), 'node_modules', '.cache')
mkdirSync(cache, { recursive: true })
const dir = mkdtempSync(join(cache, 'phaseloom-run-'))
const outfile = join(dir, 'entry.mjs')
try {
  await build({ entryPoints: [resolve(entry)], outfile, bundle: true, platform: 'node', format: 'esm', target: 'node20', packages: 'external', logLevel: 'error', absWorkingDir: process.cwd() })
  process.argv = [process.argv[0], resolve(entry), ...rest]
  await import(pathToFileURL(outfile).href)
} finally {
  rmSync(dir, { recursive: true, force: true })
}
