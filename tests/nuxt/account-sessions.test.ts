import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import AccountSessions from '~/components/account/AccountSessions.vue'

describe('"Sign out everywhere" on the account page', () => {
  it('is a button that asks for it, says what it does, and waits while it is under way', async () => {
    const wrapper = await mountSuspended(AccountSessions, { props: { pending: false, error: '' } })
    const button = wrapper.get('[data-testid="sign-out-everywhere"]')
    expect(button.text()).toBe('Sign out everywhere')
    expect(wrapper.text()).toContain('this one included')
    await button.trigger('click')
    expect(wrapper.emitted('sign-out-everywhere')).toHaveLength(1)
    await wrapper.setProps({ pending: true, error: '' })
    expect(wrapper.get('[data-testid="sign-out-everywhere"]').attributes('disabled')).toBeDefined()
  })

  it('shows a failure in words', async () => {
    const wrapper = await mountSuspended(AccountSessions, { props: { pending: false, error: 'Could not sign out everywhere just now: try again in a moment.' } })
    expect(wrapper.get('[role="status"]').text()).toContain('Could not sign out everywhere')
  })
})
