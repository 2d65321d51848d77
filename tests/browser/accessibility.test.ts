// axe-core on every page, signed in as the role that page is for: no serious or critical
// violation. The pages are loaded as a person would open them; axe runs in the page.
import { readFileSync } from 'node:fs'
import { createRequire } from 'node:module'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launch, type Browser } from './helpers'

const axeSource = readFileSync(createRequire(import.meta.url).resolve('axe-core/axe.min.js'), 'utf8')

type Role = 'anonymous' | 'student' | 'instructor' | 'practitioner' | 'admin'
let browser: Browser
let page: Page
let current: Role = 'anonymous'
const ids = { bank: 0, klass: 0, hunt: 0, attempt: 0, sheet: 0, shared: '' }

/** One page, one cookie jar: signing in as another role replaces the session. */
async function as(role: Role) {
  if (role === current) return
  if (role === 'anonymous') await page.request.post('/api/auth/sign-out')
  else expect((await page.request.post('/api/auth/sign-in', { data: { email: `${role}@phaseloom.test`, password: 'phaseloom-demo' } })).status()).toBe(200)
  current = role
}

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
  await as('student')
  const s = page.request
  const hunts = await (await s.get('/api/hunts')).json()
  ids.hunt = hunts.assigned[0].id
  ids.attempt = (await (await s.post(`/api/hunts/${ids.hunt}/attempts`)).json()).id
  ids.sheet = (await (await s.post('/api/lab-sheets', { data: { starter: 'closed-delta-240' } })).json()).id
  const banks = await (await s.get('/api/banks')).json()
  ids.bank = banks.items[0].id
  ids.shared = (await (await s.post(`/api/banks/${ids.bank}/share`)).json()).token
  ids.klass = (await (await s.get('/api/classes')).json())[0].id
})
afterAll(async () => {
  await browser?.close()
})

async function violations(role: Role, path: string) {
  await as(role)
  await page.goto(path, { waitUntil: 'networkidle' })
  await page.waitForTimeout(300)
  const result = await page.evaluate(async (source) => {
    // eslint-disable-next-line no-eval
    (0, eval)(source)
    const axe = (window as unknown as { axe: { run: (ctx: Document, opts: object) => Promise<{ violations: { id: string, impact: string, help: string, nodes: { target: string[] }[] }[] }> } }).axe
    return axe.run(document, { resultTypes: ['violations'] })
  }, axeSource)
  return result.violations
    .filter(v => v.impact === 'serious' || v.impact === 'critical')
    .map(v => `${role} ${path}: ${v.id} (${v.impact}) ${v.help}: ${v.nodes.slice(0, 3).map(n => n.target.join(' ')).join(', ')}`)
}

describe('accessibility (axe-core): no serious or critical violations', () => {
  it.each([
    '/', '/starters', '/bench', '/bench?starter=high-leg-delta-240-120', '/sign-in', '/sign-up', '/forgot', '/reset?token=not-a-real-token-0123456789', '/sign-up/confirm?token=not-a-real-token-0123456789', '/no-such-page',
  ])('anonymous %s', async (path) => {
    expect(await violations('anonymous', path)).toEqual([])
  })

  it.each([
    () => '/banks', () => '/account', () => '/classes', () => `/classes/${ids.klass}`, () => '/hunts', () => `/hunts/${ids.hunt}`,
    () => `/attempts/${ids.attempt}`, () => '/lab-sheets', () => `/lab-sheets/${ids.sheet}`, () => `/bench/${ids.bank}`, () => `/shared/${ids.shared}`,
  ])('student %#', async (path) => {
    expect(await violations('student', path())).toEqual([])
  })

  it.each([
    () => '/classes', () => `/classes/${ids.klass}`, () => '/hunts', () => '/hunts/new', () => `/hunts/${ids.hunt}`, () => '/lab-sheets',
  ])('instructor %#', async (path) => {
    expect(await violations('instructor', path())).toEqual([])
  })

  it.each(['/banks', '/site-check', '/hunts'])('practitioner %s', async (path) => {
    expect(await violations('practitioner', path)).toEqual([])
  })

  it.each(['/admin/users', '/admin/outbox'])('admin %s', async (path) => {
    expect(await violations('admin', path)).toEqual([])
  })
})
