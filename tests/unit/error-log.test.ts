// What the server logs when a request fails unexpectedly (server/plugins/database-errors.ts): one
// line with the route, the user and the database's own words, never the body that came with it.
import { beforeAll, describe, expect, it, vi } from 'vitest'

type Hook = (error: unknown, context: { event?: unknown }) => void
let hook: Hook

beforeAll(async () => {
  vi.stubGlobal('defineNitroPlugin', (plugin: unknown) => plugin)
  const { default: plugin } = await import('../../server/plugins/database-errors')
  plugin({ hooks: { hook: (_: string, fn: Hook) => { hook = fn } } } as never)
})

const document = JSON.stringify({ format: 'phaseloom.circuit', components: [{ id: 'T1', secret: 'x'.repeat(5000) }] })

/** An error as Drizzle and h3 wrap a refused query: the driver's error inside, the parameters in the message. */
function refusedQuery() {
  const driver = Object.assign(new Error('Limit of 32 on JSON nested structures depth is reached'), { code: 'ER_JSON_DOCUMENT_TOO_DEEP', sqlMessage: 'Limit of 32 on JSON nested structures depth is reached' })
  const drizzle = Object.assign(new Error(`Failed query: insert into \`banks\` (\`name\`, \`document\`) values (?, ?)\nparams: Deep,${document}`), { cause: driver })
  return Object.assign(new Error(drizzle.message), { cause: drizzle, statusCode: 500, unhandled: true })
}

const event = (userId?: number) => ({
  method: 'POST',
  path: '/api/banks?x=1',
  context: { sessions: userId === undefined ? {} : { 'nuxt-session': { data: { user: { id: userId } } } } },
})

describe('the log of an unexpected failure', () => {
  it('names the route, the user and the error, and holds no part of the body', () => {
    const lines: string[] = []
    const spy = vi.spyOn(console, 'error').mockImplementation((...args: unknown[]) => { lines.push(args.map(String).join(' ')) })
    const error = refusedQuery()
    hook(error, { event: event(42) })
    spy.mockRestore()
    expect(lines).toHaveLength(1)
    expect(lines[0]).toMatch(/^\[request error\] POST \/api\/banks user 42: Error ER_JSON_DOCUMENT_TOO_DEEP: Limit of 32 on JSON nested structures depth is reached/)
    expect(lines[0]).not.toContain('xxxxxxxxxx')
    expect(lines[0]).not.toContain('params')
    expect(lines[0]!.length).toBeLessThan(2000)
    // and Nitro, seeing a handled error with nothing in it, neither logs it again nor answers with it
    expect(error).toMatchObject({ unhandled: false, message: 'Server Error', cause: undefined })
  })

  it('says anonymous when no one was signed in', () => {
    const lines: string[] = []
    const spy = vi.spyOn(console, 'error').mockImplementation((...args: unknown[]) => { lines.push(args.map(String).join(' ')) })
    hook(Object.assign(new Error(`boom\n${document}`), { unhandled: true }), { event: event() })
    spy.mockRestore()
    expect(lines[0]).toMatch(/^\[request error\] POST \/api\/banks anonymous: Error: boom/)
    expect(lines[0]).not.toContain('phaseloom.circuit')
  })

  it('leaves an error a route meant (a 4xx) alone', () => {
    const spy = vi.spyOn(console, 'error').mockImplementation(() => {})
    const error = Object.assign(new Error('Invalid body'), { statusCode: 400, data: { errors: [] } })
    hook(error, { event: event(1) })
    expect(spy).not.toHaveBeenCalled()
    spy.mockRestore()
    expect(error.message).toBe('Invalid body')
  })
})
