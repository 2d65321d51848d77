// BenchPhasor with real solved results: the starters solved with CB1 closed.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import BenchPhasor from '~/components/bench/BenchPhasor.vue'
import type { Circuit } from '#shared/circuit/schema'
import { solve } from '#shared/engine'
import { phaseColourSet } from '#shared/phase-colours'
import { starterBySlug } from '#shared/starters'

function closedStarter(slug: string): Circuit {
  const doc = starterBySlug(slug)!.document
  const cb1 = doc.components.find(c => c.id === 'CB1')
  if (cb1?.kind === 'breaker') cb1.closed = true
  return doc
}

const colours = phaseColourSet('na-120-240')

describe('BenchPhasor', () => {
  it('draws the closed delta: 480 V primary, 240 V secondary, in phase (Dd0)', async () => {
    const doc = closedStarter('closed-delta-240')
    const wrapper = await mountSuspended(BenchPhasor, { props: { result: solve(doc), doc, colours } })
    const text = wrapper.text()
    // the supply: 480 V delta, V(A−B) at 30° (circuit-format.md: wye-equivalent A–N at 0°)
    expect(text).toContain('A–B')
    expect(text).toMatch(/480\.\d V ∠ 30\.0°/)
    expect(text).toMatch(/480\.\d V ∠ −90\.0°/)
    // the secondary: 2 × 120 V coils in series, in delta, no shift (IEC 60076-1 Dd0)
    expect(text).toContain('a–b')
    expect(text).toMatch(/2[34]\d\.\d V ∠ 30\.0°/)
    expect(text).toContain('Vector group')
    expect(text).toContain('Dd0')
    const img = wrapper.get('[role="img"]')
    expect(img.attributes('aria-label')).toMatch(/^Phasor diagram\. Primary: A–B 480\.\d volts at 30\.0°/)
    expect(img.attributes('aria-label')).toContain('clock 0')
    // the readings table is there for screen readers, one row per phasor
    expect(wrapper.findAll('table.sr-only tbody tr')).toHaveLength(6)
  })

  it('draws the delta-wye: 208 V and 120 V on the secondary, lagging 30° (Dyn1)', async () => {
    const doc = closedStarter('delta-wye-208y120')
    const wrapper = await mountSuspended(BenchPhasor, { props: { result: solve(doc), doc, colours } })
    const text = wrapper.text()
    for (const name of ['a–b', 'b–c', 'c–a', 'a–n', 'b–n', 'c–n']) expect(text).toContain(name)
    expect(text).toMatch(/20[6-9]\.\d V ∠/)
    expect(text).toMatch(/11\d\.\d V ∠/)
    // IEEE C57.12.00: the low side of a delta-wye lags 30°; IEC 60076-1 clock 1
    expect(text).toMatch(/−30\.\d° \(low side lags\)/)
    expect(text).toContain('Dyn1')
    // line-to-n phasors are dashed so they are told apart without colour
    expect(wrapper.findAll('line[stroke-dasharray="6 3"]')).toHaveLength(3)
  })

  it('marks the high leg in words and in the convention\'s high-leg colour', async () => {
    const doc = closedStarter('high-leg-delta-240-120')
    const wrapper = await mountSuspended(BenchPhasor, { props: { result: solve(doc), doc, colours } })
    expect(wrapper.text()).toContain('b–n (high leg)')
    expect(wrapper.text()).toMatch(/207\.\d V ∠ −120\.0°/)
    expect(wrapper.findAll(`line[stroke="${colours.highLeg!.screen}"]`)).toHaveLength(1)
    // the phase colours come from the prop: phase A's colour on a–b (and on A–B, a–n)
    expect(wrapper.findAll(`line[stroke="${colours.phases.A.screen}"]`).length).toBeGreaterThanOrEqual(2)
  })

  it('takes another region\'s colours from the prop', async () => {
    const doc = closedStarter('closed-delta-240')
    const iec = phaseColourSet('iec-harmonised')
    const wrapper = await mountSuspended(BenchPhasor, { props: { result: solve(doc), doc, colours: iec } })
    expect(wrapper.findAll(`line[stroke="${iec.phases.A.screen}"]`)).toHaveLength(2)
    expect(wrapper.findAll(`line[stroke="${iec.phases.C.screen}"]`)).toHaveLength(2)
  })

  it('shows a quiet de-energized state with the breaker open, and with no result', async () => {
    const doc = starterBySlug('closed-delta-240')!.document
    for (const result of [solve(doc), null]) {
      const wrapper = await mountSuspended(BenchPhasor, { props: { result, doc, colours } })
      expect(wrapper.text()).toContain('De-energized')
      expect(wrapper.text()).not.toContain('V ∠')
      expect(wrapper.get('[role="img"]').attributes('aria-label')).toMatch(/de-energized/)
      expect(wrapper.find('table').exists()).toBe(false)
    }
  })
})
