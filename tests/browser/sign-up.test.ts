// Making an account in Chromium: the form says to check the mail (naming the address typed),
// the mailed link makes the account and lands on the start page, signed in. All by keyboard.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { firstLink, mailTo } from '../api/people'
import { launch, screenshot, type Browser } from './helpers'

const email = `sign-up-browser-${Date.now()}@riverbend.test`
let browser: Browser
let page: Page

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
})
afterAll(async () => {
  await browser?.close()
})

describe('making an account', () => {
  it('sends a link, and the link signs the new account in', async () => {
    await page.goto('/sign-up', { waitUntil: 'networkidle' })
    await page.getByLabel('Name').fill('Tomasz Reyes')
    await page.getByLabel('E-mail').fill(email)
    await page.getByLabel('Password').fill('a long enough password')
    await page.getByLabel('a practitioner').check()
    await page.getByLabel('Password').focus()
    await page.keyboard.press('Enter')
    const sent = page.getByTestId('sign-up-sent')
    await sent.getByRole('heading', { name: 'Check your e-mail' }).waitFor()
    expect(await sent.innerText()).toContain(email)
    // the heading takes the focus, so a screen reader announces it
    expect(await page.evaluate(() => document.activeElement?.textContent?.trim())).toBe('Check your e-mail')
    await screenshot(page, 'sign-up-sent')
    // not signed in until the link is followed
    expect((await page.request.get('/api/banks')).status()).toBe(401)

    const link = firstLink((await mailTo(email)).text)
    expect(link.pathname).toBe('/sign-up/confirm')
    await page.goto(link.href)
    await page.waitForURL(/\/banks$/)
    expect((await page.request.get('/api/banks')).status()).toBe(200)
    const session = await (await page.request.get('/api/_auth/session')).json()
    expect(session.user).toMatchObject({ name: 'Tomasz Reyes', role: 'practitioner' })

    // the link is used up: opening it again says so in words, with a way on
    await page.goto(link.href)
    await page.getByText('This sign-up link has expired or was already used').waitFor()
    expect(await page.getByRole('link', { name: 'Make the account again' }).count()).toBe(1)
    await screenshot(page, 'sign-up-link-used')
  })
})
