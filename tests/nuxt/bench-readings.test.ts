// The readings panel: the bank summary says plainly when the wiring is no proper connection
// (no clock number then), and each meter is compared with a correct bank by size and angle.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import BenchReadings from '~/components/bench/BenchReadings.vue'
import BenchPhasor from '~/components/bench/BenchPhasor.vue'
import { useBenchStore } from '~/stores/bench'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { parseCircuit } from '#shared/circuit/parse'
import type { Circuit } from '#shared/circuit/schema'
import { solve } from '#shared/engine'
import { phaseColourSet } from '#shared/phase-colours'

const unit = { kva: 25, primaryVolts: 480, secondaryVolts: [120, 120] }
const base: Omit<BankSpec, 'secondary'> = { supply: { connection: 'delta', lineVolts: 480 }, units: unit, primary: 'delta', coils: 'series', breaker: { amps: 150, closed: true }, fuseAmps: 125 }
const doc = (spec: Partial<BankSpec>): Circuit => {
  const parsed = parseCircuit(buildBank({ ...base, secondary: 'delta', ...spec } as BankSpec))
  if (!parsed.ok) throw new Error('invalid test bank')
  return parsed.circuit
}
const colours = phaseColourSet('na-120-240')

async function readings(d: Circuit) {
  const bench = useBenchStore()
  bench.load(d)
  return mountSuspended(BenchReadings)
}

describe('BenchReadings: the bank summary', () => {
  it('names a proper delta–wye with its clock number', async () => {
    const wrapper = await readings(doc({ secondary: 'wye' }))
    const summary = wrapper.get('[data-testid="bank-summary"]').text()
    expect(summary).toMatch(/Primary\s*delta/)
    expect(summary).toMatch(/Secondary\s*wye/)
    expect(summary).toContain('−30.0° (clock 1)')
    expect(wrapper.find('[data-testid="bank-not-valid"]').exists()).toBe(false)
  })

  it.each([
    ['a delta–wye with T2 reversed', { secondary: 'wye', reversed: ['T2'] }, 'wye with T2 reversed — not a valid connection'],
    ['a delta with an open corner and T3 reversed', { secondary: 'delta', openCorner: true, reversed: ['T3'] }, 'delta with one corner open and T3 reversed — not a valid connection'],
    ['a delta, dead, with T1 reversed', { secondary: 'delta', reversed: ['T1'], breaker: { amps: 150, closed: false } }, 'delta with T1 reversed — not a valid connection'],
  ] as [string, Partial<BankSpec>, string][])('%s: says so, with no clock number', async (_name, spec, words) => {
    const wrapper = await readings(doc(spec))
    const summary = wrapper.get('[data-testid="bank-summary"]').text()
    expect(summary).toContain(words)
    expect(summary).toContain('no clock number')
    expect(summary).not.toMatch(/clock \d/)
    const warning = wrapper.get('[data-testid="bank-not-valid"]')
    expect(warning.text()).toMatch(/^⚠\s*Not a proper bank: .* No clock number\./)
    expect(warning.text()).toMatch(/is connected backwards/)
  })

  it('an open coil: T2\'s series jumper missing in a wye', async () => {
    const d = doc({ secondary: 'wye' })
    const wrapper = await readings({ ...d, wires: d.wires.filter((w) => !(w.includes('T2.X2') && w.includes('T2.X3'))) })
    expect(wrapper.get('[data-testid="bank-summary"]').text()).toContain('no delta or wye: T2 open — not a valid connection')
    expect(wrapper.get('[data-testid="bank-not-valid"]').text()).toContain("T2's secondary is open")
  })
})

