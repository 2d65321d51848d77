import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import { flushPromises } from '@vue/test-utils'
import BanksImport from '~/components/banks/BanksImport.vue'
import starter from '../../examples/one-unit-series.json'

async function choose(wrapper: Awaited<ReturnType<typeof mountSuspended>>, name: string, text: string) {
  const input = wrapper.get('input[type="file"]')
  Object.defineProperty(input.element, 'files', { value: [new File([text], name, { type: 'application/json' })], configurable: true })
  await input.trigger('change')
  for (let i = 0; i < 5; i++) {
    await flushPromises()
    await new Promise(resolve => setTimeout(resolve, 10))
  }
}

describe('Import .json', () => {
  it('lists what is wrong with a document, by JSON path, and imports nothing', async () => {
    const wrapper = await mountSuspended(BanksImport)
    const broken = { ...starter, components: [starter.components[0], { ...starter.components[1], kva: -5 }, starter.components[2]], wires: [...starter.wires, ['T1.X9', 'M1.a']] }
    await choose(wrapper, 'broken.json', JSON.stringify(broken))
    const alert = wrapper.get('[role="alert"]').text()
    expect(alert).toContain('broken.json is not a bank Phaseloom can open')
    expect(alert).toContain('components[1].kva')
    expect(alert).toContain('wires[5][0]')
    expect(wrapper.emitted('imported')).toBeUndefined()
  })

  it('says so when the file is not JSON at all', async () => {
    const wrapper = await mountSuspended(BanksImport)
    await choose(wrapper, 'notes.json', 'T1 to T2, then close the corner')
    expect(wrapper.get('[role="alert"]').text()).toContain('not valid JSON')
  })

  it('hands on a valid document with its own name', async () => {
    const wrapper = await mountSuspended(BanksImport)
    await choose(wrapper, 'series.json', JSON.stringify(starter))
    expect(wrapper.find('[role="alert"]').exists()).toBe(false)
    expect(wrapper.emitted('imported')).toEqual([['One unit, coils in series', starter]])
  })
})
