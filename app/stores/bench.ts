/**
 * The Bench's one source of truth: the circuit document being wired, its history, and the
 * engine's reading of it. The canvas, the inspector and the panels are views of this store.
 * The document is replaced (never mutated) on every change, so a shallowRef is enough and no
 * deep watcher walks the element list.
 */
import { defineStore } from 'pinia'
import { computed, shallowRef, ref } from 'vue'
import { parseCircuit, type CircuitError } from '#shared/circuit/parse'
import { CIRCUIT_FORMAT, CIRCUIT_VERSION, splitTerminal, terminalsOf, type Circuit, type Component, type ComponentKind } from '#shared/circuit/schema'
import { CircuitSolveError, solveCircuit, type ProtectionEvent, type SolveResult } from '#shared/engine'
import type { PartFields } from '~/utils/bench-parts'

export const HISTORY_LIMIT = 50

type Wire = [string, string]

export interface BenchSolve {
  result: SolveResult | null
  errors: CircuitError[]
  solveError: string | null
}

/**
 * A fault-hunt attempt on the Bench: the server holds the hidden faults, so the Bench shows
 * no reading of its own; energized and device states come from the server's answers.
 */
export interface HuntState {
  energized: boolean
  devices: Record<string, { state: string; amps: number }>
  /** submitted, or closed: nothing may change any more */
  locked: boolean
}

const emptyDoc = (): Circuit => ({ format: CIRCUIT_FORMAT, version: CIRCUIT_VERSION, name: 'Untitled bank', components: [], wires: [], layout: {} })

function solveSafely(doc: Circuit): BenchSolve {
  const parsed = parseCircuit(doc)
  if (!parsed.ok) return { result: null, errors: parsed.errors, solveError: null }
  try {
    return { result: solveCircuit(parsed.circuit).result, errors: [], solveError: null }
  } catch (e) {
    if (e instanceof CircuitSolveError) return { result: null, errors: [], solveError: e.message }
    throw e
  }
}

/** The document after the protection has done what the events say: a blown fuse must be replaced. */
function settle(doc: Circuit, events: ProtectionEvent[]): Circuit {
  const opened = new Map(events.map((e) => [e.device, e.state]))
  return {
    ...doc,
    components: doc.components.map((c) => {
      if (c.kind === 'fuse' && opened.get(c.id) === 'blown') return { ...c, blown: true }
      if (c.kind === 'breaker' && opened.get(c.id) === 'tripped') return { ...c, closed: false }
      return c
    }),
  }
}

const sameWire = (a: Wire, b: Wire) => (a[0] === b[0] && a[1] === b[1]) || (a[0] === b[1] && a[1] === b[0])

/** A jumper in its stored form: trimmed ends, in a stable order. */
export function normaliseJumper(a: string, b: string): Wire {
  const x = a.trim()
  const y = b.trim()
  return x < y ? [x, y] : [y, x]
}

