// A student's attempt at a fault hunt in Chromium: the bank has a unit with its secondary
// marked backwards (hidden on the server). The student energizes, takes the closing check
// with the meter, finds ≈ 480 V, narrows it down to the unit and submits the right diagnosis.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { request, type APIRequestContext, type Page } from 'playwright-core'
import { starterBySlug } from '../../shared/starters'
import { baseURL, launch, screenshot, signUpByMail, type Browser } from './helpers'

let browser: Browser
let page: Page
let teacher: APIRequestContext
let attemptId = 0

async function ok<T = any>(response: Promise<import('playwright-core').APIResponse>): Promise<T> {
  const r = await response
  if (!r.ok()) throw new Error(`${r.url()} answered ${r.status()}: ${await r.text()}`)
  return r.status() === 204 ? (null as T) : r.json()
}

beforeAll(async () => {
  // the instructor sets the hunt up through the API
  teacher = await request.newContext({ baseURL })
  await ok(teacher.post('/api/auth/sign-in', { data: { email: 'instructor@phaseloom.test', password: 'phaseloom-demo' } }))
  const klass = await ok(teacher.post('/api/classes', { data: { name: `Browser hunt class ${Date.now()}` } }))
  const bank = await ok(teacher.post('/api/banks', { data: { name: 'browser hunt bank', document: starterBySlug('closing-check-practice')!.document } }))
  const hunt = await ok(teacher.post('/api/hunts', { data: { bankId: bank.id, title: 'Find the backwards unit', instructions: 'Closing check first.', faults: [{ kind: 'secondary-reversed', component: 'T2' }] } }))
  await ok(teacher.post(`/api/hunts/${hunt.id}/publish`, { data: { classIds: [klass.id] } }))

  browser = await launch()
  page = await browser.newPage()
  await page.setViewportSize({ width: 1600, height: 1000 })
  const email = `hunter-${Date.now()}@phaseloom.test`
  await signUpByMail(page, { name: 'Hunt Student', email, password: 'correct-horse-battery', role: 'student' })
  await ok(page.request.post('/api/classes/join', { data: { code: klass.joinCode } }))
  attemptId = (await ok(page.request.post(`/api/hunts/${hunt.id}/attempts`))).id
})
afterAll(async () => {
  await browser?.close()
  await teacher?.dispose()
})

async function measure(from: string, to: string): Promise<number> {
  const before = await page.getByTestId('probe-count').textContent()
  await page.getByTestId('lead-from').selectOption(from)
  await page.getByTestId('lead-to').selectOption(to)
  await page.getByTestId('measure').click()
  await expect.poll(() => page.getByTestId('probe-count').textContent(), { timeout: 10_000 }).not.toBe(before)
  const text = await page.getByTestId('probe-reading').textContent()
  expect(text).toContain(`${from} to ${to}`)
  return Number(/^([\d.]+) V/.exec((await page.getByTestId('probe-volts').textContent()) ?? '')![1])
}

describe('a fault hunt attempt on the Bench', () => {
  it('shows the bank without any reading of its own, and the safety words', async () => {
    await page.goto(`/attempts/${attemptId}`, { waitUntil: 'networkidle' })
    await page.locator('.vue-flow__node').first().waitFor()
    expect(await page.getByRole('heading', { name: 'Fault hunt: Find the backwards unit' }).count()).toBe(1)
    expect(await page.getByTestId('bench-safety').textContent()).toContain('real banks can kill')
    // no hazard panel, no engine readings: they would be of the bank as drawn, not as it is
    expect(await page.getByTestId('hazard-list').count()).toBe(0)
    expect(await page.getByTestId('if-energized').count()).toBe(0)
  })

  it('energizes through the server and takes the closing check: ≈ 2 × 240 V across the open corner', async () => {
    await page.getByTestId('energize').click()
    await expect.poll(() => page.getByTestId('energize').getAttribute('aria-pressed'), { timeout: 10_000 }).toBe('true')
    const gap = await measure('T3.X4', 'T1.X1')
    // common practice: one unit backwards in a delta puts about twice the coil voltage across the gap
    expect(gap).toBeGreaterThan(470)
    expect(gap).toBeLessThan(490)
    await screenshot(page, 'hunt-closing-check')
  })

  it('narrows it down with the meter: across T1 and T2 in series reads 240 V instead of 415 V', async () => {
    // T1.X1 → T2.X4 spans two coils of the delta: 240 ∠ 0 + 240 ∠ −120 ≈ 240 V when both are right
    // (the delta's line voltage); with T2 backwards it spans 240 ∠ 0 − 240 ∠ −120 ≈ 415.7 V
    const twoCoils = await measure('T1.X1', 'T2.X4')
    const threeCoils = await measure('T2.X1', 'T3.X4')
    expect(twoCoils).toBeGreaterThan(400)
    expect(threeCoils).toBeGreaterThan(400)
    const healthy = await measure('T3.X1', 'T3.X4')
    expect(healthy).toBeCloseTo(240, -1)
  })

  it('submits the right diagnosis and becomes read-only', async () => {
    await page.getByTestId('diagnosis-part-0').selectOption('T2')
    await page.getByTestId('diagnosis-kind-0').selectOption('polarity-reversed')
    await page.getByTestId('submit-diagnosis').click()
    await page.getByTestId('confirm-submit').click()
    await page.getByTestId('feedback').waitFor({ timeout: 10_000 })
    expect(await page.getByTestId('feedback').textContent()).toContain('You found the fault')
    expect(await page.getByTestId('measure').isDisabled()).toBe(true)
    await screenshot(page, 'hunt-submitted')
    const stored = await ok(page.request.get(`/api/attempts/${attemptId}`))
    expect(stored.status).toBe('submitted')
    expect(stored.probesUsed).toBe(4)
    expect(stored.unsafeClosures).toBe(0)
    expect(JSON.stringify(stored)).not.toContain('secondary-reversed')
  })
})
