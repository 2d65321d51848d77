import { describe, expect, it } from 'vitest'
// The very functions the app's server calls (nuxt-auth-utils' `hashPassword` and
// `verifyPassword`); the Nuxt test environment resolves their `#imports`.
import { hashPassword, verifyPassword } from '../../node_modules/nuxt-auth-utils/dist/runtime/server/utils/password.js'
import { DEMO_PASSWORD, hashDemoPassword, verifyDemoPassword } from '../../scripts/seed.mjs'

describe('demo seed passwords', () => {
  it('are accepted by the app\'s verifyPassword', async () => {
    const seeded = await hashDemoPassword(DEMO_PASSWORD)
    expect(seeded).toMatch(/^\$scrypt\$/)
    expect(await verifyPassword(seeded, DEMO_PASSWORD)).toBe(true)
    expect(await verifyPassword(seeded, 'phaseloom-dem0')).toBe(false)
  })

  it('use the same scheme as the app\'s hashPassword', async () => {
    const madeByApp = await hashPassword(DEMO_PASSWORD)
    expect(await verifyDemoPassword(madeByApp, DEMO_PASSWORD)).toBe(true)
    // same algorithm and parameters, so nothing would be re-hashed at first sign-in
    expect(madeByApp.split('$').slice(0, 3)).toEqual((await hashDemoPassword('x')).split('$').slice(0, 3))
  })
})
