/**
 * The bank summary in words, read from a solve result: each side's connection, and when the
 * engine finds the wiring is no proper connection (`bankProblems` in the result), a plain statement of
 * that instead of a clock number. Pure: no Vue.
 */
import type { Connection } from './engine/bank'
import type { BankProblem, SolveResult } from './engine/types'

const NAMES: Record<Connection, string> = {
  delta: 'delta',
  wye: 'wye',
  'open-delta': 'open delta',
  'open-wye': 'open wye',
  'single-phase': 'single phase',
  other: 'no delta or wye',
}

export function connectionName(c: Connection): string {
  return NAMES[c]
}

export interface BankVerdict {
  /** the wiring makes a proper connection, and the clock number means something */
  valid: boolean
  primary: string
  secondary: string
  /** one line for the summary and the phasor panel, or null for a proper bank */
  headline: string | null
  /** the engine's sentences, one per problem */
  details: string[]
}

function faultWords(p: BankProblem): string {
  if (p.code === 'reversed-unit') return `${p.units.join(' or ')} reversed`
  if (p.code === 'open-coil') return `${p.units.join(', ')} open`
  return `${p.units.join(', ')} not on three different phases`
}

function sideWords(kind: Connection, problems: BankProblem[], openCorner: boolean): string {
  const name = kind === 'delta' && openCorner ? 'delta with one corner open' : connectionName(kind)
  if (problems.length === 0) return name
  // no connection the trade names, and nothing more particular to say about it
  if (kind === 'other' && problems.every((p) => p.code === 'not-three-phase')) return `${name} — not a valid connection`
  const faults = problems.map(faultWords).join(', ')
  const joined = kind === 'other' ? `${name}: ${faults}` : `${name}${openCorner && kind === 'delta' ? ' and' : ' with'} ${faults}`
  return `${joined} — not a valid connection`
}

export function bankVerdict(result: SolveResult): BankVerdict {
  const { bank } = result
  const problems = result.bankProblems ?? []
  const on = (side: BankProblem['side']) => problems.filter((p) => p.side === side)
  const openCorner = result.closingChecks.length > 0
  const primary = sideWords(bank.primary, on('primary'), false)
  const secondary = sideWords(bank.secondary, on('secondary'), openCorner)
  // no units yet: nothing to call right or wrong
  const noUnits = Object.keys(result.windings).length === 0
  const valid = noUnits || (problems.length === 0 && bank.primary !== 'other' && bank.secondary !== 'other')
  const faulted = [on('primary').length ? `primary: ${primary}` : null, on('secondary').length ? secondary : null].filter(Boolean)
  const headline = valid ? null : faulted.length ? `Not a proper bank: ${faulted.join('; ')}. No clock number.` : 'Not a proper bank: no delta or wye. No clock number.'
  return { valid, primary, secondary, headline, details: problems.map((p) => p.message) }
}
