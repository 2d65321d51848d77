import { statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page, Response } from 'playwright-core'
import { baseURL, launch, screenshot, type Browser } from './helpers'

let browser: Browser
let page: Page
const fontResponses: Response[] = []

beforeAll(async () => {
  browser = await launch()
  page = await browser.newPage()
  page.on('response', (response) => {
    if (/\.woff2(\?|$)/.test(response.url())) fontResponses.push(response)
  })
  await page.goto('/', { waitUntil: 'load' })
  await page.evaluate(() => document.fonts.ready.then(() => undefined))
})

afterAll(async () => {
  await browser?.close()
})

describe('the start page', () => {
  it('has the product title and the main navigation', async () => {
    expect(await page.title()).toBe('Phaseloom')
    const nav = page.getByRole('navigation', { name: 'Main' })
    const labels = await nav.getByRole('link').allTextContents()
    expect(labels.map(label => label.trim())).toEqual(['Bench', 'Starters', 'Hunts', 'Classes', 'Lab sheets', 'Site check'])
    await expect(page.getByRole('link', { name: 'Sign in' }).getAttribute('href')).resolves.toBe('/sign-in')
  })

  it('has its own icon, served by the app', async () => {
    const href = await page.locator('link[rel="icon"]').getAttribute('href')
    expect(href).toBe('/favicon.svg')
    const icon = await page.request.get(href!)
    expect(icon.status()).toBe(200)
    expect(icon.headers()['content-type']).toMatch(/^image\/svg\+xml/)
  })

  it('shows the safety notice', async () => {
    const footer = await page.locator('footer').innerText()
    expect(footer).toContain('Real banks can kill')
  })

  it('gets IBM Plex Sans and Mono from the app itself', async () => {
    const origin = new URL(baseURL).origin
    expect(fontResponses.length).toBeGreaterThanOrEqual(2)
    for (const response of fontResponses) {
      expect(new URL(response.url()).origin).toBe(origin)
      expect(response.status()).toBe(200)
      expect(response.headers()['content-type']).toMatch(/^font\/woff2/)
    }
    const files = fontResponses.map(response => new URL(response.url()).pathname)
    expect(files.some(file => /ibm-plex-sans/.test(file))).toBe(true)
    expect(files.some(file => /ibm-plex-mono/.test(file))).toBe(true)
    const loaded = await page.evaluate(() => [...document.fonts].filter(font => font.status === 'loaded').map(font => font.family))
    expect(loaded.join(' ')).toMatch(/IBM Plex Sans/)
    expect(loaded.join(' ')).toMatch(/IBM Plex Mono/)
  })

  it('saves a screenshot', async () => {
    const path = await screenshot(page, 'start-page')
    expect(statSync(path).size).toBeGreaterThan(10_000)
  })

  it('moves focus to the skip link first, for keyboard users', async () => {
    await page.keyboard.press('Tab')
    const focused = await page.evaluate(() => document.activeElement?.textContent?.trim())
    expect(focused).toBe('Skip to content')
  })
})

describe('an address that does not exist', () => {
  it('shows the not-found page inside the layout, with status 404', async () => {
    const notFound = await browser.newPage()
    const response = await notFound.goto('/no-such-page')
    expect(response?.status()).toBe(404)
    await expect(notFound.getByRole('heading', { level: 1 }).innerText()).resolves.toBe('No such page')
    expect(await notFound.getByRole('navigation', { name: 'Main' }).isVisible()).toBe(true)
    await screenshot(notFound, 'not-found-page')
    await notFound.close()
  })
})
