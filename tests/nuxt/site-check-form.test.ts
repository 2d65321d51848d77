// The Site check form and sheet components: the unit list follows the connection, errors show
// beside their fields in the schema's words, and the sheet lists every test point.
import { describe, expect, it } from 'vitest'
import { mountSuspended } from '@nuxt/test-utils/runtime'
import SiteCheckForm from '~/components/site-check/SiteCheckForm.vue'
import SiteCheckSheet from '~/components/site-check/SiteCheckSheet.vue'
import { exampleSiteCheck, planSiteCheck } from '#shared/site-check'

describe('the Site check form', () => {
  it('takes two units for an open delta and three again for a wye–delta; lighting only on a high-leg delta', async () => {
    const wrapper = await mountSuspended(SiteCheckForm)
    const store = useSiteCheckStore()
    store.reset()
    await nextTick()
    expect(wrapper.findAll('[data-unit]')).toHaveLength(3)
    expect(wrapper.find('#sc-load-lighting').exists()).toBe(true)
    await wrapper.get('#sc-connection').setValue('open-delta')
    await nextTick()
    expect(wrapper.findAll('[data-unit]')).toHaveLength(2)
    expect(wrapper.find('#sc-load-lighting').exists()).toBe(false)
    expect(store.input.loads.lightingKva).toBe(0)
    await wrapper.get('#sc-connection').setValue('wye-delta')
    await nextTick()
    expect(wrapper.findAll('[data-unit]')).toHaveLength(3)
    expect(store.plan).not.toBeNull()
  })

  it('shows the schema\'s words beside a bad field, and no plan until it is fixed', async () => {
    const wrapper = await mountSuspended(SiteCheckForm)
    const store = useSiteCheckStore()
    store.reset()
    await nextTick()
    await wrapper.get('#sc-u0-kva').setValue('-5')
    await nextTick()
    expect(wrapper.text()).toContain('kVA must be greater than 0')
    expect(store.plan).toBeNull()
    await wrapper.get('#sc-u0-kva').setValue('25')
    await wrapper.get('#sc-u2-coils').setValue('240')
    await wrapper.get('#sc-u2-coils').trigger('change')
    await nextTick()
    expect(wrapper.text()).toContain('the lighting unit (T3) of a high-leg delta needs two coils')
  })
})

describe('the Site check sheet', () => {
  it('lists every test point with its expected reading, and the Measured column only when printable', async () => {
    const plan = planSiteCheck(exampleSiteCheck())
    const screen = await mountSuspended(SiteCheckSheet, { props: { plan } })
    const rows = screen.findAll('[data-test-point]')
    expect(rows).toHaveLength(plan.testPoints.length)
    expect(screen.get('[data-kind="high-leg"] [data-expected]').text()).toBe('207.8 V')
    expect(screen.text()).not.toContain('Measured')
    expect(screen.text()).toContain('Local code and licensed practice first.')
    const printable = await mountSuspended(SiteCheckSheet, { props: { plan, printable: true } })
    expect(printable.text()).toContain('Measured')
    expect(printable.text()).toContain('Pre-energization sheet')
  })
})
