// The faults editor of a fault hunt: each kind shows the one setting it needs, and every change
// is emitted as the whole list of faults in the shape the hunts routes take.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import type { Fault } from '#shared/hunts/faults'
import { FaultSchema } from '#shared/hunts/faults'
import HuntsFaultsEditor from '~/components/hunts/HuntsFaultsEditor.vue'
import type { FaultTarget } from '~/utils/hunt-views'

const targets: FaultTarget[] = [
  { id: 'S1', kind: 'supply', secondaryVolts: [] },
  { id: 'T1', kind: 'transformer', secondaryVolts: [120, 120] },
  { id: 'T2', kind: 'transformer', secondaryVolts: [240] },
]

async function mountEditor(faults: Fault[], errors: Record<string, string> = {}) {
  const emitted: Fault[][] = []
  const wrapper = await mountSuspended(HuntsFaultsEditor, {
    props: {
      targets,
      errors,
      modelValue: faults,
      'onUpdate:modelValue': async (value: Fault[]) => {
        emitted.push(value)
        await wrapper.setProps({ modelValue: value })
      },
    },
  })
  const row = (i: number) => wrapper.get(`[data-fault-row="${i}"]`)
  const last = () => emitted.at(-1)!
  return { wrapper, row, last, emitted }
}
const optionsOf = (select: ReturnType<Awaited<ReturnType<typeof mountEditor>>['row']>) =>
  select.findAll('option').map(o => ({ value: o.attributes('value'), disabled: o.attributes('disabled') !== undefined }))

describe('the faults editor', () => {
  it('shows no setting for a marking fault, and a coil choice for a broken coil', async () => {
    const { row, last } = await mountEditor([{ kind: 'secondary-reversed', component: 'T1' }])
    expect(row(0).find('[data-parameter="none"]').exists()).toBe(true)
    expect(row(0).get('legend').text()).toBe('Fault 1')
    // the kinds carry our own words
    expect(row(0).get('select[name="kind"]').findAll('option').map(o => o.text())).toContain('Broken coil')

    await row(0).get('select[name="kind"]').setValue('open-coil')
    expect(last()).toEqual([{ kind: 'open-coil', component: 'T1', coil: 'X1-X2' }])
    expect(row(0).find('[data-parameter="none"]').exists()).toBe(false)
    const coil = row(0).get('[data-parameter="coil"]')
    expect(optionsOf(coil)).toEqual([
      { value: 'H1-H2', disabled: false },
      { value: 'X1-X2', disabled: false },
      { value: 'X3-X4', disabled: false },
    ])
    await coil.get('select').setValue('X3-X4')
    expect(last()).toEqual([{ kind: 'open-coil', component: 'T1', coil: 'X3-X4' }])

    // a unit with one secondary coil has no X3-X4 to break
    await row(0).get('select[name="component"]').setValue('T2')
    expect(optionsOf(row(0).get('[data-parameter="coil"]')).find(o => o.value === 'X3-X4')!.disabled).toBe(true)
  })

  it('asks a wrong tap for its percent, and emits it as a number', async () => {
    const { row, last } = await mountEditor([{ kind: 'wrong-tap', component: 'T2', percent: 5 }])
    const percent = row(0).get('[data-parameter="percent"] input')
    expect((percent.element as HTMLInputElement).value).toBe('5')
    await percent.setValue('-3.5')
    expect(last()).toEqual([{ kind: 'wrong-tap', component: 'T2', percent: -3.5 }])
    expect(FaultSchema.safeParse(last()[0]).success).toBe(true)
  })

  it('gives an off-nameplate unit one voltage per coil, following the unit chosen', async () => {
    const { row, last } = await mountEditor([{ kind: 'secondary-reversed', component: 'T1' }])
    await row(0).get('select[name="kind"]').setValue('coil-volts')
    // T1 has two 120 V coils: the first starts 5 % low
    expect(last()).toEqual([{ kind: 'coil-volts', component: 'T1', volts: [114, 120] }])
    expect(row(0).findAll('[data-parameter="volts"] input')).toHaveLength(2)
    expect(row(0).get('[data-parameter="volts"]').text()).toContain('Nameplate 120 V')
    await row(0).findAll('[data-parameter="volts"] input')[1]!.setValue('126')
    expect(last()).toEqual([{ kind: 'coil-volts', component: 'T1', volts: [114, 126] }])

    await row(0).get('select[name="component"]').setValue('T2')
    expect(last()).toEqual([{ kind: 'coil-volts', component: 'T2', volts: [228] }])
    expect(row(0).findAll('[data-parameter="volts"] input')).toHaveLength(1)
  })

  it('puts relabelled phases on the supply only, with the two phases swapped', async () => {
    const { row, last } = await mountEditor([{ kind: 'secondary-reversed', component: 'T1' }])
    await row(0).get('select[name="kind"]').setValue('phases-relabelled')
    expect(last()).toEqual([{ kind: 'phases-relabelled', component: 'S1', swap: ['B', 'C'] }])
    expect(row(0).get('label[for$="-component"]').text()).toBe('Supply')
    expect(row(0).get('select[name="component"]').findAll('option').map(o => o.attributes('value'))).toEqual(['S1'])
    await row(0).get('select[name="swap-1"]').setValue('A')
    expect(last()).toEqual([{ kind: 'phases-relabelled', component: 'S1', swap: ['B', 'A'] }])
  })

  it('adds and removes rows', async () => {
    const { wrapper, last } = await mountEditor([{ kind: 'primary-reversed', component: 'T2' }])
    await wrapper.findAll('button').find(b => b.text() === 'Add a fault')!.trigger('click')
    expect(last()).toEqual([{ kind: 'primary-reversed', component: 'T2' }, { kind: 'secondary-reversed', component: 'T1' }])
    expect(wrapper.findAll('[data-fault-row]')).toHaveLength(2)
    await wrapper.get('[data-fault-row="0"]').findAll('button').find(b => b.text().startsWith('Remove'))!.trigger('click')
    expect(last()).toEqual([{ kind: 'secondary-reversed', component: 'T1' }])
    expect(wrapper.get('[data-fault-row="0"]').get('button').text()).toBe('Remove fault 1')
  })

  it('shows the server\'s error beside the field its path names', async () => {
    const { row, wrapper } = await mountEditor(
      [{ kind: 'secondary-reversed', component: 'T1' }, { kind: 'wrong-tap', component: 'T9', percent: 0.1 }],
      { 'faults[1].component': 'the bank has no component "T9"', 'faults[1].percent': 'a tap fault of under 0.5 % cannot be told from a normal unit' },
    )
    const component = row(1).get('select[name="component"]')
    expect(component.attributes('aria-invalid')).toBe('true')
    expect(wrapper.get(`[id="${component.attributes('aria-describedby')}"]`).text()).toContain('the bank has no component "T9"')
    expect(row(1).get('[data-parameter="percent"]').text()).toContain('cannot be told from a normal unit')
    expect(row(0).findAll('[data-field-error]')).toHaveLength(0)
  })
})
