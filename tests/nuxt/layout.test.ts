import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import DefaultLayout from '~/layouts/default.vue'

describe('default layout', () => {
  it('links to every section of the app, in order, and to sign-in', async () => {
    const wrapper = await mountSuspended(DefaultLayout)
    const nav = wrapper.get('nav[aria-label="Main"]')
    const links = nav.findAll('a').map(link => ({ text: link.text(), href: link.attributes('href') }))
    expect(links).toEqual([
      { text: 'Bench', href: '/bench' },
      { text: 'Starters', href: '/starters' },
      { text: 'Hunts', href: '/hunts' },
      { text: 'Classes', href: '/classes' },
      { text: 'Lab sheets', href: '/lab-sheets' },
      { text: 'Site check', href: '/site-check' },
    ])
    expect(wrapper.find('a[href="/sign-in"]').text()).toBe('Sign in')
  })

  it('starts with a skip link to the main content', async () => {
    const wrapper = await mountSuspended(DefaultLayout)
    const first = wrapper.findAll('a')[0]!
    expect(first.text()).toBe('Skip to content')
    expect(first.attributes('href')).toBe('#main')
    expect(wrapper.find('main#main').exists()).toBe(true)
  })

  it('carries the safety words in the footer', async () => {
    const wrapper = await mountSuspended(DefaultLayout)
    const footer = wrapper.get('footer').text()
    for (const words of [
      'practice and planning tool',
      'Real banks can kill',
      'lock out and verify absence of voltage',
      'rated PPE',
      'authority having jurisdiction',
    ]) {
      expect(footer).toContain(words)
    }
  })
})
