// `npm run bench:ui`: the Bench's speed in Chromium, measured (a benchmark, not a test).
//   1. jumper → reading: from the keystroke that makes a jumper to the new reading painted,
//      median over 50 jumpers (performance marks in the page, two animation frames = painted);
//   2. dragging a unit with 10 units on the canvas: frames per second while the unit nearest
//      the middle moves about within the canvas (beside the rate with the pointer moving alone;
//      PROFILE_DRAG=FILE saves a CPU profile of it), and, with no target, while a unit is
//      dragged against the canvas's edge so that the canvas pans under it on every move;
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
  // rAF timestamps in the page while the pointer moves: first over the empty pane (what the
  // harness itself allows), then dragging a unit
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
  const viewport = () => page.evaluate(() => document.querySelector('.vue-flow__transformationpane')?.style.transform ?? '')
  const pane = await page.locator('.vue-flow').boundingBox()
  const unitBoxes = () => page.locator('.vue-flow__node-transformer').evaluateAll((els) => els.map((e) => e.getBoundingClientRect().toJSON()))

  await startFrames()
  const p0 = await now()
  for (let i = 1; i <= 120; i++) await page.mouse.move(40 + Math.sin(i / 10) * 200, 40 + (i % 40) * 3)
  const idleFps = rate(await framesBetween(p0, await now()))

  /**
   * Drags unit `which` by `path(i)` (offsets from its grip, 120 moves) and returns the frame
   * rate, the 95th-percentile frame and whether the canvas panned under it.
   */
  const drag = async (which, path, profile) => {
    const box = (await unitBoxes())[which]
    const start = { x: box.x + box.width / 2, y: box.y + 12 }
    const before = await viewport()
    await startFrames()
    const cdp = profile ? await context.newCDPSession(page) : null
    if (cdp) {
      await cdp.send('Profiler.enable')
      await cdp.send('Profiler.start')
    }
    await page.mouse.move(start.x, start.y)
    await page.mouse.down()
    const t0 = await now()
    for (let i = 1; i <= 120; i++) {
      const d = path(i)
      await page.mouse.move(start.x + d.x, start.y + d.y)
    }
    const t1 = await now()
    await page.mouse.up()
    if (cdp) {
      const { profile: cpu } = await cdp.send('Profiler.stop')
      writeFileSync(profile, JSON.stringify(cpu))
    }
    const moved = (await unitBoxes())[which]
    if (Math.abs(moved.x - box.x) + Math.abs(moved.y - box.y) < 20) throw new Error('the unit did not move: the drag measured nothing')
    const frames = await framesBetween(t0, t1)
    const gaps = frames.slice(1).map((t, i) => t - frames[i]).sort((a, b) => a - b)
    return { fps: rate(frames), p95: gaps[Math.floor(gaps.length * 0.95)], panned: (await viewport()) !== before }
  }

  // 2a. the target: the unit nearest the middle of the canvas, moved about within it (±150 px
  // across, ±60 px down and up), never near an edge, so the canvas stays where it is
  const middle = { x: pane.x + pane.width / 2, y: pane.y + pane.height / 2 }
  const boxes = await unitBoxes()
  const centre = (b) => ({ x: b.x + b.width / 2, y: b.y + b.height / 2 })
  const nearest = boxes.reduce((best, b, k) => (Math.hypot(centre(b).x - middle.x, centre(b).y - middle.y) < Math.hypot(centre(boxes[best]).x - middle.x, centre(boxes[best]).y - middle.y) ? k : best), 0)
  const within = await drag(nearest, (i) => ({ x: Math.sin(i / 10) * 150, y: Math.sin(i / 7) * 60 }), process.env.PROFILE_DRAG)
  if (within.panned) throw new Error('the canvas panned during the drag within it: the figure would not be the one it claims to be')

  // 2b. beside it, no target: a unit dragged against the left edge of the canvas, so that the
  // canvas pans under the pointer on every move (the whole canvas is painted afresh each frame)
  const edgeBox = (await unitBoxes())[0]
  // from its grip to 10 px inside the canvas's left edge, 20 px a move, then to and fro there
  const toEdge = pane.x + 10 - (edgeBox.x + edgeBox.width / 2)
  const edge = await drag(0, (i) => ({ x: Math.max(toEdge, -20 * i) + Math.sin(i) * 6, y: 0 }))

  const figures = {
    jumperToReadingMedianMs: Number(median.toFixed(1)),
    jumperToReadingMaxMs: Number(drops.at(-1).toFixed(1)),
    jumpers: drops.length,
    dragFps: Number(within.fps.toFixed(1)),
    pointerOnlyFps: Number(idleFps.toFixed(1)),
    dragFrameP95Ms: Number(within.p95.toFixed(1)),
    dragAtEdgeFps: Number(edge.fps.toFixed(1)),
    dragAtEdgePanned: edge.panned,
    unitsOnCanvas: units,
    benchJsGzipKB: Number((gzipBytes / 1024).toFixed(1)),
    benchJsRawKB: Number((rawBytes / 1024).toFixed(1)),
    scripts: scripts.length,
  }
  if (json) console.log(JSON.stringify(figures))
  else {
    console.log(`
jumper → reading painted: median ${figures.jumperToReadingMedianMs} ms, max ${figures.jumperToReadingMaxMs} ms over ${figures.jumpers} jumpers (target ≤ 50 ms)
dragging a unit about the canvas, ${units} units on it: ${figures.dragFps} frames/s, 95th-percentile frame ${figures.dragFrameP95Ms} ms (target 60 frames/s; the pointer moving alone: ${figures.pointerOnlyFps} frames/s)
dragging a unit against the canvas's edge, the canvas panning under it: ${figures.dragAtEdgeFps} frames/s (no target${figures.dragAtEdgePanned ? '' : '; it did not pan'})
/bench JavaScript: ${figures.benchJsGzipKB} KB gzip (${figures.benchJsRawKB} KB raw, ${figures.scripts} files; target ≤ 300 KB gzip)`)
  }
} finally {
  await context?.close().catch(() => {})
  await server?.stop().catch(() => {})
  await db.stop().catch(() => {})
  rmSync(scratch, { recursive: true, force: true })
}
