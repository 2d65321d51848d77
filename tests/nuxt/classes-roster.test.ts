// The instructor's class tools: removing a student asks first, invitations take several
// addresses at once and name the one the server refused.
import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import { flushPromises } from '@vue/test-utils'
import { createError, readBody } from 'h3'
import ClassesRoster from '~/components/classes/ClassesRoster.vue'
import ClassesInvite from '~/components/classes/ClassesInvite.vue'

const settle = async () => {
  for (let i = 0; i < 3; i++) {
    await flushPromises()
    await new Promise(resolve => setTimeout(resolve, 20))
  }
}
const roster = [
  { userId: 7, name: 'Priya Lindqvist', email: 'priya@riverbend.test', joinedAt: '2027-01-04T09:00:00.000Z', attempts: 2, lastActivityAt: '2027-01-09T15:30:00.000Z' },
  { userId: 8, name: 'Tomasz Abara', email: 'tomasz@riverbend.test', joinedAt: '2027-01-05T09:00:00.000Z', attempts: 0, lastActivityAt: null },
]

describe('the roster', () => {
  it('asks before removing a student, and Keep leaves them', async () => {
    let removed = ''
    registerEndpoint('/api/classes/3/members/8', { method: 'DELETE', handler: () => { removed = 'tomasz'; return null } })
    const wrapper = await mountSuspended(ClassesRoster, { props: { classId: 3, roster } })
    const row = () => wrapper.findAll('tbody tr').find(tr => tr.text().includes('Tomasz'))!
    expect(row().text()).toContain('None yet')
    await row().get('button').trigger('click')
    expect(row().text()).toContain('Remove Tomasz Abara?')
    expect(removed).toBe('')
    await row().findAll('button').find(b => b.text() === 'Keep')!.trigger('click')
    expect(row().text()).not.toContain('Remove Tomasz Abara?')

    await row().get('button').trigger('click')
    await row().findAll('button').find(b => b.text() === 'Yes, remove')!.trigger('click')
    await settle()
    expect(removed).toBe('tomasz')
    expect(wrapper.emitted('removed')).toEqual([['Tomasz Abara']])
  })
})

describe('invitations by e-mail', () => {
  it('sends every address typed, one per line or comma-separated', async () => {
    let sent: unknown = null
    registerEndpoint('/api/classes/3/invitations', {
      method: 'POST',
      handler: async (event) => {
        sent = await readBody(event)
        return { sent: (sent as { emails: string[] }).emails.map(email => ({ email, expiresAt: '2027-01-20T00:00:00.000Z' })) }
      },
    })
    const wrapper = await mountSuspended(ClassesInvite, { props: { classId: 3, invitations: [] } })
    await wrapper.get('textarea').setValue('ines@riverbend.test, bo@riverbend.test\namara@riverbend.test\n')
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(sent).toEqual({ emails: ['ines@riverbend.test', 'bo@riverbend.test', 'amara@riverbend.test'] })
    expect(wrapper.text()).toContain('Invitations sent to ines@riverbend.test, bo@riverbend.test, amara@riverbend.test.')
    expect(wrapper.emitted('sent')).toHaveLength(1)
  })

  it('names the address the server refused', async () => {
    registerEndpoint('/api/classes/4/invitations', {
      method: 'POST',
      handler: () => {
        throw createError({ statusCode: 400, statusMessage: 'Check the addresses', data: { errors: [{ path: 'emails[1]', message: 'this address cannot be invited' }] } })
      },
    })
    const wrapper = await mountSuspended(ClassesInvite, { props: { classId: 4, invitations: [] } })
    await wrapper.get('textarea').setValue('ines@riverbend.test\nbo@riverbend.test')
    await wrapper.get('form').trigger('submit')
    await settle()
    const textarea = wrapper.get('textarea')
    expect(textarea.attributes('aria-invalid')).toBe('true')
    expect(wrapper.get('[data-field-error]').text()).toContain('bo@riverbend.test: this address cannot be invited')
    expect(wrapper.text()).toContain('Check the addresses')
  })
})
