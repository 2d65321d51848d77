import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import { flushPromises } from '@vue/test-utils'
import { createError, readBody, setResponseStatus } from 'h3'
import SignUpPage from '~/pages/sign-up.vue'
import SignInPage from '~/pages/sign-in.vue'

function fieldError(wrapper: Awaited<ReturnType<typeof mountSuspended>>, name: string): string {
  const input = wrapper.get(`input[name="${name}"]`)
  const ids = (input.attributes('aria-describedby') ?? '').split(' ').filter((id: string) => id.endsWith('-error'))
  return ids.length ? wrapper.get(`[id="${ids[0]}"]`).text() : ''
}

describe('the sign-up form', () => {
  it('checks each field as it is typed in, with the shared schema\'s words', async () => {
    const wrapper = await mountSuspended(SignUpPage)
    expect(wrapper.findAll('[data-field-error]')).toHaveLength(0)

    await wrapper.get('input[name="email"]').setValue('priya.lindqvist')
    await wrapper.get('input[name="password"]').setValue('short')
    expect(fieldError(wrapper, 'email')).toContain('enter an e-mail address such as name@example.com')
    expect(fieldError(wrapper, 'password')).toContain('use at least 10 characters')
    expect(wrapper.get('input[name="email"]').attributes('aria-invalid')).toBe('true')
    // not typed in yet: no complaint
    expect(fieldError(wrapper, 'name')).toBe('')

    await wrapper.get('input[name="email"]').setValue('priya@riverbend.test')
    await wrapper.get('input[name="password"]').setValue('long-enough-password')
    expect(fieldError(wrapper, 'email')).toBe('')
    expect(fieldError(wrapper, 'password')).toBe('')
  })

  it('marks every missing field on submit, without calling the server', async () => {
    let called = false
    registerEndpoint('/api/auth/sign-up', { method: 'POST', handler: () => { called = true; return {} } })
    const wrapper = await mountSuspended(SignUpPage)
    await wrapper.get('form').trigger('submit')
    await flushPromises()
    expect(fieldError(wrapper, 'name')).toContain('enter your name')
    expect(fieldError(wrapper, 'password')).toContain('use at least 10 characters')
    expect(called).toBe(false)
  })

  it('shows the server\'s field error and keeps what was typed', async () => {
    registerEndpoint('/api/auth/sign-up', {
      method: 'POST',
      handler: async (event) => {
        const body = await readBody(event)
        setResponseStatus(event, 400)
        throw createError({ statusCode: 400, statusMessage: 'Invalid input', data: { errors: [{ path: 'email', message: `${body.email} is not an address we can send to` }] } })
      },
    })
    const wrapper = await mountSuspended(SignUpPage)
    await wrapper.get('input[name="name"]').setValue('Priya Lindqvist')
    await wrapper.get('input[name="email"]').setValue('student@phaseloom.test')
    await wrapper.get('input[name="password"]').setValue('long-enough-password')
    await wrapper.get('form').trigger('submit')
    await flushPromises()
    await new Promise(resolve => setTimeout(resolve, 50))
    await flushPromises()
    expect(fieldError(wrapper, 'email')).toContain('student@phaseloom.test is not an address we can send to')
    expect(wrapper.text()).toContain('Invalid input')
    expect((wrapper.get('input[name="name"]').element as HTMLInputElement).value).toBe('Priya Lindqvist')
    expect((wrapper.get('input[name="password"]').element as HTMLInputElement).value).toBe('long-enough-password')

    // typing in the field clears the server's complaint about it
    await wrapper.get('input[name="email"]').setValue('priya@riverbend.test')
    expect(fieldError(wrapper, 'email')).toBe('')
  })
  it('says to check the mail, naming the address typed, once the server has it', async () => {
    let sent: Record<string, unknown> = {}
    registerEndpoint('/api/auth/sign-up', {
      method: 'POST',
      handler: async (event) => {
        sent = await readBody(event)
        setResponseStatus(event, 202)
        return { accepted: true, message: 'Check your e-mail: we sent a link to finish making the account.' }
      },
    })
    const wrapper = await mountSuspended(SignUpPage)
    await wrapper.get('input[name="name"]').setValue('Priya Lindqvist')
    await wrapper.get('input[name="email"]').setValue('priya@riverbend.test')
    await wrapper.get('input[name="password"]').setValue('long-enough-password')
    await wrapper.get('form').trigger('submit')
    await flushPromises()
    await new Promise(resolve => setTimeout(resolve, 50))
    await flushPromises()
    expect(sent).toMatchObject({ name: 'Priya Lindqvist', email: 'priya@riverbend.test', role: 'student' })
    expect(wrapper.get('[data-testid="sign-up-sent"]').text()).toContain('Check your e-mail')
    expect(wrapper.get('[data-testid="sign-up-sent"]').text()).toContain('priya@riverbend.test')
    expect(wrapper.find('form').exists()).toBe(false)
  })
})

describe('the sign-in form', () => {
  it('labels its fields and links to the password reset', async () => {
    const wrapper = await mountSuspended(SignInPage)
    for (const name of ['email', 'password']) {
      const id = wrapper.get(`input[name="${name}"]`).attributes('id')
      expect(wrapper.find(`label[for="${id}"]`).exists()).toBe(true)
    }
    expect(wrapper.find('a[href="/forgot"]').exists()).toBe(true)
    await wrapper.get('input[name="email"]').setValue('not an address')
    expect(fieldError(wrapper, 'email')).toContain('enter an e-mail address')
  })
})
