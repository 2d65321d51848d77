// The landing page of a class invitation: signed out, both ways in come back to the link.
import { describe, expect, it, vi } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import { readBody } from 'h3'
import JoinPage from '~/pages/classes/join.vue'

const token = 'tok_abcdefghijklmnopqrstuvwxyz0123'

describe('the class invitation page', () => {
  it('sends a signed-out visitor to sign in or sign up, with next back to the link', async () => {
    const wrapper = await mountSuspended(JoinPage, { route: `/classes/join?token=${token}` })
    const nextOf = (href: string | undefined) => new URL(href ?? '', 'http://phaseloom.test').searchParams.get('next')
    const signIn = wrapper.findAll('a').find(a => a.text() === 'Sign in')!
    const signUp = wrapper.findAll('a').find(a => a.text() === 'Make an account')!
    expect(signIn.attributes('href')).toMatch(/^\/sign-in\?next=/)
    expect(signUp.attributes('href')).toMatch(/^\/sign-up\?next=/)
    expect(nextOf(signIn.attributes('href'))).toBe(`/classes/join?token=${token}`)
    expect(nextOf(signUp.attributes('href'))).toBe(`/classes/join?token=${token}`)
    expect(wrapper.find('button').exists()).toBe(false)
  })

  it('says so when the link has lost its token', async () => {
    const wrapper = await mountSuspended(JoinPage, { route: '/classes/join' })
    expect(wrapper.text()).toContain('This link is incomplete')
  })
})

describe('the class invitation page, signed in as a student', () => {
  it('names the class and its instructor before the link is used, and joins it by name', async () => {
    registerEndpoint('/api/_auth/session', () => ({ user: { id: 7, role: 'student', name: 'Rosa Iyer' }, loggedInAt: Date.now() }))
    let asked = ''
    registerEndpoint('/api/classes/invitation', {
      method: 'POST',
      handler: async (event) => {
        asked = (await readBody(event)).token
        return { className: 'Transformer Lab B', term: 'Autumn', instructorName: 'Desmond Varga', expiresAt: '2026-12-15T10:00:00.000Z', youTeachIt: false }
      },
    })
    const { fetch: fetchSession } = useUserSession()
    await fetchSession()
    const wrapper = await mountSuspended(JoinPage, { route: `/classes/join?token=${token}` })
    await vi.waitFor(() => expect(wrapper.find('[data-testid="invitation-class"]').exists()).toBe(true))
    expect(asked).toBe(token)
    expect(wrapper.get('[data-testid="invitation-class"]').text()).toBe('Desmond Varga invited you to Transformer Lab B (Autumn).')
    expect(wrapper.text()).toContain('good until 15 December 2026')
    expect(wrapper.get('button').text()).toBe('Join Transformer Lab B')
  })
})
