/** What the Site check pages share: who may use it, loading a saved site check, the PDF download. */
import { SITE_CHECK_KEY, SITE_CHECK_ROLES, SiteCheckInputSchema } from '#shared/site-check'

export function useSiteCheck() {
  const store = useSiteCheckStore()
  const { user, loggedIn } = useUserSession()
  const allowed = computed(() => !!user.value && (SITE_CHECK_ROLES as readonly string[]).includes(user.value.role))

  /** Loads a saved site check (a bank of kind 'site-check') into the form. */
  async function loadSaved(id: number) {
    const bank = await callApi<{ id: number, kind: string, document: Record<string, unknown> }>(`/api/banks/${id}`)
    const parsed = SiteCheckInputSchema.safeParse(bank.document[SITE_CHECK_KEY])
    if (bank.kind !== 'site-check' || !parsed.success) throw new Error('That bank is not a site check')
    store.use(parsed.data, bank.id)
  }

  /** Asks the server for the sheet as a PDF and hands it to the browser as a download. */
  async function downloadPdf() {
    const blob = await ($fetch as unknown as (p: string, o: object) => Promise<Blob>)('/api/site-checks/pdf', { method: 'POST', body: store.input, responseType: 'blob' })
    const url = URL.createObjectURL(blob)
    const a = document.createElement('a')
    a.href = url
    a.download = `site-check-${store.input.name.toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-+|-+$/g, '') || 'bank'}.pdf`
    document.body.appendChild(a)
    a.click()
    a.remove()
    setTimeout(() => URL.revokeObjectURL(url), 10_000)
  }

  return { store, user, loggedIn, allowed, loadSaved, downloadPdf }
}
