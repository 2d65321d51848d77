// "Sign out everywhere" in Chromium: one person signed in on two browsers; the button on the
// account page of one ends both, and that browser lands on the sign-in page.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page } from 'playwright-core'
import { launch, screenshot, signUpByMail, type Browser } from './helpers'

let laptop: Browser
let phone: Browser
let page: Page
let other: Page
const email = `everywhere-${Date.now()}@phaseloom.test`
const password = 'correct-horse-battery'

beforeAll(async () => {
  laptop = await launch()
  phone = await launch()
  page = await laptop.newPage()
  other = await phone.newPage()
  await signUpByMail(page, { name: 'Everywhere Tester', email, password, role: 'practitioner' })
  expect((await other.request.post('/api/auth/sign-in', { data: { email, password } })).status()).toBe(200)
})
afterAll(async () => {
  await laptop?.close()
  await phone?.close()
})

describe('the account page', () => {
  it('signs out every browser with one button', async () => {
    expect((await other.request.get('/api/banks')).status()).toBe(200)
    await page.goto('/account', { waitUntil: 'networkidle' })
    const button = page.getByRole('button', { name: 'Sign out everywhere' })
    await button.waitFor()
    await screenshot(page, 'account-sessions')
    await button.focus()
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/sign-in/)
    expect((await page.request.get('/api/banks')).status()).toBe(401)
    expect((await other.request.get('/api/banks')).status()).toBe(401)
  })
})
