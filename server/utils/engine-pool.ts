/// <reference path="../workers/solve-worker.d.ts" />
import { existsSync } from 'node:fs'
import { fileURLToPath } from 'node:url'
import { MessageChannel } from 'node:worker_threads'
import { Piscina } from 'piscina'
import solveWorkerUrl from '#solve-worker'
import type * as EngineTasks from '../workers/solve'

/**
 * Every solve the server makes runs here, off the request thread, in a pool of worker threads
 * (server/workers/solve.ts), with a time budget. Why piscina rather than a pool of our own over
 * worker_threads: it already does the parts that are easy to get wrong — a queue with a bound,
 * a replacement worker when one dies or is ended, ending the worker that runs an aborted task,
 * and no lost or doubled promise when a task and its abort race — and it is widely used.
 *
 * Runtime config `engine`: `threads` (1: this machine has two cores, one stays for requests),
 * `budgetSeconds` (2) per solve, counted from when a worker starts it, `maxQueue` (32) solves
 * waiting before 503, `memoryMb` (512) heap per worker, `nice` (10): the workers' lower CPU
 * priority, so that on a busy machine the request thread is served first (health, bank reads).
 */
type Tasks = typeof EngineTasks
type TaskName = Exclude<keyof Tasks, 'EngineFailure' | 'Envelope'>
type TaskInput<K extends TaskName> = Parameters<Tasks[K]>[0]['task']
type TaskOutput<K extends TaskName> = Awaited<ReturnType<Tasks[K]>>

let pool: Piscina | undefined

function engineConfig() {
  const engine = (useRuntimeConfig().engine ?? {}) as { threads?: number, budgetSeconds?: number, maxQueue?: number, memoryMb?: number, nice?: number }
  return {
    threads: Math.max(1, Number(engine.threads ?? 1)),
    budgetSeconds: Math.max(0.05, Number(engine.budgetSeconds ?? 2)),
    maxQueue: Math.max(1, Number(engine.maxQueue ?? 32)),
    memoryMb: Math.max(64, Number(engine.memoryMb ?? 512)),
    nice: Math.min(19, Math.max(0, Number(engine.nice ?? 10))),
  }
}

function enginePool(): Piscina {
  if (pool) return pool
  const config = engineConfig()
  const filename = solveWorkerUrl()
  // a missing worker file would have the pool start worker after worker, each failing to load
  if (!existsSync(fileURLToPath(filename))) throw new Error(`the engine's worker is missing at ${filename}: build the app again`)
  pool = new Piscina({
    filename,
    minThreads: config.threads,
    maxThreads: config.threads,
    idleTimeout: Number.POSITIVE_INFINITY,
    maxQueue: config.maxQueue,
    resourceLimits: { maxOldGenerationSizeMb: config.memoryMb },
    niceIncrement: config.nice,
  })
  const ending = pool
  ending.on('error', (error: Error) => console.error('engine worker:', error.message))
  useNitroApp().hooks.hookOnce('close', () => ending.destroy())
  return pool
}

function tooLarge(seconds: number) {
  return createError({
    statusCode: 422,
    statusMessage: `This bank is too large to settle within ${seconds} s`,
    data: { limitSeconds: seconds, errors: [{ path: 'components', message: `the engine stopped after ${seconds} s, its limit for one solve: make the bank smaller` }] },
  })
}

/**
 * Runs one engine task in the pool. Over the budget, the worker running it is ended (so it
 * cannot hold the pool) and the answer is 422 naming the limit; with the queue full, 503.
 */
export async function runEngine<K extends TaskName>(name: K, task: TaskInput<K>): Promise<TaskOutput<K>> {
  const engine = enginePool()
  const { budgetSeconds } = engineConfig()
  const { port1, port2 } = new MessageChannel()
  const abort = new AbortController()
  let timer: NodeJS.Timeout | undefined
  port1.once('message', () => {
    timer = setTimeout(() => abort.abort(), budgetSeconds * 1000)
  })
  try {
    return await engine.run({ started: port2, task }, { name, transferList: [port2] as never, signal: abort.signal }) as TaskOutput<K>
  }
  catch (error) {
    if (abort.signal.aborted) throw tooLarge(budgetSeconds)
    const code = (error as { code?: string }).code
    if (code === 'ERR_WORKER_OUT_OF_MEMORY') {
      throw createError({ statusCode: 422, statusMessage: 'This bank is too large for the engine', data: { errors: [{ path: 'components', message: 'the solve ran out of the memory one solve may use: make the bank smaller' }] } })
    }
    // a body nested too deeply to hand to a worker (or for the engine's parser)
    if ((error as Error).name === 'DataCloneError' || error instanceof RangeError) {
      throw createError({ statusCode: 400, statusMessage: 'The document is nested too deeply', data: { errors: [{ path: '(body)', message: 'the body is nested too deeply to read' }] } })
    }
    if (/queue is at limit/i.test((error as Error).message)) {
      throw createError({ statusCode: 503, statusMessage: 'The engine is busy: try again in a moment', data: { errors: [{ path: '(body)', message: 'too many solves are waiting: try again in a moment' }] } })
    }
    throw error
  }
  finally {
    clearTimeout(timer)
    port1.close()
  }
}

/** An engine task's failure value as the HTTP error it stands for. */
export function engineFailure(failure: { statusCode: number, statusMessage: string, data?: unknown, errors?: unknown }) {
  return createError({ statusCode: failure.statusCode, statusMessage: failure.statusMessage, data: failure.data ?? { errors: failure.errors } })
}
