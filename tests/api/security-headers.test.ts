// The headers every answer carries (nuxt-security), and the session cookie's flags: the
// test server runs with production settings.
import { describe, expect, it } from 'vitest'
import starter from '../../examples/one-unit-series.json'
import { api, baseURL, databaseURL } from './helpers'
import { newPerson } from './people'

describe('security headers', () => {
  it.each(['/', '/bench', '/sign-in', '/starters'])('page %s carries a CSP of our own assets only, and the other headers', async (path) => {
    const r = await api(path, { headers: { accept: 'text/html' } })
    expect(r.status).toBe(200)
    const csp = r.headers.get('content-security-policy') ?? ''
    expect(csp).toContain("default-src 'self'")
    expect(csp).toContain("frame-ancestors 'none'")
    expect(csp).toContain("object-src 'none'")
    expect(csp).toMatch(/script-src 'self' 'strict-dynamic' 'nonce-[A-Za-z0-9+/=]+'/)
    expect(csp).not.toMatch(/https:|\*/)
    expect(r.headers.get('x-content-type-options')).toBe('nosniff')
    expect(r.headers.get('referrer-policy')).toBe('no-referrer')
    expect(r.headers.get('x-frame-options')).toBe('DENY')
    expect(r.headers.get('x-powered-by')).toBeNull()
  })

  it('an API answer carries the same protections', async () => {
    const r = await api('/api/health')
    expect(r.headers.get('x-content-type-options')).toBe('nosniff')
    expect(r.headers.get('referrer-policy')).toBe('no-referrer')
    expect(r.headers.get('x-frame-options')).toBe('DENY')
    expect(r.headers.get('x-powered-by')).toBeNull()
  })

  it('gives every inline script of a page the nonce of its CSP', async () => {
    const r = await api('/', { headers: { accept: 'text/html' } })
    const nonce = /'nonce-([^']+)'/.exec(r.headers.get('content-security-policy') ?? '')![1]
    const scripts = [...r.text.matchAll(/<script(?![^>]*\bsrc=)([^>]*)>/g)]
    expect(scripts.length).toBeGreaterThan(0)
    for (const [, attrs] of scripts) expect(attrs).toContain(`nonce="${nonce}"`)
  })

  it('sets the session cookie HttpOnly, SameSite=Lax and Secure', async () => {
    const person = await newPerson('student', databaseURL, 'headers')
    const r = await api('/api/auth/sign-in', { method: 'POST', json: { email: person.email, password: person.password } })
    const cookie = r.headers.getSetCookie().find(c => c.startsWith('nuxt-session='))!
    expect(cookie).toMatch(/;\s*HttpOnly/i)
    expect(cookie).toMatch(/;\s*SameSite=Lax/i)
    expect(cookie).toMatch(/;\s*Secure/i)
  })

  it('keeps saving banks whose text holds "<" (no XSS filter on bodies; Vue escapes output)', async () => {
    const person = await newPerson('student', databaseURL, 'headers-save')
    const r = await person.call('/api/banks', { method: 'POST', json: { name: 'Bay <4> <script>x</script>', document: { ...starter, name: 'V < 5 %' } } })
    expect(r.status, r.text).toBe(201)
    const back = await person.call(`/api/banks/${r.body.id}`)
    expect(back.body.name).toBe('Bay <4> <script>x</script>')
  })

  it.each([
    ['a page without Origin', '/', {}, 'GET'],
    ['an API read without Origin', '/api/health', {}, 'GET'],
    ['an API read from our own pages', '/api/health', { 'origin': new URL(baseURL).origin, 'sec-fetch-site': 'same-origin' }, 'GET'],
    ['an API read from another site', '/api/health', { origin: 'https://evil.example' }, 'GET'],
    ['a preflight from another site', '/api/banks', { 'origin': 'https://evil.example', 'access-control-request-method': 'POST' }, 'OPTIONS'],
  ])('sends no access-control-allow-origin to %s (same-site only: no CORS)', async (_, path, headers, method) => {
    const r = await api(path, { method, headers })
    expect(r.status).toBe(method === 'OPTIONS' ? 204 : 200)
    expect(r.headers.get('access-control-allow-origin')).toBeNull()
    expect(r.headers.get('access-control-allow-credentials')).toBeNull()
  })

  it('sends no access-control-allow-origin on a same-site write either', async () => {
    const person = await newPerson('student', databaseURL, 'headers-cors')
    const r = await person.call('/api/banks', { method: 'POST', json: { name: 'cors check', document: starter }, headers: { origin: new URL(baseURL).origin } })
    expect(r.status, r.text).toBe(201)
    expect(r.headers.get('access-control-allow-origin')).toBeNull()
  })
})
