/**
 * Keeping the keyboard where it was when the Bench re-renders under it: undo and redo can
 * remove the focused jumper tag or part, saving a new bank opens it at its own address, and a
 * part moved to another row moves in the Tab order. Without this the focus falls back to the
 * top of the page.
 */
export interface FocusMark {
  el: HTMLElement
  /** where to look for the same control after a re-render, then the nearest sensible ones */
  selectors: string[]
}

const quote = (v: string) => `"${v.replace(/["\\]/g, '\\$&')}"`

/** Notes the focused element and how to find it, or its neighbours, again. */
export function focusMark(): FocusMark | null {
  if (typeof document === 'undefined') return null
  const el = document.activeElement as HTMLElement | null
  if (!el || el === document.body) return null
  const selectors: string[] = []
  const jumper = el.getAttribute('data-jumper')
  const terminal = el.getAttribute('data-terminal')
  const node = el.closest<HTMLElement>('.vue-flow__node')
  const testid = el.getAttribute('data-testid')
  if (jumper) {
    selectors.push(`[data-jumper=${quote(jumper)}]`)
    // the jumper gone: the terminals it joined, then their parts
    for (const t of jumper.split('~')) selectors.push(`[data-terminal=${quote(t)}]`)
    for (const t of jumper.split('~')) selectors.push(`.vue-flow__node[data-id=${quote(t.slice(0, t.lastIndexOf('.')))}]`)
  }
  if (terminal) selectors.push(`[data-terminal=${quote(terminal)}]`)
  if (node?.dataset.id) selectors.push(`.vue-flow__node[data-id=${quote(node.dataset.id)}]`)
  if (testid) selectors.push(`[data-testid=${quote(testid)}]`)
  if (el.id) selectors.push(`#${CSS.escape(el.id)}`)
  // inside the canvas and nothing of it left: the canvas itself
  if (el.closest('[data-testid="bench-canvas"]')) selectors.push('[data-testid="bench-canvas"]')
  return { el, selectors }
}

const focusable = (el: HTMLElement | null): el is HTMLElement => !!el && el.isConnected && !(el as HTMLButtonElement).disabled

function tryRestore(mark: FocusMark): boolean {
  const now = document.activeElement as HTMLElement | null
  if (now === mark.el && mark.el.isConnected) return true
  // the user (or the page) has put the focus somewhere on purpose: leave it there
  if (now && now !== document.body && now.isConnected) return true
  const target = focusable(mark.el) ? mark.el : mark.selectors.map((s) => document.querySelector<HTMLElement>(s)).find(focusable)
  if (!target) return false
  target.focus({ preventScroll: true })
  return document.activeElement === target
}

/**
 * After the change has rendered, puts the focus back on the marked control or the nearest
 * sensible one, if it was lost. `waitMs` keeps watching that long while a new page replaces
 * this one (a first save): the old page's control can take the focus and then go with it.
 */
export async function restoreFocus(mark: FocusMark | null, { waitMs = 0 } = {}): Promise<void> {
  if (!mark || typeof document === 'undefined') return
  await nextTick()
  const until = performance.now() + waitMs
  for (;;) {
    await new Promise<void>((r) => requestAnimationFrame(() => r()))
    const done = tryRestore(mark)
    if ((done && waitMs === 0) || performance.now() >= until) return
  }
}
