import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { api } from './helpers'

const { version } = JSON.parse(readFileSync(new URL('../../package.json', import.meta.url), 'utf8'))

describe('GET /api/health', () => {
  it('says the app and its database are up, with the package version', async () => {
    const response = await api('/api/health')
    expect(response.status).toBe(200)
    expect(response.body).toEqual({ ok: true, db: 'ok', version })
    expect(response.headers.get('cache-control')).toBe('no-store')
  })

  it('answers 404 for a route that does not exist', async () => {
    const response = await api('/api/no-such-route')
    expect(response.status).toBe(404)
  })
})
