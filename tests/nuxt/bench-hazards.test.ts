// The hazards panel and the question before energizing: one row per hazard code with every part
// it names, the codes of format 1.1 under plain headings, the inrush cautions as caution rows,
// and dangers first.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import BenchHazards from '~/components/bench/BenchHazards.vue'
import BenchDialogs from '~/components/bench/BenchDialogs.vue'
import { useBenchStore } from '~/stores/bench'
import type { Circuit } from '#shared/circuit/schema'
import { solve } from '#shared/engine'
import { starterBySlug } from '#shared/starters'

const starter = (slug: string) => starterBySlug(slug)!.document
const closed = (doc: Circuit): Circuit => ({ ...doc, components: doc.components.map((c) => (c.id === 'CB1' && c.kind === 'breaker' ? { ...c, closed: true } : c)) })
/** T2's secondary turned round: the leads on X1 and X4 trade places */
const t2Reversed = (doc: Circuit): Circuit => ({ ...doc, wires: doc.wires.map((w) => w.map((t) => (t === 'T2.X1' ? 'T2.X4' : t === 'T2.X4' ? 'T2.X1' : t)) as [string, string]) })
const fastFuses = (doc: Circuit): Circuit => ({ ...doc, components: doc.components.map((c) => (c.kind === 'fuse' ? { ...c, amps: 15, curve: 'fast-acting' as const } : c)) })

async function panel(doc: Circuit) {
  useBenchStore().load(doc)
  return mountSuspended(BenchHazards)
}

describe('BenchHazards', () => {
  it('an open delta with T2 reversed, energized: "Output voltage wrong" names the output and both units, with the readings', async () => {
    const wrapper = await panel(closed(t2Reversed(starter('open-delta-240'))))
    const row = wrapper.get('[data-hazard="output-voltage"]')
    expect(row.text()).toMatch(/^⚠\s*Danger: Output voltage wrong · OUT, T1, T2/)
    expect(row.text()).toMatch(/415\.\d V/)
    expect(wrapper.text()).not.toContain('Nothing wrong found')
  })

  it('the same bank dead: says what closing CB1 would find', async () => {
    const wrapper = await panel(t2Reversed(starter('open-delta-240')))
    expect(wrapper.get('[data-testid="if-energized"]').text()).toMatch(/If you close CB1 now:\s*⚠\s*Danger: Output voltage wrong \(OUT, T1, T2\)\./)
  })

  it('a blown fuse on a delta: "Live beyond an open device" comes before the caution about the output', async () => {
    const doc = closed(starter('closed-delta-240'))
    const wrapper = await panel({ ...doc, components: doc.components.map((c) => (c.id === 'F1' && c.kind === 'fuse' ? { ...c, blown: true } : c)) })
    const rows = wrapper.findAll('[data-testid="hazard-list"] > li')
    expect(rows.map((r) => r.attributes('data-hazard'))).toEqual(['backfeed', 'output-voltage'])
    expect(rows[0]!.text()).toMatch(/^⚠\s*Danger: Live beyond an open device · F1, T1, T3/)
    expect(rows[1]!.text()).toMatch(/^!\s*Caution: Output voltage wrong · OUT/)
  })

  it('a floating star point pulled off centre: one row per code, each naming every unit, dangers first', async () => {
    const doc = closed(starter('floating-wye-delta-closing-check'))
    const unequal = { ...doc, components: doc.components.map((c) => (c.id === 'T2' && c.kind === 'transformer' ? { ...c, excitingPercent: 10 } : c)) }
    const hazards = solve(unequal).hazards
    // the engine gives one winding-overvoltage per unit; the panel gives one row for the code
    expect(hazards.filter((h) => h.code === 'winding-overvoltage').length).toBeGreaterThan(1)
    const wrapper = await panel(unequal)
    const rows = wrapper.findAll('[data-testid="hazard-list"] > li')
    const codes = rows.map((r) => r.attributes('data-hazard'))
    expect([...codes].sort()).toEqual([...new Set(hazards.map((h) => h.code))].sort())
    const danger = (code?: string) => hazards.some((h) => h.code === code && h.severity === 'danger')
    const firstCaution = codes.findIndex((c) => !danger(c))
    expect(codes.slice(0, firstCaution).every(danger)).toBe(true)
    expect(codes.slice(firstCaution).some(danger)).toBe(false)
    expect(codes.at(-1)).toBe('neutral-shift')
    const over = wrapper.get('[data-hazard="winding-overvoltage"]')
    expect(over.text()).toMatch(/Winding over its voltage · T1, T3/)
    expect(over.findAll('p')).toHaveLength(3)
    expect(wrapper.get('[data-hazard="neutral-shift"]').text()).toMatch(/^!\s*Caution: Floating star point moved · T1, T3, T2/)
  })

  it('fast-acting fuses: one caution row for the inrush, naming each fuse and the units behind them', async () => {
    const wrapper = await panel(fastFuses(starter('closed-delta-240')))
    expect(wrapper.findAll('[data-testid="hazard-list"] > li')).toHaveLength(0)
    const rows = wrapper.findAll('[data-testid="caution-list"] > li')
    expect(rows).toHaveLength(1)
    expect(rows[0]!.attributes('data-caution')).toBe('inrush')
    expect(rows[0]!.text()).toMatch(/^!\s*Caution: May open when energized \(inrush\) · F1, T1, T3, F2, T2, F3/)
    expect(rows[0]!.text()).toMatch(/fast-acting fuse\) may open on energizing/)
    expect(wrapper.text()).not.toContain('Nothing wrong found')
  })

  it('the new starter as shipped and energized: nothing wrong', async () => {
    expect((await panel(starter('floating-wye-delta-closing-check'))).text()).toContain('Nothing wrong found, energized or not.')
    const live = await panel(closed(starter('floating-wye-delta-closing-check')))
    expect(live.text()).toContain('Nothing wrong found in this state.')
    expect(live.get('[data-testid="closing-check"]').text()).toMatch(/near 0 V: phased right/)
  })
})

