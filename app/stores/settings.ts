/** The user's own settings, kept in this browser: the regional phase-colour convention. */
import { defineStore } from 'pinia'
import { phaseColourSets, type PhaseColourSet } from '#shared/phase-colours'

const KEY = 'phaseloom.settings'

export const useSettingsStore = defineStore('settings', () => {
  const phaseSetId = ref(phaseColourSets[0]!.id)
  const phaseSet = computed<PhaseColourSet>(() => phaseColourSets.find((s) => s.id === phaseSetId.value) ?? phaseColourSets[0]!)

  function restore() {
    if (!import.meta.client) return
    try {
      const saved = JSON.parse(localStorage.getItem(KEY) ?? '{}') as { phaseSetId?: string }
      if (saved.phaseSetId && phaseColourSets.some((s) => s.id === saved.phaseSetId)) phaseSetId.value = saved.phaseSetId
    } catch {
      // a damaged entry: keep the defaults
    }
  }

  function choosePhaseSet(id: string) {
    phaseSetId.value = id
    if (import.meta.client) localStorage.setItem(KEY, JSON.stringify({ phaseSetId: id }))
  }

  return { phaseSetId, phaseSet, restore, choosePhaseSet }
})
