import type { BankSummary, Paged } from '#shared/schemas/banks'
import { BANK_NAME_MAX } from '#shared/schemas/banks'

export type BankSort = 'updated' | 'name' | 'created'

/** "My banks": the list with its search, sort, paging and view, and what can be done to a row. */
export function useBanks() {
  const query = reactive({ q: '', sort: 'updated' as BankSort, order: 'desc' as 'asc' | 'desc', page: 1, pageSize: 20, deleted: '0' as '0' | '1' })
  const search = ref('')
  let searchTimer: ReturnType<typeof setTimeout> | undefined
  watch(search, (text) => {
    clearTimeout(searchTimer)
    searchTimer = setTimeout(() => {
      query.q = text.trim()
      query.page = 1
    }, 250)
  })

  const { data, status, error, refresh } = useFetch<Paged<BankSummary>>('/api/banks', {
    query,
    key: 'my-banks',
    default: () => ({ items: [], total: 0, page: 1, pageSize: 20 }),
  })
  const pages = computed(() => Math.max(1, Math.ceil((data.value?.total ?? 0) / query.pageSize)))

  async function create(name: string, document: unknown) {
    return callApi<{ id: number, version: number }>('/api/banks', { method: 'POST', body: { name: name.slice(0, BANK_NAME_MAX), document } })
  }
  async function rename(bank: BankSummary, name: string) {
    return callApi<{ id: number, version: number }>(`/api/banks/${bank.id}`, { method: 'PATCH', body: { name, version: bank.version } })
  }
  const post = (bank: BankSummary, action: string) => callApi<any>(`/api/banks/${bank.id}/${action}`, { method: 'POST' })
  const duplicate = (bank: BankSummary) => post(bank, 'duplicate')
  const restore = (bank: BankSummary) => post(bank, 'restore')
  const share = (bank: BankSummary) => post(bank, 'share') as Promise<{ token: string, url: string }>
  const unshare = (bank: BankSummary) => callApi(`/api/banks/${bank.id}/share`, { method: 'DELETE' })
  const remove = (bank: BankSummary) => callApi(`/api/banks/${bank.id}`, { method: 'DELETE' })

  return { query, search, data, status, error, refresh, pages, create, rename, duplicate, restore, share, unshare, remove }
}
