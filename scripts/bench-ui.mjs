// `npm run bench:ui`: the Bench's speed in Chromium, measured (a benchmark, not a test).
//   1. jumper → reading: from the keystroke that makes a jumper to the new reading painted,
//      median over 50 jumpers (performance marks in the page, two animation frames = painted);
//   2. dragging a unit with 10 units on the canvas: frames per second while it moves (beside
//      the rate with the pointer moving alone; PROFILE_DRAG=FILE saves a CPU profile of it);
//   3. the JavaScript the /bench route loads, gzipped.
// It builds when stale, starts a throwaway MariaDB and the built server, and prints a table
// (or one JSON object with --json).
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { gzipSync } from 'node:zlib'
import { chromium } from 'playwright-core'
import { ensureMariaDB, freePort } from './db.mjs'
import { buildIfStale, ensureNodeModules, startServer } from './setup.mjs'

const json = process.argv.includes('--json')
const log = json ? () => {} : console.log
ensureNodeModules(log)
const { migrateDatabase } = await import('./migrate.mjs')

const scratch = mkdtempSync(join(tmpdir(), 'phaseloom-bench-ui-'))
const db = await ensureMariaDB({ dataDir: join(scratch, 'mariadb'), port: await freePort() })
let server
let context
try {
  await migrateDatabase(db.url)
  await buildIfStale({ log })
  server = await startServer({
    port: await freePort(),
    env: { NUXT_DATABASE_URL: db.url, NUXT_SESSION_PASSWORD: 'phaseloom-bench-session-password-not-secret-0123' },
    logFile: join(scratch, 'server.log'),
  })
  context = await chromium.launchPersistentContext(join(scratch, 'chromium'), {
    executablePath: '/usr/bin/chromium',
    headless: true,
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-background-networking', '--disable-component-update', '--disable-sync', '--no-first-run', '--disable-quic'],
    baseURL: server.baseURL,
    viewport: { width: 1600, height: 1000 },
  })
  const page = await context.newPage()

  // 3. JavaScript loaded by the route
  const scripts = []
  page.on('response', async (response) => {
    if (response.request().resourceType() === 'script') scripts.push(response)
  })
  await page.goto('/bench?starter=closed-delta-240', { waitUntil: 'networkidle' })
  await page.locator('.vue-flow__node').first().waitFor()
  let gzipBytes = 0
  let rawBytes = 0
  for (const r of scripts) {
    const body = await r.body()
    rawBytes += body.length
    gzipBytes += gzipSync(body, { level: 9 }).length
  }

  // 1. jumper → painted reading: a new voltmeter across T1.X1 and, jumper by jumper, T2.X1
  await page.getByTestId('energize').click()
  await page.locator('[data-add-part="voltmeter"]').click()
  const meter = await page.evaluate(() => [...document.querySelectorAll('[data-meter]')].map((e) => e.getAttribute('data-meter')).find((id) => /^M\d+$/.test(id)))
  await page.locator(`[data-terminal="${meter}.a"]`).focus()
  await page.keyboard.press('Enter')
  await page.locator('[data-terminal="T1.X1"]').focus()
  await page.keyboard.press('Enter')
  const drops = await page.evaluate(async (id) => {
    const press = (selector) => {
      const el = document.querySelector(selector)
      el.focus()
      el.dispatchEvent(new KeyboardEvent('keydown', { key: 'Enter', bubbles: true, cancelable: true }))
    }
    const frame = () => new Promise((resolve) => requestAnimationFrame(() => resolve()))
    const reading = () => document.querySelector(`[data-meter="${id}"]`)?.textContent ?? ''
    const waitFor = async (test) => {
      for (let i = 0; i < 600 && !test(); i++) await frame()
      await frame() // the frame that shows it
    }
    const times = []
    for (let i = 0; i < 50; i++) {
      const before = reading()
      performance.mark('drop')
      press(`[data-terminal="${id}.b"]`)
      press('[data-terminal="T2.X1"]')
      await waitFor(() => reading() !== before)
      performance.mark('painted')
      times.push(performance.measure('jumper-to-reading', 'drop', 'painted').duration)
      // take it away again (untimed) for the next jumper
      const tag = [...document.querySelectorAll('[data-jumper]')].find((t) => t.getAttribute('data-jumper').includes(`${id}.b`))
      tag.focus()
      tag.dispatchEvent(new KeyboardEvent('keydown', { key: 'Delete', bubbles: true, cancelable: true }))
      await waitFor(() => reading() === before)
    }
    return times
  }, meter)
  drops.sort((a, b) => a - b)
  const median = drops[Math.floor(drops.length / 2)]

  // 2. drag one unit with 10 units on the canvas
  for (let i = 0; i < 7; i++) await page.locator('[data-add-part="transformer"]').click()
  const units = await page.locator('.vue-flow__node-transformer').count()
  const box = await page.locator('.vue-flow__node-transformer').first().boundingBox()
  // rAF timestamps in the page while the pointer moves: first over the empty pane (what the
  // harness itself allows), then dragging the unit
  const startFrames = () =>
    page.evaluate(() => {
      window.__frames = []
      const tick = (t) => {
        window.__frames.push(t)
        if (window.__frames.length < 100000) window.__frameId = requestAnimationFrame(tick)
      }
      window.__frameId = requestAnimationFrame(tick)
    })
  const framesBetween = (a, b) =>
    page.evaluate(([from, to]) => {
      cancelAnimationFrame(window.__frameId)
      return window.__frames.filter((t) => t >= from && t <= to)
    }, [a, b])
  const now = () => page.evaluate(() => performance.now())
  const rate = (frames) => ((frames.length - 1) * 1000) / (frames.at(-1) - frames[0])

  await startFrames()
  const p0 = await now()
  for (let i = 1; i <= 120; i++) await page.mouse.move(40 + Math.sin(i / 10) * 200, 40 + (i % 40) * 3)
  const idleFps = rate(await framesBetween(p0, await now()))
  await startFrames()
  const start = { x: box.x + box.width / 2, y: box.y + 12 }
  const cdp = process.env.PROFILE_DRAG ? await context.newCDPSession(page) : null
  if (cdp) {
    await cdp.send('Profiler.enable')
    await cdp.send('Profiler.start')
  }
  await page.mouse.move(start.x, start.y)
  await page.mouse.down()
  const t0 = await now()
  for (let i = 1; i <= 120; i++) await page.mouse.move(start.x + Math.sin(i / 10) * 200, start.y + (i % 40) * 3)
  const t1 = await now()
  await page.mouse.up()
  if (cdp) {
    const { profile } = await cdp.send('Profiler.stop')
    writeFileSync(process.env.PROFILE_DRAG, JSON.stringify(profile))
  }
  const moved = await page.locator('.vue-flow__node-transformer').first().boundingBox()
  if (Math.abs(moved.x - box.x) + Math.abs(moved.y - box.y) < 20) throw new Error('the unit did not move: the drag measured nothing')
  const frames = await framesBetween(t0, t1)
  const gaps = frames.slice(1).map((t, i) => t - frames[i]).sort((a, b) => a - b)
  const fps = rate(frames)
  const p95 = gaps[Math.floor(gaps.length * 0.95)]

  const figures = {
    jumperToReadingMedianMs: Number(median.toFixed(1)),
    jumperToReadingMaxMs: Number(drops.at(-1).toFixed(1)),
    jumpers: drops.length,
    dragFps: Number(fps.toFixed(1)),
    pointerOnlyFps: Number(idleFps.toFixed(1)),
    dragFrameP95Ms: Number(p95.toFixed(1)),
    unitsOnCanvas: units,
    benchJsGzipKB: Number((gzipBytes / 1024).toFixed(1)),
    benchJsRawKB: Number((rawBytes / 1024).toFixed(1)),
    scripts: scripts.length,
  }
  if (json) console.log(JSON.stringify(figures))
  else {
    console.log(`
jumper → reading painted: median ${figures.jumperToReadingMedianMs} ms, max ${figures.jumperToReadingMaxMs} ms over ${figures.jumpers} jumpers (target ≤ 50 ms)
dragging a unit, ${units} units on the canvas: ${figures.dragFps} frames/s, 95th-percentile frame ${figures.dragFrameP95Ms} ms (target 60 frames/s; the pointer moving alone: ${figures.pointerOnlyFps} frames/s)
/bench JavaScript: ${figures.benchJsGzipKB} KB gzip (${figures.benchJsRawKB} KB raw, ${figures.scripts} files; target ≤ 300 KB gzip)`)
  }
} finally {
  await context?.close().catch(() => {})
  await server?.stop().catch(() => {})
  await db.stop().catch(() => {})
  rmSync(scratch, { recursive: true, force: true })
}
