/**
 * The Site check being planned: the form's values, the plan the engine makes of them (in the
 * browser, the same code the server runs for the PDF), and the hand-off of the built bank to
 * the Bench. The values are kept in this tab's sessionStorage so the sheet page and a reload
 * find them again.
 */
import { defineStore } from 'pinia'
import { computed, ref } from 'vue'
import { formatPath } from '#shared/circuit/parse'
import { exampleSiteCheck, planSiteCheck, SiteCheckInputSchema, unitsFor, EXAMPLE_UNIT, type SiteCheckInput, type SitePlan } from '#shared/site-check'

const KEY = 'phaseloom.site-check'

export const useSiteCheckStore = defineStore('siteCheck', () => {
  const input = ref<SiteCheckInput>(exampleSiteCheck())
  /** the saved bank this site check was opened from or saved as */
  const savedId = ref<number | null>(null)

  const checked = computed(() => SiteCheckInputSchema.safeParse(input.value))
  const errors = computed(() => {
    const found: Record<string, string> = {}
    if (!checked.value.success) for (const issue of checked.value.error.issues) found[formatPath(issue.path)] ??= issue.message
    return found
  })
  const plan = computed<SitePlan | null>(() => {
    if (!checked.value.success) return null
    try {
      return planSiteCheck(checked.value.data)
    } catch {
      return null
    }
  })

  /** Keeps the unit list as long as the connection needs (two for open delta, three otherwise). */
  function fitUnits() {
    const count = unitsFor(input.value.connection)
    const units = input.value.units
    while (units.length < count) units.push({ ...(units[units.length - 1] ?? EXAMPLE_UNIT), secondaryVolts: [...(units[units.length - 1] ?? EXAMPLE_UNIT).secondaryVolts] })
    if (units.length > count) units.splice(count)
  }

  function persist() {
    if (import.meta.client) sessionStorage.setItem(KEY, JSON.stringify({ input: input.value, savedId: savedId.value }))
  }
  function restore() {
    if (!import.meta.client) return
    try {
      const saved = JSON.parse(sessionStorage.getItem(KEY) ?? 'null') as { input?: unknown; savedId?: number | null } | null
      const parsed = SiteCheckInputSchema.safeParse(saved?.input)
      if (parsed.success) {
        input.value = parsed.data
        savedId.value = saved?.savedId ?? null
      }
    } catch {
      // a damaged entry: keep what is there
    }
  }
  function use(next: SiteCheckInput, id: number | null) {
    input.value = next
    savedId.value = id
    persist()
  }
  function reset() {
    use(exampleSiteCheck(), null)
  }

  return { input, savedId, checked, errors, plan, fitUnits, persist, restore, use, reset }
})
