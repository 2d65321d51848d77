/** The Bench's keyboard shortcuts (listed in its help dialog). */
export function useBenchShortcuts(openHelp: () => void) {
  const bench = useBenchStore()
  // undo and redo can take away the focused jumper tag or part: the focus goes to its neighbour
  function keepingFocus(step: () => void) {
    const mark = focusMark()
    step()
    void restoreFocus(mark)
  }
  function onKey(e: KeyboardEvent) {
    const target = e.target as HTMLElement | null
    if (target && (target.tagName === 'INPUT' || target.tagName === 'TEXTAREA' || target.tagName === 'SELECT' || target.isContentEditable)) return
    const mod = e.ctrlKey || e.metaKey
    const key = e.key.toLowerCase()
    if (mod && key === 'z' && !e.shiftKey) keepingFocus(bench.undo)
    else if (mod && ((key === 'z' && e.shiftKey) || key === 'y')) keepingFocus(bench.redo)
    else if (mod && key === 'c') bench.copySelected()
    else if (mod && key === 'v' && bench.clipboard) bench.paste(nextPartId(bench.clipboard.kind, bench.doc.components.map((c) => c.id)))
    else if (e.key === 'Escape' && bench.pendingTerminal) {
      bench.pendingTerminal = null
      bench.notice = { tone: 'info', text: 'Pick cancelled.' }
    }
    else if (e.key === '?') openHelp()
    else return
    e.preventDefault()
  }
  onMounted(() => window.addEventListener('keydown', onKey))
  onBeforeUnmount(() => window.removeEventListener('keydown', onKey))
}
