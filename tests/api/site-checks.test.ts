// Site check routes: who may use them (auth before the body), 400s naming the JSON path,
// saving as a bank of kind 'site-check' listed in My banks, the plan and the PDF.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { banks } from '../../server/db/schema'
import { exampleSiteCheck, planSiteCheck, volts } from '../../shared/site-check'
import { pdfText } from '../support/pdf'
import { api, baseURL, databaseURL } from './helpers'
import { newPerson, type Person } from './people'

const db = createDB(databaseURL, { connectionLimit: 2 })
const people: Partial<Record<'student' | 'instructor' | 'practitioner' | 'admin', Person>> = {}
const input = { ...exampleSiteCheck(), name: 'Mill road high-leg (api test)' }

beforeAll(async () => {
  for (const role of ['student', 'instructor', 'practitioner', 'admin'] as const) people[role] = await newPerson(role, databaseURL, `site-check-${role}`)
})
afterAll(async () => {
  await db.$client.end()
})

const routes = ['/api/site-checks', '/api/site-checks/plan', '/api/site-checks/pdf']

describe('who may use the Site check routes', () => {
  it.each(routes)('%s: signed out is 401, even with a bad body (auth before the body)', async (path) => {
    expect((await api(path, { method: 'POST', json: { connection: 'nonsense' } })).status).toBe(401)
    expect((await api(path, { method: 'POST', json: input })).status).toBe(401)
  })
  it.each(routes.flatMap((path) => (['student', 'admin'] as const).map((role) => [path, role] as const)))('%s: a %s is 403', async (path, role) => {
    expect((await people[role]!.call(path, { method: 'POST', json: input })).status).toBe(403)
    expect((await people[role]!.call(path, { method: 'POST', json: { units: 'x' } })).status).toBe(403)
  })
  it.each(['practitioner', 'instructor'] as const)('a %s may plan', async (role) => {
    const r = await people[role]!.call('/api/site-checks/plan', { method: 'POST', json: input })
    expect(r.status).toBe(200)
    expect(r.body.testPoints).toEqual(planSiteCheck(input).testPoints)
  })
})

describe('bad input is a 400 naming the JSON path', () => {
  it.each([
    ['a negative unit kVA', { ...input, units: [{ ...input.units[0]!, kva: -5 }, input.units[1], input.units[2]] }, 'units[0].kva'],
    ['an unknown connection', { ...input, connection: 'zig-zag' }, 'connection'],
    ['a supply above 1000 V', { ...input, supply: { ...input.supply, lineVolts: 4160 } }, 'supply.lineVolts'],
    ['lighting on a closed delta', { ...input, connection: 'closed-delta', loads: { ...input.loads, lightingKva: 5 } }, 'loads.lightingKva'],
    ['two units for a high-leg delta', { ...input, units: input.units.slice(0, 2) }, 'units'],
    ['a coil voltage that is text', { ...input, units: [input.units[0], input.units[1], { ...input.units[2]!, secondaryVolts: ['120', 120] }] }, 'units[2].secondaryVolts[0]'],
    ['no name', { ...input, name: '' }, 'name'],
  ])('%s', async (_, body, path) => {
    for (const route of routes) {
      const r = await people.practitioner!.call(route, { method: 'POST', json: body })
      expect(r.status, route).toBe(400)
      expect(r.body.data.errors.map((e: { path: string }) => e.path), route).toContain(path)
    }
  })
  it('a body that is not a JSON object', async () => {
    const r = await people.practitioner!.call('/api/site-checks', { method: 'POST', json: [1, 2] })
    expect(r.status).toBe(400)
    expect(r.body.data.errors[0].path).toBe('(body)')
  })
})

describe('saving a site check with the user\'s banks', () => {
  let id = 0
  beforeAll(async () => {
    const r = await people.practitioner!.call('/api/site-checks', { method: 'POST', json: input })
    expect(r.status).toBe(201)
    expect(r.body).toEqual({ id: expect.any(Number), version: 1 })
    id = r.body.id
  })
  it('is stored as a bank of kind site-check; a bank saved the ordinary way stays kind bank', async () => {
    const [row] = await db.select().from(banks).where(eq(banks.id, id))
    expect(row!.kind).toBe('site-check')
    expect(row!.ownerId).toBe(people.practitioner!.id)
    const plain = await people.practitioner!.call('/api/banks', { method: 'POST', json: { name: 'plain bank (site check api test)', document: planSiteCheck(input).document } })
    const [other] = await db.select().from(banks).where(eq(banks.id, plain.body.id))
    expect(other!.kind).toBe('bank')
  })
  it('is listed in My banks with its kind', async () => {
    const r = await people.practitioner!.call('/api/banks?q=Mill%20road')
    expect(r.status).toBe(200)
    expect(r.body.items).toEqual([expect.objectContaining({ id, name: input.name, kind: 'site-check' })])
  })
  it('opens as a valid circuit document that keeps the inputs (for the Bench and for reopening in the Site check)', async () => {
    const r = await people.practitioner!.call(`/api/banks/${id}`)
    expect(r.body.kind).toBe('site-check')
    expect(r.body.document.siteCheck).toEqual(input)
    const solved = await api('/api/solve', { method: 'POST', json: r.body.document })
    expect(solved.status).toBe(200)
    expect(solved.body.energized).toBe(false) // the main breaker starts open
  })
  it('a duplicate is a site check too', async () => {
    const r = await people.practitioner!.call(`/api/banks/${id}/duplicate`, { method: 'POST' })
    const [row] = await db.select().from(banks).where(eq(banks.id, r.body.id))
    expect(row!.kind).toBe('site-check')
  })
  it('another user cannot read it', async () => {
    expect((await people.instructor!.call(`/api/banks/${id}`)).status).toBe(404)
  })
})

describe('the PDF', () => {
  it('is an attachment of type application/pdf whose text holds every expected reading', async () => {
    const response = await fetch(new URL('/api/site-checks/pdf', baseURL), {
      method: 'POST',
      headers: { cookie: people.instructor!.cookie, 'content-type': 'application/json' },
      body: JSON.stringify(input),
    })
    expect(response.status).toBe(200)
    expect(response.headers.get('content-type')).toContain('application/pdf')
    expect(response.headers.get('content-disposition')).toMatch(/^attachment; filename="site-check-mill-road-high-leg-api-test\.pdf"$/)
    const pdf = new Uint8Array(await response.arrayBuffer())
    expect(Buffer.from(pdf.slice(0, 5)).toString()).toBe('%PDF-')
    const text = pdfText(pdf)
    for (const p of planSiteCheck(input).testPoints) expect(text).toContain(`${p.leads[0]} to ${p.leads[1]}`)
    for (const v of new Set(planSiteCheck(input).testPoints.map((p) => volts(p.expectedVolts)))) expect(text).toContain(v)
    expect(text).toContain(people.instructor!.name)
  })
})
