// Saving from the Bench: the demo practitioner saves a starter to My banks, reopens it,
// edits (autosave), and meets a save made elsewhere in between (409: reload or save a copy).
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launch, screenshot, type Browser } from './helpers'

let browser: Browser
let page: Page
const name = `Shop bank ${Date.now()}`

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
  await page.setViewportSize({ width: 1600, height: 1000 })
  page.on('dialog', (dialog) => void dialog.accept())
  await page.goto('/sign-in')
  await page.getByLabel('E-mail').fill('practitioner@phaseloom.test')
  await page.getByLabel('Password').fill('phaseloom-demo')
  await page.getByLabel('Password').press('Enter')
  await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'))
})
afterAll(async () => {
  await browser?.close()
})

const savedId = () => Number(new URL(page.url()).pathname.split('/').pop())

describe('saving from the Bench', () => {
  it('saves a starter as a new bank and opens it again after a reload', async () => {
    await page.goto('/bench?starter=open-delta-240', { waitUntil: 'networkidle' })
    await page.locator('.vue-flow__node').first().waitFor()
    await page.locator('#bank-name').fill(name)
    await page.locator('#bank-name').press('Enter')
    await page.getByTestId('save').click()
    await page.waitForURL(/\/bench\/\d+$/)
    expect(savedId()).toBeGreaterThan(0)
    await page.reload({ waitUntil: 'networkidle' })
    await page.locator('.vue-flow__node').first().waitFor()
    expect(await page.locator('#bank-name').inputValue()).toBe(name)
    expect(await page.locator('[data-part="T2"]').count()).toBe(1)
  })

  it('autosaves an edit with the next version', async () => {
    const id = savedId()
    const before = await page.request.get(`/api/banks/${id}`).then((r) => r.json())
    await page.locator('[data-add-part="voltmeter"]').click()
    await expect.poll(async () => (await page.request.get(`/api/banks/${id}`).then((r) => r.json())).version, { timeout: 15_000 }).toBe(before.version + 1)
    const after = await page.request.get(`/api/banks/${id}`).then((r) => r.json())
    expect(after.document.components.length).toBe(before.document.components.length + 1)
  })

  it('a save made elsewhere in between: nothing is overwritten, and a copy can be saved', async () => {
    const id = savedId()
    const current = await page.request.get(`/api/banks/${id}`).then((r) => r.json())
    // someone else saves (the same account, in another tab)
    const elsewhere = await page.request.patch(`/api/banks/${id}`, { data: { name: `${name} (theirs)`, version: current.version } })
    expect(elsewhere.status()).toBe(200)
    await page.locator('[data-add-part="load"]').click()
    await page.getByText('Someone saved this bank in the meantime').waitFor({ timeout: 15_000 })
    const stored = await page.request.get(`/api/banks/${id}`).then((r) => r.json())
    expect(stored.name).toBe(`${name} (theirs)`)
    expect(stored.document.components.length).toBe(current.document.components.length)
    await screenshot(page, 'bench-save-conflict')
    await page.getByRole('button', { name: 'Save mine as a copy' }).click()
    await page.waitForURL((url) => url.pathname !== `/bench/${id}` && /\/bench\/\d+$/.test(url.pathname))
    const copy = await page.request.get(`/api/banks/${savedId()}`).then((r) => r.json())
    expect(copy.name).toMatch(/\(copy\)$/)
    expect(copy.document.components.some((c: { kind: string }) => c.kind === 'load')).toBe(true)
  })
})
