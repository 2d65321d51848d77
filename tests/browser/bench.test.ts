// The Bench in Chromium: jumpers by mouse and by keyboard, energizing, the closing check,
// and closing a delta onto a reversed unit. A screenshot of each state goes to test-results/.
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

const jumper = (a: string, b: string) => {
  const label = (t: string) => t.replace('.', ' terminal ')
  return page.locator(`.vue-flow__edge[aria-label^="Jumper from ${label(a)} to ${label(b)}"], .vue-flow__edge[aria-label^="Jumper from ${label(b)} to ${label(a)}"]`)
}

async function meterVolts(id: string): Promise<number> {
  const text = await page.locator(`[data-meter="${id}"]`).textContent()
  return Number.parseFloat(text ?? 'NaN')
}

/** A jumper made with the keyboard alone: focus a terminal, Enter, focus another, Enter. */
async function keyboardJumper(a: string, b: string) {
  await page.locator(`[data-terminal="${a}"]`).focus()
  await page.keyboard.press('Enter')
  await page.locator(`[data-terminal="${b}"]`).focus()
  await page.keyboard.press('Enter')
}

/** Removes a jumper with the keyboard: focus its tag, press Delete. */
async function keyboardRemove(a: string, b: string) {
  const tag = page.locator(`[data-jumper="${a}~${b}"], [data-jumper="${b}~${a}"]`)
  await tag.focus()
  await page.keyboard.press('Delete')
  await expect.poll(() => jumper(a, b).count()).toBe(0)
  // the keyboard stays on the bank: focus moves to one end of the jumper just removed
  await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-terminal') ?? '')).toMatch(new RegExp(`^(${a}|${b})$`.replace(/\./g, '\\.')))
}

