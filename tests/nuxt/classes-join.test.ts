// The landing page of a class invitation: signed out, both ways in come back to the link.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
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
