// A student fills a lab sheet in Chromium: readings typed with a comma or a point, the
// comparison with the likely cause of a miss, and a photo uploaded with its progress shown.
import { writeFileSync } from 'node:fs'
import { join } from 'node:path'
import sharp from 'sharp'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launch, resultsDir, screenshot, signUpByMail, type Browser } from './helpers'

let browser: Browser
let page: Page

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
  await page.setViewportSize({ width: 1400, height: 1000 })
  const email = `sheet-${Date.now()}@phaseloom.test`
  await signUpByMail(page, { name: 'Sheet Student', email, password: 'correct-horse-battery', role: 'student' })
})
afterAll(async () => {
  await browser?.close()
})

describe('a lab sheet in the browser', () => {
  it('starts a sheet from a starter and lists the readings to take', async () => {
    await page.goto('/lab-sheets', { waitUntil: 'networkidle' })
    await page.getByTestId('sheet-source').selectOption('starter:closed-delta-240')
    await page.getByTestId('new-sheet').click()
    await page.waitForURL(/\/lab-sheets\/\d+$/)
    await page.getByTestId('sheet-table').waitFor()
    expect(await page.getByTestId('measured').count()).toBe(16)
    expect(await page.locator('[data-point^="closing-check:"]').count()).toBe(1)
  })

  it('takes readings typed with a comma, and explains the miss', async () => {
    const rows = page.locator('tbody tr')
    const fill = async (prefix: string, value: string) => {
      await page.locator(`[data-point^="${prefix}"] [data-testid="measured"]`).first().fill(value)
    }
    await fill('primary:', '479,5')
    await fill('closing-check:', '478')
    await fill('line-line:', '239.6')
    await page.getByTestId('supply-volts').fill('480')
    await page.getByTestId('save-sheet').click()
    await page.getByTestId('sheet-message').filter({ hasText: 'Saved' }).waitFor()
    const primary = page.locator('[data-point^="primary:"]').first()
    expect(await primary.getByTestId('row-status').textContent()).toContain('within tolerance')
    expect(await primary.getByTestId('measured').inputValue()).toBe('479.5')
    const check = page.locator('[data-point^="closing-check:"]')
    expect(await check.getByTestId('row-status').textContent()).toContain('outside tolerance')
    expect(await check.getByTestId('row-cause').textContent()).toContain('one unit is connected backwards')
    expect(await rows.count()).toBe(16)
  })

  it('refuses a reading that is not a number, before saving', async () => {
    await page.locator('[data-point^="coil:"] [data-testid="measured"]').first().fill('about 120')
    await page.getByTestId('save-sheet').click()
    expect(await page.getByTestId('sheet-message').textContent()).toContain('not numbers')
    await page.locator('[data-point^="coil:"] [data-testid="measured"]').first().fill('120,2')
  })

  it('uploads a photo and shows it', async () => {
    const file = join(resultsDir, 'bench-photo.png')
    writeFileSync(file, await sharp({ create: { width: 1200, height: 900, channels: 3, background: '#b87333' } }).png().toBuffer())
    await page.getByTestId('photo-input').setInputFiles(file)
    await page.getByTestId('photo').first().waitFor({ timeout: 15_000 })
    const img = page.getByTestId('photo').first().locator('img')
    await expect.poll(() => img.evaluate((el) => (el as HTMLImageElement).naturalWidth), { timeout: 10_000 }).toBeGreaterThan(0)
    // what was typed but not saved yet is still there after the upload
    expect(await page.locator('[data-point^="coil:"] [data-testid="measured"]').first().inputValue()).toBe('120,2')
    await screenshot(page, 'lab-sheet-filled')
  })

  it('refuses a file that is not an image, saying why', async () => {
    const file = join(resultsDir, 'not-a-photo.jpg')
    writeFileSync(file, 'this is text, not a JPEG')
    await page.getByTestId('photo-input').setInputFiles(file)
    await page.getByTestId('photo-problem').waitFor({ timeout: 10_000 })
    expect(await page.getByTestId('photo-problem').textContent()).toContain('is not a JPEG, PNG or WebP image')
    expect(await page.getByTestId('photo').count()).toBe(1)
  })
})