describe('the Bench', () => {
  it('a jumper dragged from T1.X2 onto T1.X3 appears on the canvas', async () => {
    await openStarter('single-unit-parallel-120')
    expect(await jumper('T1.X2', 'T1.X3').count()).toBe(0)
    const from = await page.locator('[data-terminal="T1.X2"]').boundingBox()
    const to = await page.locator('[data-terminal="T1.X3"]').boundingBox()
    await page.mouse.move(from!.x + from!.width / 2, from!.y + from!.height / 2)
    await page.mouse.down()
    await page.mouse.move(to!.x + to!.width / 2, to!.y + to!.height / 2, { steps: 12 })
    await page.mouse.up()
    await expect.poll(() => jumper('T1.X2', 'T1.X3').count()).toBe(1)
    await screenshot(page, 'bench-1-dragged-jumper')
  })

  it('closing the breaker onto a bank that would short asks first and says what would happen', async () => {
    await openStarter('closed-delta-240')
    await keyboardRemove('T1.X4', 'T2.X1')
    await keyboardRemove('T2.X4', 'T3.X1')
    await keyboardRemove('OUT.b', 'T2.X1')
    await keyboardJumper('T1.X4', 'T2.X4')
    await keyboardJumper('T2.X1', 'T3.X1')
    await keyboardJumper('OUT.b', 'T2.X4')
    await page.getByTestId('energize').click()
    const dialog = page.getByTestId('energize-dialog')
    await expect.poll(() => dialog.isVisible()).toBe(true)
    expect(await dialog.textContent()).toMatch(/T2 is connected backwards in a closed delta/)
    await screenshot(page, 'bench-2b-energize-question')
    await page.getByRole('button', { name: 'Keep CB1 open' }).click()
    expect(await meterVolts('Mab')).toBeLessThan(0.5)
  })

  it('the closed delta starter, energized, reads 240 V ± 1 % line to line', async () => {
    await openStarter('closed-delta-240')
    expect(await meterVolts('Mab')).toBeLessThan(0.5) // de-energized
    await page.getByTestId('energize').click()
    await expect.poll(() => meterVolts('Mab')).toBeGreaterThan(237.6)
    for (const m of ['Mab', 'Mbc', 'Mca']) {
      const v = await meterVolts(m)
      expect(v).toBeGreaterThan(240 * 0.99)
      expect(v).toBeLessThan(240 * 1.01)
    }
    expect(await page.getByTestId('hazard-list').locator('li').count()).toBe(0)
    await screenshot(page, 'bench-2-closed-delta-energized')
  })

  it('with the corner open, one unit swapped shows the reversed-winding hazard and ≈ 480 V across the gap; closing it opens a fuse', async () => {
    await openStarter('closing-check-practice')
    // swap T2's secondary: what went to X1 goes to X4 and the other way round
    await keyboardRemove('T1.X4', 'T2.X1')
    await keyboardRemove('T2.X4', 'T3.X1')
    await keyboardRemove('OUT.b', 'T2.X1')
    await keyboardJumper('T1.X4', 'T2.X4')
    await keyboardJumper('T2.X1', 'T3.X1')
    await keyboardJumper('OUT.b', 'T2.X4')
    await expect.poll(() => jumper('T2.X1', 'T3.X1').count()).toBe(1)
    expect(await page.getByTestId('closing-check').count()).toBe(1)

    // de-energized, the Bench already says what closing CB1 would find
    expect(await page.getByTestId('if-energized').textContent()).toMatch(/connected backwards \(T2\): safe to measure energized; do not close the gap/)
    // energizing with the corner open is the closing check itself: no question asked
    await page.getByTestId('energize').click()
    expect(await page.getByTestId('energize-dialog').isVisible()).toBe(false)
    await expect.poll(() => meterVolts('MC')).toBeGreaterThan(400)

    const gap = await meterVolts('MC')
    expect(gap).toBeGreaterThan(480 * 0.97)
    expect(gap).toBeLessThan(480 * 1.03)
    const hazard = page.locator('[data-hazard="reversed-winding"]')
    await expect.poll(() => hazard.count()).toBe(1)
    expect(await hazard.textContent()).toMatch(/T2/)
    await screenshot(page, 'bench-3-reversed-unit-open-corner')

    // close the corner on the live bank: the Bench asks first, then the protection acts
    await keyboardJumper('T3.X4', 'T1.X1')
    const corner = page.getByTestId('corner-dialog')
    await expect.poll(() => corner.isVisible()).toBe(true)
    expect(await corner.textContent()).toMatch(/not near 0 V/)
    await page.getByTestId('close-corner').click()
    const log = page.getByTestId('event-log')
    await expect.poll(() => log.count()).toBe(1)
    expect(await log.textContent()).toMatch(/F\d blown/)
    await screenshot(page, 'bench-4-closed-onto-reversed-unit')
  })

  it('tapping one terminal and then another of the same unit makes a jumper', async () => {
    await openStarter('single-unit-parallel-120')
    await page.locator('[data-terminal="T1.X1"]').click()
    await expect.poll(() => page.getByTestId('bench-notice').textContent()).toContain('T1 terminal X1 picked')
    expect(await page.locator('[data-terminal="T1.X1"]').getAttribute('aria-pressed')).toBe('true')
    await page.locator('[data-terminal="T1.X4"]').click()
    await expect.poll(() => jumper('T1.X1', 'T1.X4').count()).toBe(1)
  })

  it('a jumper can be made with the keyboard alone', async () => {
    await openStarter('closed-delta-240')
    await page.locator('[data-terminal="T1.H1"]').focus()
    await page.keyboard.press('Enter')
    await expect.poll(() => page.getByTestId('bench-notice').textContent()).toContain('T1 terminal H1 picked')
    // Tab moves on to the next terminal, Enter joins it
    await page.keyboard.press('Tab')
    const next = await page.evaluate(() => document.activeElement?.getAttribute('data-terminal'))
    expect(next).toBe('T1.H2')
    await page.keyboard.press('Enter')
    await expect.poll(() => jumper('T1.H1', 'T1.H2').count()).toBe(1)
    await expect.poll(() => page.getByTestId('bench-notice').textContent()).toContain('Jumper made')
    await screenshot(page, 'bench-5-keyboard-jumper')
  })

  it('marks the high leg of a four-wire delta in its own colour when energized (NEC 110.15: orange)', async () => {
    await openStarter('high-leg-delta-240-120')
    await page.getByTestId('energize').click()
    await expect.poll(() => meterVolts('Mbn')).toBeGreaterThan(200)
    const colourOf = (selector: string) => page.locator(selector).first().evaluate((el) => getComputedStyle(el).borderTopColor)
    // the default convention (North America 120/240 V) marks the high leg orange: #e07a00
    expect(await colourOf('[data-jumper*="OUT.b"]')).toBe('rgb(224, 122, 0)')
    expect(await colourOf('[data-jumper*="OUT.a"]')).not.toBe('rgb(224, 122, 0)')
    await screenshot(page, 'bench-6-high-leg')
  })

  it('keeps the safety words in view', async () => {
    await openStarter('closed-delta-240')
    await expect.poll(() => page.getByTestId('bench-safety').textContent()).toContain('real banks can kill')
  })
})
