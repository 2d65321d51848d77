// The Bench by keyboard: Tab travels the parts and their terminals in reading order before
// the jumper tags, and the focus stays put (or moves next door) after undo, redo and save.
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
  await page.locator('[data-jumper]').first().waitFor()
}

/** What has the focus, in a few words: "part:T1", "terminal:T1.H1", "jumper:...", "testid:undo", or the tag. */
const focused = () =>
  page.evaluate(() => {
    const el = document.activeElement as HTMLElement | null
    if (!el || el === document.body) return 'body'
    if (el.dataset.terminal) return `terminal:${el.dataset.terminal}`
    if (el.dataset.jumper) return `jumper:${el.dataset.jumper}`
    if (el.classList.contains('vue-flow__node')) return `part:${el.dataset.id}`
    if (el.dataset.testid) return `testid:${el.dataset.testid}`
    return `${el.tagName.toLowerCase()}:${el.getAttribute('aria-label') ?? el.textContent?.trim() ?? ''}`
  })

async function keyboardJumper(a: string, b: string) {
  await page.locator(`[data-terminal="${a}"]`).focus()
  await page.keyboard.press('Enter')
  await page.locator(`[data-terminal="${b}"]`).focus()
  await page.keyboard.press('Enter')
  await page.locator(`[data-jumper="${[a, b].sort().join('~')}"]`).waitFor()
}

