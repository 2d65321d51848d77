// The Bench's meters as parts: an ammeter shows its current with its angle in amps, a rotation
// meter shows the sequence of its leads in words, and the readings panel says each in its own
// unit. The values come from the engine; the tests check the faces against it.
import { describe, expect, it } from 'vitest'
import { defineComponent, h } from 'vue'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import BenchNodeAmmeter from '~/components/bench/BenchNodeAmmeter.vue'
import BenchNodeRotationMeter from '~/components/bench/BenchNodeRotationMeter.vue'
import BenchNodeVoltmeter from '~/components/bench/BenchNodeVoltmeter.vue'
import BenchReadings from '~/components/bench/BenchReadings.vue'
import { useBenchStore } from '~/stores/bench'
import type { Circuit } from '#shared/circuit/schema'
import { isAmpReading, isRotationReading, solve } from '#shared/engine'
import { starterBySlug } from '#shared/starters'

// a terminal outside a Vue Flow canvas: its name and place along the side, nothing else
const TerminalStub = defineComponent({
  props: { part: String, name: String, side: String, at: Number },
  setup: (p) => () => h('i', { 'data-stub-terminal': `${p.part}.${p.name}`, 'data-side': p.side, 'data-at': p.at }),
})
const stubs = { BenchTerminal: TerminalStub }

function energized(slug: string, extra: (doc: Circuit) => void = () => {}): Circuit {
  const doc = starterBySlug(slug)!.document
  const cb1 = doc.components.find((c) => c.id === 'CB1')
  if (cb1?.kind === 'breaker') cb1.closed = true
  extra(doc)
  return doc
}

/** one unit at 120 V feeding a 10 Ω heater through ammeter A1 */
const withAmmeter = (doc: Circuit) => {
  doc.components.push({ id: 'L1', kind: 'load', ohms: 10 }, { id: 'A1', kind: 'ammeter' })
  doc.wires.push(['OUT.a', 'A1.a'], ['A1.b', 'L1.a'], ['L1.b', 'OUT.b'])
  doc.layout = { ...doc.layout, L1: { x: 0, y: 900 }, A1: { x: 300, y: 900 } }
}

const withRotationMeter = (leads: [string, string, string]) => (doc: Circuit) => {
  doc.components.push({ id: 'R1', kind: 'rotation-meter' })
  doc.wires.push(['R1.a', leads[0]], ['R1.b', leads[1]], ['R1.c', leads[2]])
  doc.layout = { ...doc.layout, R1: { x: 600, y: 900 } }
}

describe('the ammeter on the Bench', () => {
  it('reads the heater current as a meter does, in amps with its angle: about 120 V / 10 Ω', async () => {
    const doc = energized('single-unit-parallel-120', withAmmeter)
    const expected = solve(doc).meters.A1
    expect(isAmpReading(expected)).toBe(true)
    if (!isAmpReading(expected)) return
    expect(expected.amps).toBeGreaterThan(11)
    expect(expected.amps).toBeLessThan(12.1)

    useBenchStore().load(doc)
    const wrapper = await mountSuspended(BenchNodeAmmeter, { props: { id: 'A1' }, global: { stubs } })
    const face = wrapper.get('[data-meter="A1"]')
    expect(face.text()).toBe(formatAmps(expected.amps, expected.degrees))
    expect(face.text()).toMatch(/^\d+\.\d\d A ∠ −?\d+\.\d°$/)
    expect(face.attributes('aria-label')).toBe(`A1 reads ${face.text()}`)
    expect(face.classes()).toContain('reading')
    expect(wrapper.findAll('[data-stub-terminal]').map((t) => t.attributes('data-stub-terminal'))).toEqual(['A1.a', 'A1.b'])
  })

  it('shows 0.00 A without an angle when the bank is dead', async () => {
    const doc = starterBySlug('single-unit-parallel-120')!.document
    withAmmeter(doc)
    useBenchStore().load(doc)
    const wrapper = await mountSuspended(BenchNodeAmmeter, { props: { id: 'A1' }, global: { stubs } })
    expect(wrapper.get('[data-meter="A1"]').text()).toBe('0.00 A')
  })

  it('formats currents as the face does: two decimals under 100 A, one under 1000 A', () => {
    expect(formatAmps(12.1, -25.8)).toBe('12.10 A ∠ −25.8°')
    expect(formatAmps(123.45, 30)).toBe('123.5 A ∠ 30.0°')
    expect(formatAmps(1234.5)).toBe('1235 A')
  })
})

