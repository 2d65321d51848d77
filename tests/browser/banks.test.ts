// The demo student signs in, saves a new bank, reloads, and finds it in "My banks".
import { statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launch, screenshot, type Browser } from './helpers'

let browser: Browser
let page: Page
const bankName = `Bay 3 closing check ${Date.now()}`

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
})

afterAll(async () => {
  await browser?.close()
})

describe('My banks in the browser', () => {
  it('sends a signed-out visitor to sign in first', async () => {
    await page.goto('/banks')
    await page.waitForURL(/\/sign-in\?next=(%2F|\/)banks$/)
    expect(await page.getByRole('heading', { level: 1 }).innerText()).toBe('Sign in')
  })

  it('signs the demo student in with the keyboard, and comes back to My banks', async () => {
    await page.getByLabel('E-mail').fill('student@phaseloom.test')
    await page.getByLabel('Password').fill('phaseloom-demo')
    await page.getByLabel('Password').press('Enter')
    await page.waitForURL(/\/banks$/)
    await page.getByRole('heading', { name: 'My banks' }).waitFor()
    const account = page.getByRole('navigation', { name: 'Account' })
    expect(await account.innerText()).toContain('Priya Lindqvist')
    expect(await account.getByRole('button', { name: 'Sign out' }).isVisible()).toBe(true)
  })

  it('saves a new bank that is still there after a reload', async () => {
    await page.getByRole('button', { name: 'New bank' }).click()
    await page.getByLabel('Name of the new bank').fill(bankName)
    await page.getByRole('button', { name: 'Save the new bank' }).click()
    await page.getByText(`“${bankName}” is saved.`).waitFor()

    await page.reload()
    await page.getByRole('heading', { name: 'My banks' }).waitFor()
    const link = page.getByRole('link', { name: bankName })
    await link.waitFor()
    expect(await link.getAttribute('href')).toMatch(/^\/bench\/\d+$/)

    // search as you type: the list narrows to names containing the words
    const searched = page.waitForResponse(response => response.url().includes('q=closing+check') || response.url().includes('q=closing%20check'))
    await page.getByLabel('Search by name').fill('closing check')
    await searched
    await expect.poll(async () => {
      const rows = (await page.getByRole('row').allInnerTexts()).slice(1)
      return rows.length > 0 && rows.every(row => row.includes('closing check'))
    }).toBe(true)
    expect(await page.getByRole('row').filter({ hasText: bankName }).count()).toBe(1)
    const path = await screenshot(page, 'my-banks')
    expect(statSync(path).size).toBeGreaterThan(10_000)
  })

  it('signs out from the header', async () => {
    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/sign-in$/)
    expect(await page.getByRole('link', { name: 'Sign in' }).isVisible()).toBe(true)
    const answer = await page.request.get('/api/banks')
    expect(answer.status()).toBe(401)
  })
})
