/**
 * A fault-hunt attempt: the Bench store holds the student's wiring; this store talks to the
 * server, which alone knows the hidden faults. Every change of wiring or of a breaker or fuse
 * is sent to `/energize` (so protective operations, unsafe closures and live rewiring are
 * recorded as they happen); every reading is a `/probe`.
 */
import { defineStore } from 'pinia'
import { ref, shallowRef } from 'vue'
import type { Circuit } from '#shared/circuit/schema'
import type { ProtectionEvent } from '#shared/engine'
import type { Diagnosis } from '#shared/hunts/faults'
import { apiErrorText } from '~/composables/form'

export interface ProbeReading {
  from: string
  to: string
  volts: number
  degrees: number
  energized: boolean
}

interface Outcome {
  energized: boolean
  devices: Record<string, { state: string; amps: number }>
  events: ProtectionEvent[]
  unsafeClosure: boolean
  probesUsed: number
  probeBudget: number | null
  unsafeClosures: number
  liveRewires: number
}

export interface AttemptView {
  id: number
  status: 'in-progress' | 'submitted'
  document: Circuit
  hunt: { id: number; title: string; instructions: string; author: string; dueAt: string | null; probeBudget: number | null; feedback: string; secondaryPrewired: boolean }
  probesUsed: number
  probeBudget: number | null
  unsafeClosures: number
  liveRewires: number
  energized: boolean
  probes: (ProbeReading & { at: string })[]
  submittedAt: string | null
  diagnosis: { component: string; diagnosis: Diagnosis }[] | null
  feedback: { correct: boolean; findings: { component: string; diagnosis: Diagnosis; right: boolean }[] } | null
}

/** What the energize and probe calls look at: the wiring and the devices, not where parts sit. */
function electricalKey(doc: Circuit): string {
  const devices = doc.components.filter((c) => c.kind === 'breaker' || c.kind === 'fuse').map((c) => (c.kind === 'breaker' ? `${c.id}:${c.closed}` : c.kind === 'fuse' ? `${c.id}:${c.blown}` : ''))
  return JSON.stringify([doc.wires, devices])
}

export const useAttemptStore = defineStore('attempt', () => {
  const bench = useBenchStore()
  const view = shallowRef<AttemptView | null>(null)
  const readings = ref<ProbeReading[]>([])
  const counters = ref({ probesUsed: 0, probeBudget: null as number | null, unsafeClosures: 0, liveRewires: 0 })
  const busy = ref(false)
  const error = ref<string | null>(null)
  /** picking meter leads on the canvas */
  const leads = ref<{ from: string | null; to: string | null }>({ from: null, to: null })
  const picking = ref(false)
  /** the electrical state last sent to the server (state, so it survives hydration) */
  const sent = ref('')
  let queue: Promise<unknown> = Promise.resolve()

  function open(attempt: AttemptView) {
    view.value = attempt
    readings.value = attempt.probes.map(({ from, to, volts, degrees, energized }) => ({ from, to, volts, degrees, energized })).reverse()
    counters.value = { probesUsed: attempt.probesUsed, probeBudget: attempt.probeBudget, unsafeClosures: attempt.unsafeClosures, liveRewires: attempt.liveRewires }
    error.value = null
    leads.value = { from: null, to: null }
    picking.value = false
    bench.load(attempt.document, { hunt: { energized: attempt.energized, devices: {}, locked: attempt.status !== 'in-progress' } })
    sent.value = electricalKey(bench.doc)
  }

  /** The Bench's document changed: a change of wiring, breaker or fuse goes to the server. */
  function benchChanged() {
    if (!view.value || bench.hunt?.locked) return
    const key = electricalKey(bench.doc)
    if (key === sent.value) return
    sent.value = key
    void energize()
  }

  function take(outcome: Outcome) {
    bench.applyHuntOutcome(outcome)
    sent.value = electricalKey(bench.doc)
    counters.value = { probesUsed: outcome.probesUsed, probeBudget: outcome.probeBudget, unsafeClosures: outcome.unsafeClosures, liveRewires: outcome.liveRewires }
    if (outcome.unsafeClosure) {
      bench.notice = { tone: 'danger', text: 'That closed the bank onto a fault: on a real bench this is a dead short that only the fuses or breaker stop. It is recorded in your attempt.' }
    } else if (outcome.events.length) {
      bench.notice = { tone: 'caution', text: `${outcome.events.map((e) => `${e.device} ${e.state}`).join(', ')}: see the events.` }
    }
  }

  /** One call at a time, in order, so the server sees the changes as the student made them. */
  function serial<T>(work: () => Promise<T>): Promise<T> {
    const next = queue.then(work, work)
    queue = next.catch(() => undefined)
    return next
  }

  function energize() {
    const id = view.value?.id
    if (!id) return Promise.resolve()
    return serial(async () => {
      busy.value = true
      try {
        take(await callApi<Outcome>(`/api/attempts/${id}/energize`, { method: 'POST', body: { document: bench.doc } }))
        error.value = null
      } catch (e) {
        error.value = apiErrorText(e)
      } finally {
        busy.value = false
      }
    })
  }

  function probe(from: string, to: string) {
    const id = view.value?.id
    if (!id) return Promise.resolve(null)
    return serial(async () => {
      busy.value = true
      try {
        const answer = await callApi<Outcome & ProbeReading>(`/api/attempts/${id}/probe`, { method: 'POST', body: { document: bench.doc, from, to } })
        take(answer)
        const reading = { from: answer.from, to: answer.to, volts: answer.volts, degrees: answer.degrees, energized: answer.energized }
        readings.value = [reading, ...readings.value]
        error.value = null
        return reading
      } catch (e) {
        error.value = apiErrorText(e)
        return null
      } finally {
        busy.value = false
      }
    })
  }

  /** Canvas lead picking: the first tapped terminal is the red lead, the second the black one, then it measures. */
  function setPicking(on: boolean) {
    picking.value = on
    leads.value = { from: null, to: null }
    bench.pendingTerminal = null
    bench.leadPicker = on
      ? (terminal: string) => {
          if (!leads.value.from || leads.value.to) {
            leads.value = { from: terminal, to: null }
            bench.notice = { tone: 'info', text: `Red lead on ${terminalLabel(terminal)}: tap where the black lead goes.` }
            return
          }
          const from = leads.value.from
          if (terminal === from) return
          leads.value = { from, to: terminal }
          void probe(from, terminal)
        }
      : null
  }

  async function submit(diagnosis: { component: string; diagnosis: Diagnosis }[]) {
    const id = view.value?.id
    if (!id) return
    await queue
    busy.value = true
    try {
      const done = await callApi<AttemptView>(`/api/attempts/${id}/submit`, { method: 'POST', body: { diagnosis, document: bench.doc } })
      setPicking(false)
      view.value = done
      if (bench.hunt) bench.hunt = { ...bench.hunt, locked: true }
      error.value = null
    } catch (e) {
      error.value = apiErrorText(e)
    } finally {
      busy.value = false
    }
  }

  return { view, readings, counters, busy, error, leads, picking, sent, open, benchChanged, energize, probe, setPicking, submit }
})
