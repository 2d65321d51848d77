// Chromium for the browser tests: Debian's /usr/bin/chromium driven by playwright-core,
// a fresh profile per launch, pages pointed at the run's built server.
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { confirmToken, signUpMail } from '../api/people'

export const baseURL = process.env.PHASELOOM_BASE_URL ?? ''
if (!baseURL) {
  throw new Error('PHASELOOM_BASE_URL is not set: run the browser tests through `npm test` (scripts/test.mjs).')
}

export const resultsDir = fileURLToPath(new URL('../../test-results/', import.meta.url))

const chromiumArgs = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
  '--disable-quic',
]

export interface Browser {
  context: BrowserContext
  newPage: () => Promise<Page>
  close: () => Promise<void>
}

/** Launch Chromium with a throwaway --user-data-dir; close() removes it. */
export async function launch(): Promise<Browser> {
  const userDataDir = mkdtempSync(join(tmpdir(), 'phaseloom-chromium-'))
  // playwright passes userDataDir to Chromium as --user-data-dir
  const context = await chromium.launchPersistentContext(userDataDir, {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: chromiumArgs,
    baseURL,
    viewport: { width: 1280, height: 800 },
  })
  return {
    context,
    newPage: () => context.newPage(),
    async close() {
      await context.close()
      rmSync(userDataDir, { recursive: true, force: true })
    },
  }
}

/**
 * Chromium with one page at 1600 × 1000, as the Bench tests use it: leaving an edited, unsaved
 * bank asks first (beforeunload), and the tests accept and move on.
 */
export async function launchBenchPage(): Promise<{ browser: Browser, page: Page }> {
  const browser = await launch()
  const page = await browser.newPage()
  await page.setViewportSize({ width: 1600, height: 1000 })
  page.on('dialog', dialog => void dialog.accept())
  return { browser, page }
}

/** Save a full-page screenshot as test-results/<name>.png and return its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(resultsDir, { recursive: true })
  const path = join(resultsDir, `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}

/**
 * Makes an account through the API as the sign-up page does, follows the mailed link (read
 * from the mail catcher) and leaves `page`'s browser signed in as it.
 */
export async function signUpByMail(page: Page, body: { name: string, email: string, password: string, role: 'student' | 'practitioner' }): Promise<void> {
  const sent = await page.request.post('/api/auth/sign-up', { data: body })
  if (sent.status() !== 202) throw new Error(`sign-up answered ${sent.status()}: ${await sent.text()}`)
  const made = await page.request.post('/api/auth/confirm-sign-up', { data: { token: confirmToken(await signUpMail(body.email)) } })
  if (made.status() !== 201) throw new Error(`confirm-sign-up answered ${made.status()}: ${await made.text()}`)
}
