import { FetchError } from 'ofetch'

/**
 * Saving the Bench's bank through the banks API, with its version: a new bank is created,
 * a saved one is patched; a 409 (someone saved in between) offers reload or a copy.
 * Saved banks autosave a moment after each edit.
 */
export function useBankSave() {
  const bench = useBenchStore()
  const { loggedIn } = useUserSession()
  const state = ref<'idle' | 'saving' | 'saved' | 'conflict' | 'error'>('idle')
  const message = ref('')

  async function save(): Promise<void> {
    if (!loggedIn.value) {
      state.value = 'error'
      message.value = 'Sign in to save banks.'
      return
    }
    state.value = 'saving'
    try {
      if (bench.bankId === null) {
        const made = await $fetch<{ id: number; version: number }>('/api/banks', { method: 'POST', body: { name: bench.doc.name || 'Untitled bank', document: bench.doc } })
        bench.bankId = made.id
        bench.bankVersion = made.version
        await navigateTo(`/bench/${made.id}`, { replace: true })
      } else {
        const saved = await $fetch<{ id: number; version: number }>(`/api/banks/${bench.bankId}`, {
          method: 'PATCH',
          body: { name: bench.doc.name || 'Untitled bank', document: bench.doc, version: bench.bankVersion },
        })
        bench.bankVersion = saved.version
      }
      bench.dirty = false
      state.value = 'saved'
      message.value = 'Saved.'
    } catch (e) {
      if (e instanceof FetchError && e.statusCode === 409) {
        state.value = 'conflict'
        message.value = 'Someone saved this bank in the meantime. Reload their version, or save yours as a copy.'
      } else {
        state.value = 'error'
        message.value = e instanceof FetchError ? `Not saved: ${e.data?.statusMessage ?? e.statusMessage ?? e.message}` : 'Not saved.'
      }
    }
  }

  async function saveCopy() {
    bench.bankId = null
    bench.bankVersion = null
    bench.rename(`${bench.doc.name || 'Bank'} (copy)`)
    await save()
  }

  async function reload() {
    if (bench.bankId === null) return
    const bank = await $fetch<{ id: number; name: string; document: never; version: number }>(`/api/banks/${bench.bankId}`)
    bench.load(bank.document, { id: bank.id, version: bank.version })
    state.value = 'idle'
  }

  let timer: ReturnType<typeof setTimeout> | undefined
  watch(
    () => bench.doc,
    () => {
      if (bench.bankId === null || !bench.dirty || state.value === 'conflict') return
      clearTimeout(timer)
      timer = setTimeout(save, 1500)
    },
  )
  onBeforeUnmount(() => clearTimeout(timer))

  return { state, message, save, saveCopy, reload, loggedIn }
}
