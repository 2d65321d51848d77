// An instructor makes a class, hides a reversed unit in one of their banks, and publishes the
// hunt; a new student joins with the class code, finds it under "Hunts for you" and starts it.
// The student's page never asks for the author's routes, and no answer to it names a fault.
import { statSync } from 'node:fs'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type { Page, Response } from 'playwright-core'
import { starterBySlug } from '../../shared/starters'
import { firstLink, mailTo } from '../api/people'
import { launch, screenshot, type Browser } from './helpers'

const stamp = Date.now()
const className = `Bay 3 apprentices ${stamp}`
const bankName = `Hunt source bank ${stamp}`
const huntTitle = `Which unit is backwards? ${stamp}`
const studentEmail = `hunt-browser-${stamp}@riverbend.test`

let teacherBrowser: Browser
let studentBrowser: Browser
let teacher: Page
let student: Page
let joinCode = ''
let huntPath = ''
const studentAnswers: Response[] = []
const exactly = (text: string) => new RegExp(text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'))

beforeAll(async () => {
  teacherBrowser = await launch()
  studentBrowser = await launch()
  teacher = await teacherBrowser.newPage()
  student = await studentBrowser.newPage()
  student.on('response', r => { if (new URL(r.url()).pathname.startsWith('/api/')) studentAnswers.push(r) })
})

afterAll(async () => {
  await teacherBrowser?.close()
  await studentBrowser?.close()
})

describe('a fault hunt from class to start', () => {
  it('lets the instructor make a class and shows its join code', async () => {
    await teacher.goto('/classes')
    await teacher.waitForURL(/\/sign-in\?next=/)
    await teacher.getByLabel('E-mail').fill('instructor@phaseloom.test')
    await teacher.getByLabel('Password').fill('phaseloom-demo')
    await teacher.getByLabel('Password').press('Enter')
    await teacher.waitForURL(/\/classes$/)
    await teacher.getByRole('heading', { name: 'New class' }).waitFor()
    await teacher.getByLabel('Class name').fill(className)
    await teacher.getByLabel('Term').fill('Winter 2027')
    expect(await teacher.getByLabel('Lab sheet tolerance').inputValue()).toBe('5')
    await teacher.getByRole('button', { name: 'Make the class' }).click()
    await teacher.waitForURL(/\/classes\/\d+$/)
    await teacher.getByRole('heading', { level: 1, name: className }).waitFor()
    joinCode = (await teacher.getByTestId('join-code').innerText()).trim()
    expect(joinCode).toMatch(/^[A-HJ-NP-Z2-9]{8}$/)
  })

  it('lets a new student join with the code', async () => {
    await student.goto('/sign-up?next=/classes')
    await student.getByLabel('Name').fill('Ines Moreau')
    await student.getByLabel('E-mail').fill(studentEmail)
    await student.getByLabel('Password').fill('a long enough password')
    await student.getByRole('button', { name: /make|create|sign up/i }).click()
    await student.getByRole('heading', { name: 'Check your e-mail' }).waitFor()
    // the mailed link carries the page to come back to
    await student.goto(firstLink((await mailTo(studentEmail)).text).href)
    await student.waitForURL(/\/classes$/)
    // typed in lower case: the form and the server take it as the instructor wrote it
    await student.getByLabel('Class code').fill(joinCode.toLowerCase())
    await student.getByRole('button', { name: 'Join the class' }).click()
    await student.waitForURL(/\/classes\/\d+$/)
    await student.getByRole('heading', { level: 1, name: className }).waitFor()
    expect(await student.locator('main').innerText()).toContain('Instructor: Desmond Varga')
    // a member sees neither the roster nor the code
    expect(await student.getByTestId('join-code').count()).toBe(0)
    expect(await student.getByTestId('roster').count()).toBe(0)
  })

  it('lets the instructor write a hunt with a reversed unit and publish it to the class', async () => {
    // the student who joined is on the roster, with no attempts yet
    await teacher.reload()
    const member = teacher.getByTestId('roster').getByRole('row', { name: /Ines Moreau/ })
    await member.waitFor()
    expect(await member.innerText()).toContain(studentEmail)
    expect(await member.innerText()).toContain('None yet')
    expect(await screenshot(teacher, 'class-teach')).toMatch(/class-teach\.png$/)

    const practice = starterBySlug('closing-check-practice')!.document
    const bank = await teacher.request.post('/api/banks', { data: { name: bankName, document: { ...practice, name: bankName } } })
    expect(bank.status()).toBe(201)

    await teacher.goto('/hunts')
    await teacher.getByRole('link', { name: 'New fault hunt' }).click()
    await teacher.waitForURL(/\/hunts\/new$/)
    await teacher.getByLabel('Start from the bank').selectOption({ label: bankName })
    const row = teacher.locator('[data-fault-row="0"]')
    await row.getByLabel('Unit').locator('option[value="T3"]').waitFor({ state: 'attached' })
    await row.getByLabel('What is wrong').selectOption({ label: 'Secondary leads marked backwards' })
    await row.getByLabel('Unit').selectOption('T2')
    await teacher.getByLabel('Title').fill(huntTitle)
    await teacher.getByLabel('Instructions for the students').fill('Take the closing check before you close the last corner.')
    await teacher.getByLabel('Probe budget').fill('25')
    expect(await screenshot(teacher, 'hunt-new')).toMatch(/hunt-new\.png$/)
    await teacher.getByRole('button', { name: 'Save the hunt' }).click()
    await teacher.waitForURL(/\/hunts\/\d+$/)
    huntPath = new URL(teacher.url()).pathname
    await teacher.getByRole('heading', { level: 1, name: huntTitle }).waitFor()
    expect(await teacher.getByTestId('hunt-faults').innerText()).toBe('T2: Secondary leads marked backwards')

    await teacher.getByRole('checkbox', { name: exactly(className) }).check()
    await teacher.getByRole('button', { name: 'Publish and mail the students' }).click()
    await teacher.getByText(`Published to ${className}. 1 student was mailed.`).waitFor()
    await teacher.getByRole('row', { name: /Ines Moreau/ }).getByText('Not started').waitFor()
    const path = await screenshot(teacher, 'hunt-author')
    expect(statSync(path).size).toBeGreaterThan(10_000)
  })

  it('shows the student the hunt under "Hunts for you", and Start opens the attempt', async () => {
    await student.goto('/hunts')
    const mine = student.getByRole('region', { name: 'Hunts for you' })
    const listed = mine.getByRole('row', { name: exactly(huntTitle) })
    await listed.waitFor()
    expect(await listed.innerText()).toContain('Desmond Varga')
    expect(await listed.innerText()).toContain('Not started')
    await listed.getByRole('link', { name: huntTitle }).click()
    await student.waitForURL(new RegExp(`${huntPath}$`))
    await student.getByRole('heading', { level: 1, name: huntTitle }).waitFor()
    const brief = await student.locator('main').innerText()
    expect(brief).toContain('25 probes')
    expect(brief).toContain('Real banks can kill')
    expect(brief).toContain('lock out and verify absence of voltage')
    const path = await screenshot(student, 'hunt-student-brief')
    expect(statSync(path).size).toBeGreaterThan(10_000)

    await student.getByRole('button', { name: 'Start the hunt' }).click()
    // the Bench page of an attempt is another piece of work: only the address is asserted
    await student.waitForURL(/\/attempts\/\d+$/)
  })

  it('shows the instructor the attempt in the results, with the chart described by the table', async () => {
    await teacher.reload()
    await teacher.getByRole('row', { name: /Ines Moreau/ }).getByText('In progress').waitFor()
    const chart = teacher.getByTestId('results-chart').locator('canvas')
    await chart.waitFor()
    expect(await chart.getAttribute('role')).toBe('img')
    expect(await chart.getAttribute('aria-label')).toContain('The same figures are in the results table')
    const tableId = await chart.getAttribute('aria-describedby')
    expect(await teacher.locator(`table[id="${tableId}"]`).count()).toBe(1)
    const csv = await teacher.request.get(await teacher.getByRole('link', { name: 'Download CSV' }).getAttribute('href') ?? '')
    expect(csv.headers()['content-type']).toContain('text/csv')
    expect(await csv.text()).toContain(`Ines Moreau,${studentEmail},in-progress,0,`)
    const path = await screenshot(teacher, 'hunt-results')
    expect(statSync(path).size).toBeGreaterThan(10_000)
  })

  it('never asked the author\'s routes for the student, and no answer named the fault', async () => {
    const huntId = huntPath.split('/').pop()
    const paths = studentAnswers.map(r => `${r.request().method()} ${new URL(r.url()).pathname}`)
    expect(paths).toContain(`GET /api/hunts/${huntId}`)
    expect(paths).toContain(`POST /api/hunts/${huntId}/attempts`)
    expect(paths.filter(p => p.startsWith('GET /api/banks') || p === `GET /api/hunts/${huntId}/attempts` || p.includes('/publish'))).toEqual([])
    for (const answer of studentAnswers) {
      const text = await answer.text().catch(() => '')
      expect(text).not.toContain('secondary-reversed')
      expect(text).not.toContain('"faults"')
    }
    // the page payload of a server-rendered hunt page carries only the student's view too
    const html = await (await student.request.get(huntPath)).text()
    expect(html).toContain(huntTitle)
    expect(html).not.toContain('secondary-reversed')
  })
})
