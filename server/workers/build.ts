/**
 * Builds the engine's worker (server/workers/solve.ts) for the server bundle. Nitro bundles
 * the server into one graph of chunks; a worker thread needs a file of its own to load. This
 * Rollup plugin (given to Nitro in nuxt.config.ts) bundles the worker entry with esbuild into
 * one self-contained ES module (the engine, zod, pdf-lib: no bare imports left to resolve),
 * emits it as `workers/solve.mjs` beside the server's entry, and lets server code import its
 * address from `#solve-worker`. Nitro makes `import.meta.url` the entry's address in every chunk
 * (its node presets rewrite it), so the path is relative to the entry: .output/server/index.mjs
 * in a build, .nuxt/dev/index.mjs under `nuxt dev`. The entry sets it only after the chunks it
 * imports have run, so the address is a function, read when the pool is made.
 */
import { resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { build } from 'esbuild'
import type { Plugin } from 'rollup'

const ID = '#solve-worker'
const RESOLVED = '\0phaseloom-solve-worker'

export function solveWorker(): Plugin {
  return {
    name: 'phaseloom-solve-worker',
    async buildStart() {
      const entry = fileURLToPath(new URL('./solve.ts', import.meta.url))
      const out = await build({
        entryPoints: [entry],
        bundle: true,
        write: false,
        splitting: true,
        format: 'esm',
        platform: 'node',
        target: 'node20',
        outdir: '/workers',
        entryNames: '[name]',
        outExtension: { '.js': '.mjs' },
        chunkNames: 'solve-[hash]',
        alias: { '#shared': fileURLToPath(new URL('../../shared', import.meta.url)) },
        metafile: true,
        legalComments: 'none',
        logLevel: 'warning',
      })
      for (const input of Object.keys(out.metafile.inputs)) this.addWatchFile(resolve(input))
      for (const file of out.outputFiles) {
        const fileName = `workers/${file.path.split('/').pop()}`
        this.emitFile({ type: 'asset', fileName, source: file.text })
      }
    },
    resolveId(id) {
      return id === ID ? RESOLVED : null
    },
    load(id) {
      if (id !== RESOLVED) return null
      return 'export default () => new URL(\'./workers/solve.mjs\', import.meta.url).href'
    },
  }
}
