// Writing a hunt: the faults editor is filled from the chosen bank's units and supply, the
// body sent is the one the hunts route takes, and the server's errors land beside the field
// their path names.
import { describe, expect, it } from 'vitest'
import { mountSuspended, registerEndpoint } from '@nuxt/test-utils/runtime'
import { flushPromises } from '@vue/test-utils'
import { createError, readBody } from 'h3'
import HuntsForm from '~/components/hunts/HuntsForm.vue'

const bank = { id: 41, name: 'Bay 2 delta', kind: 'bank' as const, version: 1, createdAt: '2027-01-01T00:00:00.000Z', updatedAt: '2027-01-01T00:00:00.000Z', deletedAt: null, shared: false, shareUrl: null }
const document = {
  format: 'phaseloom.circuit',
  version: 1,
  name: 'Bay 2 delta',
  components: [
    { id: 'S1', kind: 'supply', volts: 480 },
    { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] },
    { id: 'T2', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] },
  ],
  wires: [],
}
const settle = async () => {
  for (let i = 0; i < 3; i++) {
    await flushPromises()
    await new Promise(resolve => setTimeout(resolve, 20))
  }
}

describe('the hunt form', () => {
  it('offers the bank\'s units, sends the hunt, and shows the server\'s fault error by its path', async () => {
    registerEndpoint('/api/banks/41', () => ({ ...bank, document }))
    let sent: Record<string, unknown> | null = null
    registerEndpoint('/api/hunts', {
      method: 'POST',
      handler: async (event) => {
        sent = await readBody(event)
        throw createError({ statusCode: 400, statusMessage: 'The faults do not fit the bank', data: { errors: [{ path: 'faults[0].component', message: 'T2 cannot take this fault in this bank' }] } })
      },
    })
    const wrapper = await mountSuspended(HuntsForm, { props: { banks: [bank] } })
    await settle()
    const row = wrapper.get('[data-fault-row="0"]')
    expect(row.get('select[name="component"]').findAll('option').map(o => o.attributes('value'))).toEqual(['T1', 'T2'])
    await row.get('select[name="component"]').setValue('T2')

    // nothing goes to the server until the title is given
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(sent).toBeNull()
    expect(wrapper.text()).toContain('give the hunt a title')

    await wrapper.get('input[name="title"]').setValue('Find the backwards unit')
    await wrapper.get('input[name="probeBudget"]').setValue('30')
    await wrapper.get('form').trigger('submit')
    await settle()
    expect(sent).toEqual({
      bankId: 41,
      title: 'Find the backwards unit',
      instructions: '',
      secondaryPrewired: true,
      dueAt: null,
      probeBudget: 30,
      feedback: 'on-submit',
      faults: [{ kind: 'secondary-reversed', component: 'T2' }],
    })
    const component = wrapper.get('[data-fault-row="0"] select[name="component"]')
    expect(component.attributes('aria-invalid')).toBe('true')
    expect(wrapper.get(`[id="${component.attributes('aria-describedby')}"]`).text()).toContain('T2 cannot take this fault in this bank')
    expect(wrapper.text()).toContain('The faults do not fit the bank')
  })

  it('wants a due date when feedback waits for it', async () => {
    registerEndpoint('/api/banks/41', () => ({ ...bank, document }))
    const wrapper = await mountSuspended(HuntsForm, { props: { banks: [bank] } })
    await settle()
    await wrapper.get('input[name="title"]').setValue('Late feedback')
    await wrapper.get('input[name="feedback"][value="after-due"]').setValue(true)
    await wrapper.get('form').trigger('submit')
    await settle()
    const due = wrapper.get('input[name="dueAt"]')
    expect(due.attributes('aria-invalid')).toBe('true')
    expect(wrapper.get(`[id="${due.attributes('aria-describedby')}"]`).text()).toContain('feedback after the due date needs a due date')
  })
})
