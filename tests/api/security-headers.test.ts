// The headers every answer carries (nuxt-security), and the session cookie's flags: the
// test server runs with production settings.
import { describe, expect, it } from 'vitest'
import starter from '../../examples/one-unit-series.json'
import { api, databaseURL } from './helpers'
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
})
