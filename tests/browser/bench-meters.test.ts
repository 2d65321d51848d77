// The Bench in Chromium with the parts and hazards of format 1.1: the floating wye–delta starter
// energized (its closing check near 0 V, nothing wrong), an open delta with one unit turned round
// (the Bench asks before energizing and names the output voltage), and the new meters from the tray.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launchBenchPage, screenshot, type Browser } from './helpers'

let browser: Browser
let page: Page

beforeAll(async () => {
  ;({ browser, page } = await launchBenchPage())
})
afterAll(async () => {
  await browser?.close()
})

async function openStarter(slug: string) {
  await page.goto(`/bench?starter=${slug}`, { waitUntil: 'networkidle' })
  await page.locator('.vue-flow__node').first().waitFor()
}

const tag = (a: string, b: string) => page.locator(`[data-jumper="${a}~${b}"], [data-jumper="${b}~${a}"]`)

async function meterVolts(id: string): Promise<number> {
  const text = await page.locator(`[data-meter="${id}"]`).textContent()
  return Number.parseFloat(text ?? 'NaN')
}

async function keyboardJumper(a: string, b: string) {
  await page.locator(`[data-terminal="${a}"]`).focus()
  await page.keyboard.press('Enter')
  await page.locator(`[data-terminal="${b}"]`).focus()
  await page.keyboard.press('Enter')
  await expect.poll(() => tag(a, b).count()).toBe(1)
}

async function keyboardRemove(a: string, b: string) {
  await tag(a, b).focus()
  await page.keyboard.press('Delete')
  await expect.poll(() => tag(a, b).count()).toBe(0)
}

describe('the Bench, format 1.1', () => {
  it('the floating wye–delta starter: CB1 closes without a question, the closing check reads under 3 V, nothing wrong', async () => {
    await openStarter('floating-wye-delta-closing-check')
    expect(await page.getByTestId('closing-check').count()).toBe(1)
    await page.getByTestId('energize').click()
    expect(await page.getByTestId('energize-dialog').isVisible()).toBe(false)
    await expect.poll(() => meterVolts('Mab')).toBeGreaterThan(237)
    const closingCheck = await meterVolts('MC')
    expect(closingCheck).toBeGreaterThanOrEqual(0)
    expect(closingCheck).toBeLessThan(3)
    expect(await page.getByTestId('closing-check').textContent()).toMatch(/near 0 V: phased right/)
    expect(await page.locator('[data-hazard]').count()).toBe(0)
    expect(await page.locator('[data-caution]').count()).toBe(0)
    expect(await page.locator('section[aria-labelledby="hazards-title"]').textContent()).toContain('Nothing wrong found in this state.')
    expect(await page.getByTestId('vector-group').textContent()).toContain('Yd1')
    await screenshot(page, 'bench-7-floating-wye-delta-energized')
  })

  it('an open delta with T2 reversed: energizing asks first and names the output voltage', async () => {
    await openStarter('open-delta-240')
    // swap T2's secondary: what went to X1 goes to X4 and the other way round
    await keyboardRemove('T1.X4', 'T2.X1')
    await keyboardRemove('OUT.c', 'T2.X4')
    await keyboardJumper('T1.X4', 'T2.X4')
    await keyboardJumper('OUT.c', 'T2.X1')
    // de-energized, the Bench already says what closing CB1 would find
    expect(await page.getByTestId('if-energized').textContent()).toMatch(/Output voltage wrong \(OUT, T1, T2\)/)

    await page.getByTestId('energize').click()
    const dialog = page.getByTestId('energize-dialog')
    await expect.poll(() => dialog.isVisible()).toBe(true)
    const words = await dialog.textContent()
    expect(words).toMatch(/Danger: Output voltage wrong · OUT, T1, T2/)
    expect(words).toMatch(/415\.\d V/)
    await screenshot(page, 'bench-8-open-delta-reversed-question')
    await page.getByRole('button', { name: 'Keep CB1 open' }).click()
    expect(await dialog.isVisible()).toBe(false)
    expect(await meterVolts('Mab')).toBeLessThan(0.5)
  })

  it('the tray adds an ammeter and a rotation meter, each with its own terminals and face', async () => {
    await openStarter('closed-delta-240')
    await page.locator('[data-add-part="ammeter"]').click()
    await page.locator('[data-add-part="rotation-meter"]').click()
    for (const t of ['A1.a', 'A1.b', 'R1.a', 'R1.b', 'R1.c']) await expect.poll(() => page.locator(`[data-terminal="${t}"]`).count()).toBe(1)
    await keyboardJumper('R1.a', 'OUT.a')
    await keyboardJumper('R1.b', 'OUT.b')
    await keyboardJumper('R1.c', 'OUT.c')
    expect(await page.locator('[data-meter="R1"]').textContent()).toContain('no rotation')
    await page.getByTestId('energize').click()
    await expect.poll(() => page.locator('[data-meter="R1"]').textContent()).toContain('A-B-C')
    expect(await page.locator('[data-meter="A1"]').textContent()).toContain('0.00 A')
  })
})