export const useBenchStore = defineStore('bench', () => {
  const doc = shallowRef<Circuit>(emptyDoc())
  const past = shallowRef<Circuit[]>([])
  const future = shallowRef<Circuit[]>([])
  const selected = ref<string | null>(null)
  const pendingTerminal = ref<string | null>(null)
  /** the events of the last energizing, for the log */
  const eventLog = shallowRef<ProtectionEvent[]>([])
  /** jumpers changed while energized (counted for fault hunts) */
  const liveRewires = ref(0)
  const notice = ref<{ tone: 'info' | 'caution' | 'danger'; text: string } | null>(null)
  const clipboard = shallowRef<Component | null>(null)
  /** a breaker handle the user moved, waiting for the page to confirm or carry it out */
  const breakerRequest = ref<{ id: string; closed: boolean } | null>(null)
  /** a jumper that would close a live delta corner, waiting for confirmation */
  const cornerRequest = ref<{ a: string; b: string; volts: number; ok: boolean } | null>(null)

  /** set while the Bench runs a fault-hunt attempt (see HuntState) */
  const hunt = shallowRef<HuntState | null>(null)
  /** in a hunt, while set, a tapped terminal becomes a meter lead instead of a jumper end */
  const leadPicker = shallowRef<((terminal: string) => void) | null>(null)

  const bankId = ref<number | null>(null)
  const bankVersion = ref<number | null>(null)
  const dirty = ref(false)

  // The engine runs in the browser only: server rendering (and the hydration, which must render
  // the same) shows no reading yet, so opening a large bank costs the server no solve.
  // Not returned from the store, so it is not state sent with the page.
  const nuxtApp = useNuxtApp()
  const engineOn = ref(import.meta.client && !nuxtApp.isHydrating)
  if (import.meta.client && !engineOn.value) nuxtApp.hooks.hookOnce('app:suspense:resolve', () => { engineOn.value = true })

  // in a hunt the Bench must not solve the bank as drawn: the real one has faults in it
  const solved = computed<BenchSolve>(() => {
    if (!engineOn.value) return { result: null, errors: [], solveError: null }
    if (!hunt.value) return solveSafely(doc.value)
    const parsed = parseCircuit(doc.value)
    return { result: null, errors: parsed.ok ? [] : parsed.errors, solveError: null }
  })
  const result = computed(() => solved.value.result)
  const energized = computed(() => (hunt.value ? hunt.value.energized : (result.value?.energized ?? false)))
  const canUndo = computed(() => past.value.length > 0)
  const canRedo = computed(() => future.value.length > 0)
  const terminalSet = computed(() => new Set(doc.value.components.flatMap((c) => terminalsOf(c).map((t) => `${c.id}.${t}`))))

  /**
   * Replaces the document as one undoable step. When the change makes a fuse or breaker
   * operate (closing a breaker, or a jumper made on a live bank), the fuses that blew and the
   * breakers that tripped stay so in the document, and the events go to the log.
   */
  function commit(next: Circuit) {
    if (hunt.value?.locked) {
      notice.value = { tone: 'info', text: 'This attempt is submitted: the bank can no longer change.' }
      return
    }
    const events = hunt.value ? [] : (solveSafely(next).result?.events ?? [])
    if (events.length) eventLog.value = events
    past.value = [...past.value, doc.value].slice(-HISTORY_LIMIT)
    future.value = []
    doc.value = events.length ? settle(next, events) : next
    dirty.value = true
  }

  function load(next: Circuit, meta: { id?: number | null; version?: number | null; hunt?: HuntState } = {}) {
    const parsed = parseCircuit(next)
    doc.value = parsed.ok ? { layout: {}, ...parsed.circuit } : { ...emptyDoc(), ...next }
    past.value = []
    future.value = []
    selected.value = null
    pendingTerminal.value = null
    eventLog.value = []
    liveRewires.value = 0
    bankId.value = meta.id ?? null
    bankVersion.value = meta.version ?? null
    dirty.value = false
    hunt.value = meta.hunt ?? null
    leadPicker.value = null
  }

  /** A hunt's parts are the instructor's: only jumpers, breaker handles and fuses are the student's. */
  function partsFixed(): boolean {
    if (!hunt.value) return false
    notice.value = { tone: 'info', text: 'In a fault hunt the parts are fixed: make jumpers, work the breaker and probe with the meter.' }
    return true
  }

  /** The server's answer in a hunt: what is energized, and the fuses and breakers that operated. */
  function applyHuntOutcome(outcome: { energized: boolean; devices: HuntState['devices']; events: ProtectionEvent[] }) {
    if (!hunt.value) return
    hunt.value = { ...hunt.value, energized: outcome.energized, devices: outcome.devices }
    if (outcome.events.length) {
      eventLog.value = outcome.events
      doc.value = settle(doc.value, outcome.events)
    }
  }

  function undo() {
    const prev = past.value.at(-1)
    if (!prev) return
    future.value = [doc.value, ...future.value].slice(0, HISTORY_LIMIT)
    past.value = past.value.slice(0, -1)
    doc.value = prev
    dirty.value = true
  }

  function redo() {
    const next = future.value[0]
    if (!next) return
    past.value = [...past.value, doc.value].slice(-HISTORY_LIMIT)
    future.value = future.value.slice(1)
    doc.value = next
    dirty.value = true
  }

  function noteLiveRewire() {
    if (!energized.value) return
    liveRewires.value++
    notice.value = { tone: 'caution', text: 'The bank is energized: de-energize before rewiring. Real jumpers are moved only with the bank locked out.' }
  }

  /** Why a jumper cannot be made, or null when it can. */
  function jumperProblem(a: string, b: string): string | null {
    const [x, y] = normaliseJumper(a, b)
    if (x === y) return 'A jumper needs two different terminals.'
    for (const t of [x, y]) if (!terminalSet.value.has(t)) return `There is no terminal ${t}.`
    if (doc.value.wires.some((w) => sameWire(w, [x, y]))) return `${x} and ${y} are already joined.`
    return null
  }

  /** The document with one more jumper, or null when it cannot be made. */
  function withJumper(a: string, b: string): Circuit | null {
    if (jumperProblem(a, b)) return null
    return { ...doc.value, wires: [...doc.value.wires, normaliseJumper(a, b)] }
  }

  /**
   * Whether a new jumper would close an open delta corner while the bank is energized: the
   * Bench asks first, saying what the closing check reads.
   */
  function closesLiveCorner(a: string, b: string): { volts: number; ok: boolean } | null {
    const open = result.value?.closingChecks.filter((c) => c.energized) ?? []
    if (!energized.value || open.length === 0) return null
    const trial = withJumper(a, b)
    if (!trial) return null
    const after = solveSafely(trial).result?.closingChecks.length ?? 0
    if (after >= (result.value?.closingChecks.length ?? 0)) return null
    const check = open[0]!
    return { volts: check.volts, ok: check.ok }
  }

  function addJumper(a: string, b: string): boolean {
    const problem = jumperProblem(a, b)
    if (problem) {
      notice.value = { tone: 'info', text: problem }
      return false
    }
    noteLiveRewire()
    commit(withJumper(a, b)!)
    return true
  }

  function removeJumper(a: string, b: string) {
    const wires = doc.value.wires.filter((w) => !sameWire(w, [a, b]))
    if (wires.length === doc.value.wires.length) return
    noteLiveRewire()
    commit({ ...doc.value, wires })
  }

  /**
   * A jumper the user asked for, by mouse or keyboard: made at once, unless it would close a
   * live delta corner — then it waits in `cornerRequest` for the user to confirm.
   */
  function requestJumper(a: string, b: string): 'made' | 'refused' | 'asking' {
    const corner = closesLiveCorner(a, b)
    if (corner) {
      cornerRequest.value = { a, b, ...corner }
      return 'asking'
    }
    return addJumper(a, b) ? 'made' : 'refused'
  }

  /** Keyboard jumpers: the first call picks a terminal, the second makes the jumper. */
  function pickTerminal(terminal: string): 'picked' | 'made' | 'cancelled' | 'refused' | 'asking' | 'lead' {
    if (leadPicker.value) {
      leadPicker.value(terminal)
      return 'lead'
    }
    const first = pendingTerminal.value
    if (!first) {
      pendingTerminal.value = terminal
      return 'picked'
    }
    pendingTerminal.value = null
    if (first === terminal) return 'cancelled'
    return requestJumper(first, terminal)
  }

  function addPart(kind: ComponentKind, fields: PartFields, id: string, position: { x: number; y: number }) {
    if (partsFixed()) return
    const component = { ...fields, id, kind } as Component
    commit({ ...doc.value, components: [...doc.value.components, component], layout: { ...doc.value.layout, [id]: position } })
    selected.value = id
  }

  function removePart(id: string) {
    if (partsFixed()) return
    if (!doc.value.components.some((c) => c.id === id)) return
    const layout = { ...doc.value.layout }
    delete layout[id]
    const wires = doc.value.wires.filter((w) => !w.some((t) => splitTerminal(t)?.[0] === id))
    if (wires.length !== doc.value.wires.length) noteLiveRewire()
    commit({ ...doc.value, components: doc.value.components.filter((c) => c.id !== id), wires, layout })
    if (selected.value === id) selected.value = null
  }

  /** Changes a part's fields (the inspector); wires to terminals the part no longer has are dropped. */
  function updatePart(id: string, patch: Partial<Component>) {
    const fuseReplaced = Object.keys(patch).length === 1 && (patch as { blown?: boolean }).blown === false
    if (!fuseReplaced && partsFixed()) return
    const components = doc.value.components.map((c) => (c.id === id ? ({ ...c, ...patch, id, kind: c.kind } as Component) : c))
    const changed = components.find((c) => c.id === id)
    if (!changed) return
    const terminals = new Set(terminalsOf(changed).map((t) => `${id}.${t}`))
    const wires = doc.value.wires.filter((w) => w.every((t) => splitTerminal(t)?.[0] !== id || terminals.has(t)))
    commit({ ...doc.value, components, wires })
  }

  function movePart(id: string, position: { x: number; y: number }) {
    const old = doc.value.layout?.[id]
    if (old && Math.abs(old.x - position.x) < 0.5 && Math.abs(old.y - position.y) < 0.5) return
    commit({ ...doc.value, layout: { ...doc.value.layout, [id]: { x: Math.round(position.x), y: Math.round(position.y) } } })
  }

  function rename(name: string) {
    commit({ ...doc.value, name })
  }

  function copySelected() {
    const c = doc.value.components.find((x) => x.id === selected.value)
    if (c) clipboard.value = c
  }

  function paste(newId: string) {
    const c = clipboard.value
    if (!c) return
    const at = doc.value.layout?.[c.id] ?? { x: 40, y: 40 }
    addPart(c.kind, c, newId, { x: at.x + 40, y: at.y + 40 })
  }

  /** The document with one breaker's handle moved, and what the engine says would happen. */
  function previewBreaker(id: string, closed: boolean): { next: Circuit; outcome: BenchSolve } {
    const next = { ...doc.value, components: doc.value.components.map((c) => (c.id === id && c.kind === 'breaker' ? { ...c, closed } : c)) }
    return { next, outcome: solveSafely(next) }
  }

  /** Moves a breaker's handle (the page asks first when closing onto a flagged bank). */
  function setBreaker(id: string, closed: boolean) {
    eventLog.value = []
    notice.value = null
    commit(previewBreaker(id, closed).next)
  }

  function replaceFuse(id: string) {
    updatePart(id, { blown: false } as Partial<Component>)
  }

  return {
    doc,
    selected,
    pendingTerminal,
    eventLog,
    liveRewires,
    notice,
    clipboard,
    breakerRequest,
    cornerRequest,
    hunt,
    leadPicker,
    applyHuntOutcome,
    bankId,
    bankVersion,
    dirty,
    solved,
    result,
    energized,
    canUndo,
    canRedo,
    terminalSet,
    load,
    commit,
    undo,
    redo,
    jumperProblem,
    closesLiveCorner,
    addJumper,
    requestJumper,
    removeJumper,
    pickTerminal,
    addPart,
    removePart,
    updatePart,
    movePart,
    rename,
    copySelected,
    paste,
    previewBreaker,
    setBreaker,
    replaceFuse,
  }
})
