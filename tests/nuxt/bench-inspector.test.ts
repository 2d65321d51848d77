// The inspector validates as the user types, and applies only a valid part.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import BenchInspector from '~/components/bench/BenchInspector.vue'
import { useBenchStore } from '~/stores/bench'
import { starterBySlug } from '#shared/starters'

describe('BenchInspector', () => {
  it('says what is wrong with a value as it is typed and leaves the bank unchanged', async () => {
    const bench = useBenchStore()
    bench.load(starterBySlug('closed-delta-240')!.document)
    bench.selected = 'T2'
    const wrapper = await mountSuspended(BenchInspector)
    const kva = wrapper.get('#insp-kva')
    expect((kva.element as HTMLInputElement).value).toBe('10')

    await kva.setValue('-5')
    await kva.trigger('input')
    expect(wrapper.get('#insp-kva-err').text()).toBe('kVA must be greater than 0')
    expect(kva.attributes('aria-invalid')).toBe('true')
    await kva.trigger('change')
    expect(bench.doc.components.find((c) => c.id === 'T2')).toMatchObject({ kva: 10 })

    // what is not a number stays as typed, and the message names the field as the form does
    await kva.setValue('abc')
    await kva.trigger('input')
    expect((kva.element as HTMLInputElement).value).toBe('abc')
    expect(wrapper.get('#insp-kva-err').text()).toBe('kVA must be a number')

    await kva.setValue('25')
    await kva.trigger('change')
    expect(wrapper.find('#insp-kva-err').exists()).toBe(false)
    expect(bench.doc.components.find((c) => c.id === 'T2')).toMatchObject({ kva: 25 })
  })

  it('accepts a comma as the decimal mark and reads coil voltages written 120/120', async () => {
    const bench = useBenchStore()
    bench.load(starterBySlug('closed-delta-240')!.document)
    bench.selected = 'T1'
    const wrapper = await mountSuspended(BenchInspector)
    await wrapper.get('#insp-impedancePercent').setValue('2,5')
    await wrapper.get('#insp-impedancePercent').trigger('change')
    await wrapper.get('#insp-secondaryVolts').setValue('240')
    await wrapper.get('#insp-secondaryVolts').trigger('change')
    expect(bench.doc.components.find((c) => c.id === 'T1')).toMatchObject({ impedancePercent: 2.5, secondaryVolts: [240] })
    // the second coil's terminals are gone, and so are the jumpers to them
    expect(bench.doc.wires.flat().some((t) => t === 'T1.X3' || t === 'T1.X4')).toBe(false)
  })

  it('edits a unit\'s tap and its bushing layout, and keeps the core\'s values under "advanced"', async () => {
    const bench = useBenchStore()
    bench.load(starterBySlug('closed-delta-240')!.document)
    bench.selected = 'T3'
    const wrapper = await mountSuspended(BenchInspector)
    const tap = wrapper.get('#insp-tapPercent')
    expect((tap.element as HTMLInputElement).value).toBe('0')
    await tap.setValue('2.5')
    await tap.trigger('change')
    await tap.setValue('25')
    await tap.trigger('input')
    expect(wrapper.get('#insp-tapPercent-err').text()).toBe('Primary tap (%) must be between -20 and 20')
    await tap.trigger('change')
    expect(bench.doc.components.find((c) => c.id === 'T3')).toMatchObject({ tapPercent: 2.5 })
    // a part applies only when every field is right: put the tap back first
    await tap.setValue('2.5')
    await tap.trigger('change')

    const polarity = wrapper.get('#insp-polarity')
    expect(polarity.findAll('option').map((o) => o.text())).toEqual(['Subtractive: X1 below H1', 'Additive: X1 across from H1'])
    await polarity.setValue('additive')
    expect(bench.doc.components.find((c) => c.id === 'T3')).toMatchObject({ polarity: 'additive' })
    // the bushing layout is a drawing matter: the jumpers stay on the same terminals
    expect(bench.doc.wires.filter((w) => w.some((t) => t.startsWith('T3.X')))).toHaveLength(starterBySlug('closed-delta-240')!.document.wires.filter((w) => w.some((t) => t.startsWith('T3.X'))).length)

    const advanced = wrapper.get('[data-testid="inspector-advanced"]')
    expect(advanced.find('summary').text()).toMatch(/^Advanced: .*Exciting current.*Core loss/)
    expect(advanced.find('#insp-excitingPercent').exists()).toBe(true)
    expect(advanced.find('#insp-coreLossPercent').exists()).toBe(true)
    expect(wrapper.find('[data-testid="inspector-advanced"] #insp-tapPercent').exists()).toBe(false)
  })

  it('refuses a core loss above the exciting current, naming both fields as the form does, and opens the disclosure to show it', async () => {
    const bench = useBenchStore()
    bench.load(starterBySlug('closed-delta-240')!.document)
    bench.selected = 'T1'
    const wrapper = await mountSuspended(BenchInspector)
    const advanced = wrapper.get('[data-testid="inspector-advanced"]')
    expect(advanced.attributes('open')).toBeUndefined()
    const loss = wrapper.get('#insp-coreLossPercent')
    expect((loss.element as HTMLInputElement).value).toBe('0.2')
    await loss.setValue('1.5')
    await loss.trigger('input')
    const message = wrapper.get('#insp-coreLossPercent-err').text()
    expect(message).toMatch(/^Core loss \(% of kVA\) must not exceed Exciting current \(% of rated\) \(1\)/)
    expect(message).not.toMatch(/Percent/)
    expect(advanced.attributes('open')).toBeDefined()
    await loss.trigger('change')
    expect(bench.doc.components.find((c) => c.id === 'T1')).toMatchObject({ coreLossPercent: 0.2 })

    // more exciting current makes room for it
    await wrapper.get('#insp-excitingPercent').setValue('2')
    await wrapper.get('#insp-excitingPercent').trigger('change')
    expect(wrapper.find('#insp-coreLossPercent-err').exists()).toBe(false)
    expect(bench.doc.components.find((c) => c.id === 'T1')).toMatchObject({ excitingPercent: 2, coreLossPercent: 1.5 })
  })

  it('sets a fuse\'s class', async () => {
    const bench = useBenchStore()
    bench.load(starterBySlug('closed-delta-240')!.document)
    bench.selected = 'F2'
    const wrapper = await mountSuspended(BenchInspector)
    const curve = wrapper.get('#insp-curve')
    expect((curve.element as HTMLSelectElement).value).toBe('time-delay')
    expect(curve.findAll('option').map((o) => o.text())).toEqual(['Time-delay (dual element)', 'Fast-acting'])
    await curve.setValue('fast-acting')
    expect(bench.doc.components.find((c) => c.id === 'F2')).toMatchObject({ curve: 'fast-acting' })
  })

  it('makes a breaker a disconnect that never trips when "trips on overcurrent" is cleared', async () => {
    const bench = useBenchStore()
    bench.load(starterBySlug('closed-delta-240')!.document)
    bench.selected = 'CB1'
    const wrapper = await mountSuspended(BenchInspector)
    const trips = wrapper.get('#insp-trips')
    expect(wrapper.get('label[for="insp-trips"]').text()).toBe('Trips on overcurrent')
    expect((trips.element as HTMLInputElement).checked).toBe(true)
    expect(wrapper.get('#insp-trips-hint').text()).toMatch(/disconnect/)
    await trips.setValue(false)
    expect(bench.doc.components.find((c) => c.id === 'CB1')).toMatchObject({ trips: false })
    await trips.setValue(true)
    expect(bench.doc.components.find((c) => c.id === 'CB1')).toMatchObject({ trips: true })
  })
})