describe('the question before energizing', () => {
  async function ask(doc: Circuit) {
    const bench = useBenchStore()
    bench.load(doc)
    const wrapper = await mountSuspended(BenchDialogs)
    bench.breakerRequest = { id: 'CB1', closed: true }
    await nextTick()
    return { bench, wrapper }
  }

  it('an open delta with one unit reversed asks first, naming the output voltage, and CB1 stays open', async () => {
    const { bench, wrapper } = await ask(t2Reversed(starter('open-delta-240')))
    const dialog = wrapper.get('[data-testid="energize-dialog"]')
    expect(dialog.find('[data-energize-row="output-voltage"]').text()).toMatch(/Danger: Output voltage wrong · OUT, T1, T2.*415\.\d V/s)
    expect(bench.doc.components.find((c) => c.id === 'CB1')).toMatchObject({ closed: false })
    await wrapper.get('[data-testid="energize-anyway"]').trigger('click')
    expect(bench.doc.components.find((c) => c.id === 'CB1')).toMatchObject({ closed: true })
  })

  it('dangers ask first: the danger rows come before the caution rows', async () => {
    const { wrapper } = await ask(fastFuses(t2Reversed(starter('open-delta-240'))))
    const rows = wrapper.findAll('[data-energize-row]').map((r) => r.attributes('data-energize-row'))
    expect(rows).toEqual(['output-voltage', 'inrush'])
  })

  it('a sound bank closes without a question', async () => {
    const { bench } = await ask(starter('floating-wye-delta-closing-check'))
    expect(bench.doc.components.find((c) => c.id === 'CB1')).toMatchObject({ closed: true })
    expect(bench.breakerRequest).toBeNull()
  })
})