describe('BenchReadings: measured against expected', () => {
  it('a correct bank: expected values with their angle, nothing marked', async () => {
    const wrapper = await readings(doc({ secondary: 'delta' }))
    expect(wrapper.get('[data-meter-row="Mbc"]').text()).toContain('240.0 V ∠ −90.0°')
    expect(wrapper.findAll('[data-check]')).toHaveLength(0)
  })

  it('a reading of the right size at the wrong angle is marked, in words and a symbol', async () => {
    // T2 reversed in a delta with one corner open: b–c reads 240 V, but at +90° instead of −90°
    const wrapper = await readings(doc({ secondary: 'delta', openCorner: true, reversed: ['T2'] }))
    const row = wrapper.get('[data-meter-row="Mbc"]')
    // 240 V less what the cores' exciting current drops in the units (format 1.1: well under 0.5 %)
    expect(row.text()).toMatch(/Mbc2(39\.[5-9]|40\.0) V ∠ 90\.0°/)
    expect(row.find('[data-check="volts"]').exists()).toBe(false)
    expect(row.get('[data-check="angle"]').text()).toMatch(/∠≠\s*wrong angle: 180\.0°/)
    // a–b sets the reference and matches
    expect(wrapper.get('[data-meter-row="Mab"]').findAll('[data-check]')).toHaveLength(0)
    // c–a is off in both: 415.7 V at −120° for 240 V at 150°
    const ca = wrapper.get('[data-meter-row="Mca"]')
    expect(ca.get('[data-check="volts"]').text()).toMatch(/off by 175\.[5-7] V/)
    expect(ca.get('[data-check="angle"]').text()).toContain('wrong angle: 90.0° ahead')
  })

  it('the output lines b and c swapped on a wye (rotation reversed): right sizes, wrong angles, marked', async () => {
    const d = doc({ secondary: 'wye' })
    const swap = (t: string) => (t === 'OUT.b' ? 'OUT.c' : t === 'OUT.c' ? 'OUT.b' : t)
    const wires = d.wires.map(([x, y]): [string, string] => (x.startsWith('T') || y.startsWith('T') ? [swap(x), swap(y)] : [x, y]))
    const wrapper = await readings({ ...d, wires })
    expect(wrapper.findAll('[data-check="volts"]')).toHaveLength(0)
    for (const id of ['Mbc', 'Mca', 'Mbn', 'Mcn']) expect(wrapper.get(`[data-meter-row="${id}"] [data-check="angle"]`).text()).toMatch(/wrong angle: \d+\.0° (ahead|behind)/)
    // a–b is the reference: its own angle always matches
    expect(wrapper.get('[data-meter-row="Mab"]').findAll('[data-check]')).toHaveLength(0)
  })
})

describe('BenchPhasor on a faulted bank', () => {
  it('says the bank is not a proper connection instead of a clock number and vector group', async () => {
    const d = doc({ secondary: 'wye', reversed: ['T2'] })
    const wrapper = await mountSuspended(BenchPhasor, { props: { result: solve(d), doc: d, colours } })
    expect(wrapper.get('[data-testid="phasor-not-valid"]').text()).toContain('Not a proper bank: wye with T2 reversed — not a valid connection. No clock number.')
    expect(wrapper.text()).not.toContain('Vector group')
    expect(wrapper.text()).not.toContain('Dyn1')
    const label = wrapper.get('[role="img"]').attributes('aria-label')
    expect(label).toContain('Not a proper bank')
    expect(label).not.toMatch(/clock \d/)
  })

  it('still gives the vector group of the same bank wired right', async () => {
    const d = doc({ secondary: 'wye' })
    const wrapper = await mountSuspended(BenchPhasor, { props: { result: solve(d), doc: d, colours } })
    expect(wrapper.find('[data-testid="phasor-not-valid"]').exists()).toBe(false)
    expect(wrapper.text()).toContain('Dyn1')
  })
})

describe('BenchReadings: a primary that makes no delta or wye', () => {
  it('says so in a few words', async () => {
    const wrapper = await readings({ ...doc({ secondary: 'delta' }), wires: [...doc({ secondary: 'delta' }).wires, ['T1.H1', 'T1.H2']] })
    expect(wrapper.get('[data-testid="bank-summary"]').text()).toMatch(/Primary\s*no delta or wye — not a valid connection/)
    expect(wrapper.get('[data-testid="bank-not-valid"]').text()).toContain('Not a proper bank: primary: no delta or wye — not a valid connection. No clock number.')
  })
})
