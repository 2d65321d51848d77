import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import StartersPage from '~/pages/starters.vue'
import { starters } from '#shared/starters'

describe('/starters', () => {
  it('lists every starter, each linking to the Bench by its slug', async () => {
    const wrapper = await mountSuspended(StartersPage)
    const links = wrapper.findAll('a').map(a => ({ text: a.text(), href: a.attributes('href') }))
    expect(links).toEqual(starters.map(s => ({ text: s.title, href: `/bench?starter=${s.slug}` })))
    expect(links.length).toBeGreaterThanOrEqual(6)
    expect(links).toContainEqual({ text: 'Closed delta, 480 V to 240 V', href: '/bench?starter=closed-delta-240' })
  })

  it('gives each card a heading, its purpose in words and a drawing hidden from screen readers', async () => {
    const wrapper = await mountSuspended(StartersPage)
    expect(wrapper.get('h1').text()).toBe('Starters')
    const cards = wrapper.findAll('article')
    expect(cards).toHaveLength(starters.length)
    cards.forEach((card, i) => {
      expect(card.get('h2').text()).toBe(starters[i]!.title)
      expect(card.text()).toContain(starters[i]!.purpose)
      expect(card.get('svg').attributes('aria-hidden')).toBe('true')
    })
  })
})
