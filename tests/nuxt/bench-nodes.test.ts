// Parts drawn as the trade reads them: a unit's X bushings in the order its polarity puts them
// (IEEE C57.12.00: subtractive X1 below H1, additive X1 diagonally across), handles named as
// the terminals are; a fuse says its class and a breaker that never trips says it is a disconnect.
import { describe, expect, it } from 'vitest'
import { defineComponent, h } from 'vue'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import BenchNodeTransformer from '~/components/bench/BenchNodeTransformer.vue'
import BenchNodeBreaker from '~/components/bench/BenchNodeBreaker.vue'
import BenchNodeFuse from '~/components/bench/BenchNodeFuse.vue'
import { useBenchStore } from '~/stores/bench'
import type { Circuit, Component } from '#shared/circuit/schema'
import { starterBySlug } from '#shared/starters'

const TerminalStub = defineComponent({
  props: { part: String, name: String, side: String, at: Number },
  setup: (p) => () => h('i', { 'data-stub-terminal': p.name, 'data-side': p.side, 'data-at': p.at }),
})
const stubs = { BenchTerminal: TerminalStub }

function edited(slug: string, id: string, patch: Partial<Component>): Circuit {
  const doc = starterBySlug(slug)!.document
  return { ...doc, components: doc.components.map((c) => (c.id === id ? ({ ...c, ...patch } as Component) : c)) }
}

/** the terminals along one side, left to right */
async function sideOf(id: string, side: 'top' | 'bottom') {
  const wrapper = await mountSuspended(BenchNodeTransformer, { props: { id }, global: { stubs } })
  const names = wrapper
    .findAll(`[data-side="${side}"]`)
    .map((t) => ({ name: t.attributes('data-stub-terminal')!, at: Number(t.attributes('data-at')) }))
    .sort((p, q) => p.at - q.at)
    .map((t) => t.name)
  return { wrapper, names }
}

describe('a unit drawn with its bushing layout', () => {
  it.each([
    ['subtractive, two coils', 'closed-delta-240', { polarity: 'subtractive' }, ['X1', 'X2', 'X3', 'X4']],
    ['additive, two coils', 'closed-delta-240', { polarity: 'additive' }, ['X4', 'X3', 'X2', 'X1']],
    ['subtractive, one coil', 'closed-delta-240', { polarity: 'subtractive', secondaryVolts: [240] }, ['X1', 'X2']],
    ['additive, one coil', 'closed-delta-240', { polarity: 'additive', secondaryVolts: [240] }, ['X2', 'X1']],
  ] as const)('%s: H1 H2 on top, X below in that order', async (_name, slug, patch, low) => {
    useBenchStore().load(edited(slug, 'T1', patch as Partial<Component>))
    const top = await sideOf('T1', 'top')
    expect(top.names).toEqual(['H1', 'H2'])
    const bottom = await sideOf('T1', 'bottom')
    expect(bottom.names).toEqual(low)
    expect(bottom.wrapper.get('[data-polarity]').attributes('data-polarity')).toBe(patch.polarity)
    expect(bottom.wrapper.get('[data-polarity]').text()).toContain(patch.polarity)
  })

  it('says a tap off nominal beside the polarity', async () => {
    useBenchStore().load(edited('closed-delta-240', 'T2', { tapPercent: -5 }))
    const { wrapper } = await sideOf('T2', 'bottom')
    expect(wrapper.get('[data-polarity]').text()).toBe('subtractive · tap −5 %')
  })
})

describe('protective devices say what they are', () => {
  it('a fuse shows its class', async () => {
    useBenchStore().load(edited('closed-delta-240', 'F1', { curve: 'fast-acting' }))
    const fast = await mountSuspended(BenchNodeFuse, { props: { id: 'F1' }, global: { stubs } })
    expect(fast.get('[data-curve]').text()).toBe('fast-acting')
    const slow = await mountSuspended(BenchNodeFuse, { props: { id: 'F2' }, global: { stubs } })
    expect(slow.get('[data-curve]').text()).toBe('time-delay')
  })

  it('a breaker that never trips is drawn as a disconnect', async () => {
    useBenchStore().load(edited('closed-delta-240', 'CB1', { trips: false }))
    const wrapper = await mountSuspended(BenchNodeBreaker, { props: { id: 'CB1' }, global: { stubs } })
    expect(wrapper.text()).toContain('Disconnect')
    expect(wrapper.text()).toContain('no trip')
  })
})
