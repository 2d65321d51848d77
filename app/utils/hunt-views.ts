/** What the class and hunt routes answer, as the pages read it (server/services/classes, hunts, attempts). */
import type { RosterRow } from '#shared/schemas/classes'
import type { AttemptStatus, FeedbackMode } from '#shared/schemas/hunts'
import { FAULT_LABELS, type Fault, type FaultKind } from '#shared/hunts/faults'

export interface ClassHuntLink { id: number, title: string, dueAt: string | null }

export interface ClassMemberView {
  id: number
  name: string
  term: string
  tolerancePercent: number
  as: 'instructor' | 'member'
  instructor: string
  hunts: ClassHuntLink[]
}
export interface ClassInvitationRow { id: number, email: string, expiresAt: string, sentAt: string }
export interface ClassTeachView extends ClassMemberView {
  as: 'instructor'
  joinCode: string
  roster: RosterRow[]
  invitations: ClassInvitationRow[]
}

export interface HuntAuthorView {
  id: number
  as: 'author'
  title: string
  instructions: string
  document: { components?: { id: string, kind: string, secondaryVolts?: number[] }[] } & Record<string, unknown>
  faults: Fault[]
  secondaryPrewired: boolean
  dueAt: string | null
  probeBudget: number | null
  feedback: FeedbackMode
  publishedAt: string | null
  classes: { id: number, name: string, publishedAt: string }[]
  attempts: number
  createdAt: string
  updatedAt: string
}
export interface HuntStudentView {
  id: number
  as: 'student'
  title: string
  instructions: string
  author: string
  secondaryPrewired: boolean
  dueAt: string | null
  probeBudget: number | null
  feedback: FeedbackMode
  attempt: { id: number, status: string } | null
}

export type { AttemptStatus }
export interface HuntLists {
  authored: { id: number, title: string, dueAt: string | null, publishedAt: string | null, updatedAt: string, attempts: number, submitted: number }[]
  assigned: { id: number, title: string, dueAt: string | null, author: string, attemptId: number | null, status: AttemptStatus }[]
}

export interface ResultRow {
  attemptId: number | null
  studentId: number
  student: string
  email: string
  status: AttemptStatus
  probesUsed: number
  unsafeClosures: number
  liveRewires: number
  operations: number
  timeSpentSeconds: number
  correct: boolean | null
  startedAt: string | null
  submittedAt: string | null
}
export interface HuntResults {
  hunt: { id: number, title: string, dueAt: string | null, probeBudget: number | null }
  rows: ResultRow[]
  summary: { students: number, submitted: number, found: number, foundShare: number | null, medianProbes: number | null, unsafeClosures: number }
}

/** A unit or supply of the hunt's bank that a fault can hide in. */
export interface FaultTarget { id: string, kind: 'transformer' | 'supply', secondaryVolts: number[] }

export function faultTargetsOf(document: { components?: { id: string, kind: string, secondaryVolts?: number[] }[] } | null | undefined): FaultTarget[] {
  return (document?.components ?? [])
    .filter(c => c.kind === 'transformer' || c.kind === 'supply')
    .map(c => ({ id: c.id, kind: c.kind as FaultTarget['kind'], secondaryVolts: c.kind === 'transformer' ? (c.secondaryVolts ?? []) : [] }))
}

/** A fault of `kind` with its setting at a sensible start, on `component` when that fits the kind. */
export function faultFor(kind: FaultKind, targets: FaultTarget[], component?: string): Fault {
  const places = targets.filter(t => (kind === 'phases-relabelled' ? t.kind === 'supply' : t.kind === 'transformer'))
  const at = places.find(t => t.id === component) ?? places[0]
  const id = at?.id ?? ''
  switch (kind) {
    case 'open-coil': return { kind, component: id, coil: 'X1-X2' }
    case 'wrong-tap': return { kind, component: id, percent: 5 }
    case 'coil-volts': {
      const nameplate = at?.secondaryVolts.length ? at.secondaryVolts : [120]
      // the first coil 5 % low: off its nameplate by what a careful reading shows
      return { kind, component: id, volts: nameplate.map((v, i) => (i === 0 ? Math.round(v * 0.95 * 10) / 10 : v)) }
    }
    case 'phases-relabelled': return { kind, component: id, swap: ['B', 'C'] }
    default: return { kind, component: id }
  }
}

/** The first fault a new hunt offers: a unit with its secondary marked backwards. */
export function firstFault(targets: FaultTarget[]): Fault {
  return faultFor(targets.some(t => t.kind === 'transformer') ? 'secondary-reversed' : 'phases-relabelled', targets)
}

/** One fault in words, for its author: "T2: Wrong tap (ratio off), +5 %". */
export function faultText(fault: Fault): string {
  const label = `${fault.component}: ${FAULT_LABELS[fault.kind]}`
  switch (fault.kind) {
    case 'open-coil': return `${label}, ${fault.coil.replace('-', '–')}`
    case 'wrong-tap': return `${label}, ${fault.percent > 0 ? '+' : ''}${fault.percent} %`
    case 'coil-volts': return `${label}, ${fault.volts.map(v => `${v} V`).join(' and ')}`
    case 'phases-relabelled': return `${label}, ${fault.swap[0]} and ${fault.swap[1]} swapped`
    default: return label
  }
}

export const STATUS_LABELS: Record<AttemptStatus, string> = {
  'not-started': 'Not started',
  'in-progress': 'In progress',
  'submitted': 'Submitted',
}

/** A date and time as people read it here, in the browser's own zone. */
export function whenText(iso: string | null | undefined, empty = '—'): string {
  if (!iso) return empty
  return new Date(iso).toLocaleString('en-GB', { dateStyle: 'medium', timeStyle: 'short' })
}
export function dayText(iso: string | null | undefined, empty = '—'): string {
  if (!iso) return empty
  return new Date(iso).toLocaleDateString('en-GB', { dateStyle: 'medium' })
}
/** 1 h 05 min, 4 min 10 s, 12 s */
export function durationText(seconds: number): string {
  if (seconds < 60) return `${seconds} s`
  const minutes = Math.floor(seconds / 60)
  if (minutes < 60) return `${minutes} min ${String(seconds % 60).padStart(2, '0')} s`
  return `${Math.floor(minutes / 60)} h ${String(minutes % 60).padStart(2, '0')} min`
}
