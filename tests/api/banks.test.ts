// Saved banks: owners only (another's bank is a 404), optimistic concurrency, delete and
// restore, duplicate, share links.
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { eq } from 'drizzle-orm'
import { createDB } from '../../server/db/client'
import { banks } from '../../server/db/schema'
import { api, databaseURL } from './helpers'
import { newPerson, type Person } from './people'
import starter from '../../examples/one-unit-series.json'

const db = createDB(databaseURL, { connectionLimit: 2 })
let owner: Person
let intruder: Person
let bankId = 0

beforeAll(async () => {
  owner = await newPerson('student', databaseURL, 'banks-owner')
  intruder = await newPerson('practitioner', databaseURL, 'banks-intruder')
  const created = await owner.call('/api/banks', { method: 'POST', json: { name: 'Bay 4 wye–delta', document: starter } })
  expect(created.status).toBe(201)
  expect(created.body).toEqual({ id: expect.any(Number), version: 1 })
  bankId = created.body.id
})

afterAll(async () => {
  await db.$client.end()
})

async function stored(id: number) {
  const [row] = await db.select().from(banks).where(eq(banks.id, id))
  return row!
}

describe('another user\'s bank', () => {
  it.each([
    ['read', 'GET', ''],
    ['change', 'PATCH', ''],
    ['duplicate', 'POST', '/duplicate'],
    ['share', 'POST', '/share'],
    ['revoke the share of', 'DELETE', '/share'],
    ['delete', 'DELETE', ''],
    ['restore', 'POST', '/restore'],
  ])('cannot be %s: 404, as if it did not exist', async (_what, method, suffix) => {
    const before = await stored(bankId)
    const json = method === 'PATCH' ? { name: 'taken over', document: { ...starter, name: 'taken over' }, version: before.version } : undefined
    const response = await intruder.call(`/api/banks/${bankId}${suffix}`, { method, json })
    expect(response.status).toBe(404)
    // the same answer as for an id no one has
    const missing = await intruder.call(`/api/banks/2147483600${suffix}`, { method, json })
    expect(missing.status).toBe(404)
    expect(response.body.statusMessage).toBe(missing.body.statusMessage)
    const after = await stored(bankId)
    expect(after).toEqual(before)
  })

  it('does not show in the other user\'s list', async () => {
    const list = await intruder.call('/api/banks?pageSize=100')
    expect(list.status).toBe(200)
    expect(list.body.items.map((item: { id: number }) => item.id)).not.toContain(bankId)
  })
})

describe('saving with a stale version', () => {
  it('answers 409 with the current version and overwrites nothing', async () => {
    const first = await owner.call(`/api/banks/${bankId}`, { method: 'PATCH', json: { document: { ...starter, name: 'first save' }, version: 1 } })
    expect(first.status).toBe(200)
    expect(first.body).toEqual({ id: bankId, version: 2 })
    const before = await stored(bankId)

    const stale = await owner.call(`/api/banks/${bankId}`, { method: 'PATCH', json: { name: 'stale rename', document: { ...starter, name: 'stale save' }, version: 1 } })
    expect(stale.status).toBe(409)
    expect(stale.body.data.currentVersion).toBe(2)
    expect(stale.body.data.errors[0].path).toBe('version')

    const after = await stored(bankId)
    expect(after.document).toEqual({ ...starter, name: 'first save' })
    expect(after.name).toBe(before.name)
    expect(after.version).toBe(2)
    const read = await owner.call(`/api/banks/${bankId}`)
    expect(read.body).toMatchObject({ id: bankId, name: 'Bay 4 wye–delta', version: 2, document: { name: 'first save' } })
  })
})