describe('the rotation meter on the Bench', () => {
  it.each([
    ['leads a, b, c on the output a, b, c', ['OUT.a', 'OUT.b', 'OUT.c'], 'ABC', 'A-B-C'],
    ['leads b and c swapped', ['OUT.a', 'OUT.c', 'OUT.b'], 'ACB', 'A-C-B'],
  ] as const)('%s: reads the sequence, said in letters', async (_name, leads, sequence, words) => {
    const doc = energized('closed-delta-240', withRotationMeter([...leads]))
    const reading = solve(doc).meters.R1
    expect(isRotationReading(reading) && reading.sequence).toBe(sequence)

    useBenchStore().load(doc)
    const wrapper = await mountSuspended(BenchNodeRotationMeter, { props: { id: 'R1' }, global: { stubs } })
    const face = wrapper.get('[data-meter="R1"]')
    expect(face.attributes('data-sequence')).toBe(sequence)
    // the words say it; the arrow beside them is hidden from screen readers
    expect(face.text()).toContain(words)
    expect(face.attributes('aria-label')).toMatch(new RegExp(`^R1 reads ${words}`))
    expect(wrapper.findAll('[data-stub-terminal]').map((t) => t.attributes('data-stub-terminal'))).toEqual(['R1.a', 'R1.b', 'R1.c'])
  })

  it('says "no rotation" when the bank is dead', async () => {
    const doc = starterBySlug('closed-delta-240')!.document
    withRotationMeter(['OUT.a', 'OUT.b', 'OUT.c'])(doc)
    useBenchStore().load(doc)
    const wrapper = await mountSuspended(BenchNodeRotationMeter, { props: { id: 'R1' }, global: { stubs } })
    expect(wrapper.get('[data-meter="R1"]').text()).toContain('no rotation')
    expect(wrapper.get('[data-meter="R1"]').attributes('aria-label')).toMatch(/^R1 reads no rotation/)
  })
})

describe('the voltmeter beside the new meters', () => {
  it('still reads its volts, and nothing from a meter of another kind', async () => {
    const doc = energized('closed-delta-240', withRotationMeter(['OUT.a', 'OUT.b', 'OUT.c']))
    useBenchStore().load(doc)
    const volts = await mountSuspended(BenchNodeVoltmeter, { props: { id: 'Mab' }, global: { stubs } })
    expect(volts.get('[data-meter="Mab"]').text()).toMatch(/^2[34]\d\.\d V$/)
    // a voltmeter component pointed at the rotation meter's id shows no reading rather than a wrong one
    const wrong = await mountSuspended(BenchNodeVoltmeter, { props: { id: 'R1' }, global: { stubs } })
    expect(wrong.get('[data-meter="R1"]').text()).toBe('—')
  })
})

describe('the readings panel with every kind of meter', () => {
  it('lists the ammeter in amps and the rotation meter in words, and compares only the voltmeters', async () => {
    const doc = energized('single-unit-parallel-120', (d) => {
      withAmmeter(d)
      withRotationMeter(['OUT.a', 'OUT.b', 'OUT.a'])(d)
    })
    useBenchStore().load(doc)
    const wrapper = await mountSuspended(BenchReadings)
    const amps = wrapper.get('[data-meter-row="A1"]')
    expect(amps.text()).toMatch(/1\d\.\d\d A ∠/)
    expect(amps.findAll('[data-check]')).toHaveLength(0)
    expect(wrapper.get('[data-meter-row="R1"]').text()).toContain('no rotation')
    expect(wrapper.get('[data-meter-row="Mab"]').text()).toMatch(/1[12]\d\.\d V ∠/)
    expect(wrapper.get('[data-testid="vector-group"]').text()).toBe(solve(doc).bank.vectorGroup ?? '')
  })
})
