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
})