describe('a user\'s own banks', () => {
  it('lists, searches, sorts and pages them', async () => {
    for (const name of ['Zeta open delta', 'Alpha high leg', 'Outbound test bay', 'Mid 100% test_bank']) {
      expect((await owner.call('/api/banks', { method: 'POST', json: { name, document: starter } })).status).toBe(201)
    }
    const byName = await owner.call('/api/banks?sort=name&order=asc&pageSize=2&page=1')
    expect(byName.status).toBe(200)
    expect(byName.body.total).toBe(5)
    expect(byName.body.items.map((item: { name: string }) => item.name)).toEqual(['Alpha high leg', 'Bay 4 wye–delta'])
    const page2 = await owner.call('/api/banks?sort=name&order=asc&pageSize=2&page=2')
    expect(page2.body.items.map((item: { name: string }) => item.name)).toEqual(['Mid 100% test_bank', 'Outbound test bay'])
    // LIKE wildcards in the search are taken literally
    const percent = await owner.call(`/api/banks?q=${encodeURIComponent('100%')}`)
    expect(percent.body.items.map((item: { name: string }) => item.name)).toEqual(['Mid 100% test_bank'])
    const underscore = await owner.call('/api/banks?q=t_b')
    expect(underscore.body.items.map((item: { name: string }) => item.name)).toEqual(['Mid 100% test_bank'])
    const newest = await owner.call('/api/banks?pageSize=1')
    expect(newest.body.items[0].name).toBe('Mid 100% test_bank')
  })

  it('deletes softly, lists the recently deleted, and restores', async () => {
    const doomed = (await owner.call('/api/banks', { method: 'POST', json: { name: 'Doomed bank', document: starter } })).body.id
    expect((await owner.call(`/api/banks/${doomed}`, { method: 'DELETE' })).status).toBe(204)
    expect((await owner.call(`/api/banks/${doomed}`)).status).toBe(404)
    expect((await owner.call(`/api/banks/${doomed}`, { method: 'DELETE' })).status).toBe(404)
    const deleted = await owner.call('/api/banks?deleted=1')
    expect(deleted.body.items.map((item: { id: number }) => item.id)).toContain(doomed)
    expect(deleted.body.items.find((item: { id: number }) => item.id === doomed).deletedAt).toEqual(expect.any(String))
    expect((await owner.call('/api/banks?q=Doomed')).body.total).toBe(0)
    const restored = await owner.call(`/api/banks/${doomed}/restore`, { method: 'POST' })
    expect(restored.status).toBe(200)
    expect((await owner.call(`/api/banks/${doomed}`)).status).toBe(200)
  })

  it('cannot restore a bank deleted more than 30 days ago', async () => {
    const old = (await owner.call('/api/banks', { method: 'POST', json: { name: 'Long gone', document: starter } })).body.id
    await db.update(banks).set({ deletedAt: new Date(Date.now() - 31 * 86400_000) }).where(eq(banks.id, old))
    expect((await owner.call('/api/banks?deleted=1')).body.items.map((item: { id: number }) => item.id)).not.toContain(old)
    expect((await owner.call(`/api/banks/${old}/restore`, { method: 'POST' })).status).toBe(404)
  })

  it('duplicates a bank as a new one at version 1', async () => {
    const copy = await owner.call(`/api/banks/${bankId}/duplicate`, { method: 'POST' })
    expect(copy.status).toBe(201)
    expect(copy.body.version).toBe(1)
    const read = await owner.call(`/api/banks/${copy.body.id}`)
    expect(read.body.name).toBe('Copy of Bay 4 wye–delta')
    expect(read.body.document).toEqual((await owner.call(`/api/banks/${bankId}`)).body.document)
  })

  it('shares a read-only link that anyone can open, until it is revoked', async () => {
    const shared = await owner.call(`/api/banks/${bankId}/share`, { method: 'POST' })
    expect(shared.status).toBe(201)
    expect(shared.body.url).toMatch(new RegExp(`/shared/${shared.body.token}$`))
    const again = await owner.call(`/api/banks/${bankId}/share`, { method: 'POST' })
    expect(again.body.token).toBe(shared.body.token)
    const open = await api(`/api/shared/${shared.body.token}`)
    expect(open.status).toBe(200)
    expect(open.body).toEqual({ name: 'Bay 4 wye–delta', document: { ...starter, name: 'first save' } })
    const listed = (await owner.call('/api/banks?pageSize=100')).body.items.find((item: { id: number }) => item.id === bankId)
    expect(listed).toMatchObject({ shared: true, shareUrl: shared.body.url })
    expect((await owner.call(`/api/banks/${bankId}/share`, { method: 'DELETE' })).status).toBe(204)
    expect((await api(`/api/shared/${shared.body.token}`)).status).toBe(404)
  })
})