describe('the Bench by keyboard', () => {
  it('Tab goes through the parts and their terminals in reading order, then the jumper tags, then the zoom buttons', async () => {
    await openStarter('delta-wye-208y120')
    // the last control before the canvas: the tray's last button
    await page.locator('[data-add-part]').last().focus()
    const stops: string[] = []
    for (let i = 0; i < 200; i++) {
      await page.keyboard.press('Tab')
      const f = await focused()
      stops.push(f)
      if (f === 'button:Zoom in') break
    }
    expect(stops.at(-1)).toBe('button:Zoom in')
    const parts = stops.filter((s) => s.startsWith('part:')).map((s) => s.slice(5))
    const firstTag = stops.findIndex((s) => s.startsWith('jumper:'))
    const lastTerminal = stops.findLastIndex((s) => s.startsWith('terminal:') || s.startsWith('part:'))
    // every part and terminal before the first jumper tag, and the tags all together after them
    expect(firstTag).toBeGreaterThan(lastTerminal)
    expect(stops.slice(firstTag, -1).every((s) => s.startsWith('jumper:'))).toBe(true)
    expect(stops.slice(firstTag, -1)).toHaveLength(await page.locator('[data-jumper]').count())
    // the parts in reading order: as they stand on the screen, row by row, left to right
    const boxes = await page.locator('.vue-flow__node').evaluateAll((els) =>
      els.map((el) => ({ id: (el as HTMLElement).dataset.id!, ...el.getBoundingClientRect().toJSON() as { x: number; y: number } })),
    )
    const onScreen = [...boxes].sort((p, q) => (Math.abs(p.y - q.y) < 30 ? p.x - q.x : p.y - q.y)).map((b) => b.id)
    expect(parts).toEqual(onScreen)
    expect(parts.slice(0, 3)).toEqual(['S1', 'CB1', 'F1'])
    // each part's terminals follow it: T1, then H1, H2, X1 … X4
    const t1 = stops.indexOf('part:T1')
    expect(stops.slice(t1, t1 + 7)).toEqual(['part:T1', 'terminal:T1.H1', 'terminal:T1.H2', 'terminal:T1.X1', 'terminal:T1.X2', 'terminal:T1.X3', 'terminal:T1.X4'])
    // Shift+Tab walks back from the first tag to the last part's last terminal
    await page.locator(`[data-jumper="${stops[firstTag]!.slice(7)}"]`).focus()
    await page.keyboard.press('Shift+Tab')
    expect(await focused()).toBe(stops[firstTag - 1])
  })

  it('undo and redo from the toolbar keep the focus on the button used, down to the last step', async () => {
    await openStarter('closed-delta-240')
    await keyboardJumper('T1.H1', 'T1.H2')
    await page.getByTestId('undo').focus()
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('[data-jumper="T1.H1~T1.H2"]').count()).toBe(0)
    // nothing left to undo: the button says so, and still has the focus
    expect(await page.getByTestId('undo').getAttribute('aria-disabled')).toBe('true')
    expect(await focused()).toBe('testid:undo')
    await page.keyboard.press('Enter')
    expect(await focused()).toBe('testid:undo')
    await page.keyboard.press('Tab')
    expect(await focused()).toBe('testid:redo')
    await page.keyboard.press('Enter')
    await expect.poll(() => page.locator('[data-jumper="T1.H1~T1.H2"]').count()).toBe(1)
    expect(await focused()).toBe('testid:redo')
    expect(await page.getByTestId('redo').getAttribute('aria-disabled')).toBe('true')
  })

  it('Ctrl+Z on a jumper tag takes the jumper away and leaves the focus on its terminal; Ctrl+Y brings both back', async () => {
    await openStarter('closed-delta-240')
    await keyboardJumper('T1.H1', 'T1.H2')
    await page.locator('[data-jumper="T1.H1~T1.H2"]').focus()
    await page.keyboard.press('Control+z')
    await expect.poll(() => page.locator('[data-jumper="T1.H1~T1.H2"]').count()).toBe(0)
    await expect.poll(focused).toBe('terminal:T1.H1')
    await page.keyboard.press('Control+y')
    await expect.poll(() => page.locator('[data-jumper="T1.H1~T1.H2"]').count()).toBe(1)
    // the focus stays where it was put, on the terminal: it is not pulled anywhere
    expect(await focused()).toBe('terminal:T1.H1')
  })

  it('Ctrl+Z of a move to another row keeps the focus on the part moved', async () => {
    await openStarter('closed-delta-240')
    const part = page.locator('.vue-flow__node[data-id="T1"]')
    const order = () => page.locator('.vue-flow__node').evaluateAll((els) => els.map((el) => (el as HTMLElement).dataset.id))
    // the part's place on the canvas (Vue Flow snaps the first drawing to its 9 px grid)
    const where = () => part.evaluate((el) => Math.round(Number(/translate\([^,]+,\s*([-\d.]+)px/.exec((el as HTMLElement).style.transform)?.[1]) / 9))
    const before = await where()
    expect((await order()).indexOf('T1')).toBeGreaterThan((await order()).indexOf('S1'))
    const box = (await part.boundingBox())!
    await page.mouse.move(box.x + box.width / 2, box.y + 12)
    await page.mouse.down()
    await page.mouse.move(box.x + box.width / 2 - 40, box.y - 300, { steps: 12 })
    await page.mouse.up()
    // moved to the top row, left of the supply: first in the Tab order
    await expect.poll(async () => (await order())[0]).toBe('T1')
    await part.focus()
    await page.keyboard.press('Control+z')
    await expect.poll(where).toBe(before)
    await expect.poll(async () => (await order()).indexOf('T1')).toBeGreaterThan((await order()).indexOf('S1'))
    await expect.poll(focused).toBe('part:T1')
  })

  it('saving keeps the focus on Save, the first save (a new address) too', async () => {
    await page.goto('/sign-in')
    await page.getByLabel('E-mail').fill('practitioner@phaseloom.test')
    await page.getByLabel('Password').fill('phaseloom-demo')
    await page.getByLabel('Password').press('Enter')
    await page.waitForURL((url) => !url.pathname.startsWith('/sign-in'))
    await openStarter('open-delta-240')
    await page.locator('#bank-name').fill(`Keyboard bank ${Date.now()}`)
    await page.locator('#bank-name').press('Enter')
    await page.getByTestId('save').focus()
    await page.keyboard.press('Enter')
    await page.waitForURL(/\/bench\/\d+$/)
    await expect.poll(() => page.getByTestId('save').textContent()).toMatch(/Saved/)
    await expect.poll(focused).toBe('testid:save')
    // and a save of a bank that has its address already
    await keyboardJumper('T1.H1', 'T1.H2')
    await page.getByTestId('save').focus()
    await page.keyboard.press('Enter')
    await expect.poll(() => page.getByTestId('save').textContent()).toMatch(/Saved/)
    expect(await focused()).toBe('testid:save')
    await screenshot(page, 'bench-keyboard-saved')
  })
})
