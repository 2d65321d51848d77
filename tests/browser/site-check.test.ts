// The demo practitioner plans a high-leg delta on /site-check, downloads the PDF (its text
// read back, page 1 rendered to PNG with pdftoppm), saves it with their banks, opens the
// built bank on the Bench, and opens the printable sheet.
import { readFileSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { pdfText, renderFirstPage } from '../support/pdf'
import { launch, resultsDir, screenshot, type Browser } from './helpers'

let browser: Browser
let page: Page
const name = `Quarry shop high-leg ${Date.now()}`

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
})
afterAll(async () => {
  await browser?.close()
})
// a failed step leaves a picture of the page behind in test-results/
afterEach(async (context) => {
  if (context.task.result?.state === 'fail') await screenshot(page, `site-check-failed-${context.task.name.slice(0, 30).replace(/\W+/g, '-')}`).catch(() => undefined)
})

/** Every test point row as the page shows it: step → [leads, expected]. */
async function shownReadings(p: Page) {
  return p.locator('[data-test-point]').evaluateAll(rows => rows.map(r => ({
    step: r.getAttribute('data-test-point'),
    leads: r.querySelectorAll('td')[2]!.textContent!.trim(),
    expected: r.querySelector('[data-expected]')!.textContent!.trim(),
  })))
}

describe('Site check in the browser', () => {
  it('explains itself to a signed-out visitor', async () => {
    await page.goto('/site-check')
    await page.getByTestId('site-check-explainer').waitFor()
    expect(await page.getByTestId('site-check-explainer').innerText()).toContain('practitioners')
    expect(await page.getByTestId('site-check-form').count()).toBe(0)
  })

  it('the demo practitioner fills the form and sees the plan', async () => {
    await page.goto('/sign-in?next=/site-check')
    await page.getByLabel('E-mail').fill('practitioner@phaseloom.test')
    await page.getByLabel('Password').fill('phaseloom-demo')
    await page.getByLabel('Password').press('Enter')
    await page.waitForURL(url => url.pathname === '/site-check')
    await page.getByTestId('site-check-form').waitFor()

    await page.getByLabel('Name').fill(name)
    await page.getByLabel('Bank').selectOption('high-leg-delta')
    await page.locator('#sc-u2-kva').fill('37.5')
    await page.getByLabel('Three-phase kVA').fill('30')
    await page.getByLabel('Power factor (lagging)').fill('0.8')
    await page.getByLabel('Lighting kVA (120 V, a–n and c–n)').fill('40')

    const results = page.getByTestId('site-check-results')
    await results.waitFor()
    await expect.poll(() => page.locator('[data-loading="T3"]').innerText()).toContain('(lighting)')
    const highLeg = page.locator('[data-test-point][data-kind="high-leg"] [data-expected]')
    expect(await highLeg.innerText()).toBe('207.8 V')
    expect(await page.locator('[data-kind="closing-check"] [data-expected]').innerText()).toBe('0.0 V')
    expect(await page.locator('[data-warning="high-leg-orange"]').innerText()).toContain('NEC 110.15')
    expect(await page.locator('[data-warning="high-leg-b-position"]').innerText()).toContain('NEC 408.3(E)')
    // 40 kVA of lighting and 30 kVA of motors: the 37.5 kVA lighting unit carries about 107 %
    expect(await page.locator('[data-warning="unit-overload"]').innerText()).toContain('T3')
    expect(statSync(await screenshot(page, 'site-check-plan')).size).toBeGreaterThan(20_000)
  })

  it('downloads the PDF sheet: its text holds every reading the page shows, and page 1 renders', async () => {
    const shown = await shownReadings(page)
    expect(shown.length).toBe(16)
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('sc-pdf').click()])
    expect(download.suggestedFilename()).toMatch(/^site-check-quarry-shop-high-leg-\d+\.pdf$/)
    const pdf = new Uint8Array(readFileSync((await download.path())!))
    const text = pdfText(pdf)
    const lines = text.split('\n')
    for (const row of shown) {
      const line = lines.find(l => l.includes(row.leads) && new RegExp(`(^|\\s)${row.step}\\s`).test(l))
      expect(line, `step ${row.step}`).toBeDefined()
      expect(line).toContain(row.expected)
    }
    expect(text).toContain(name)
    expect(text).toContain('Local code and licensed practice first.')
    const png = join(resultsDir, 'site-check-sheet-page1.png')
    renderFirstPage(pdf, png)
    expect(readFileSync(png).subarray(1, 4).toString()).toBe('PNG')
    expect(statSync(png).size).toBeGreaterThan(20_000)
  })

  it('saves it with the practitioner\'s banks, listed as a site check', async () => {
    await page.getByTestId('sc-save').click()
    await page.getByText('Saved with your banks as a site check.').waitFor()
    await page.goto('/banks')
    const row = page.getByRole('row').filter({ hasText: name })
    await row.waitFor()
    expect(await row.locator('[data-bank-kind="site-check"]').innerText()).toBe('site check')
    await row.getByRole('link', { name: `Open in Site check ${name}` }).click()
    await page.waitForURL(/\/site-check\?bank=\d+$/)
    await page.getByText('Opened the saved site check.').waitFor()
    expect(await page.getByLabel('Name').inputValue()).toBe(name)
  })

  it('opens the built bank on the Bench in one click', async () => {
    await page.getByTestId('sc-open-bench').click()
    await page.waitForURL(/\/bench\?from=site-check$/)
    expect(await page.getByTestId('bench-from-site-check').innerText()).toContain(name)
    await page.locator('[data-terminal="T3.X4"]').first().waitFor()
    await page.locator('[data-terminal="MC.a"]').first().waitFor()
    await screenshot(page, 'site-check-bench')
  })

  it('the printable sheet has the Measured column and hides the site chrome in print', async () => {
    await page.goto('/site-check/sheet')
    await page.getByRole('heading', { name: 'Pre-energization sheet' }).waitFor()
    expect(await page.getByRole('columnheader', { name: 'Measured' }).count()).toBeGreaterThan(0)
    await page.emulateMedia({ media: 'print' })
    expect(await page.locator('header').first().isVisible()).toBe(false)
    expect(await page.getByRole('button', { name: 'Print' }).isVisible()).toBe(false)
    await screenshot(page, 'site-check-sheet-print')
    await page.emulateMedia({ media: 'screen' })
  })
})
