/** The engine's result (circuit-format.md, "Result"), plus optional fields of our own. */
import type { CoilMode, Connection } from './bank'

export interface Reading {
  volts: number
  degrees: number
}

export interface WindingReading extends Reading {
  amps: number
}

export type DeviceState = 'closed' | 'open' | 'tripped' | 'intact' | 'blown'

export interface DeviceReading {
  state: DeviceState
  amps: number
}

export interface ProtectionEvent {
  device: string
  action: 'opened'
  amps: number
  /** time from energizing, accumulated over the operations before this one */
  seconds: number
  /** what the device became, and which part of its curve made it operate */
  state: 'tripped' | 'blown'
  region: 'instantaneous' | 'inverse-time'
}

export type HazardCode = 'reversed-winding' | 'loop-voltage' | 'fault-current' | 'winding-overvoltage' | 'overload'

export interface Hazard {
  code: HazardCode
  severity: 'danger' | 'caution'
  /** the parts involved: transformer units, or a fuse or breaker */
  units: string[]
  volts?: number
  amps?: number
  message: string
  /**
   * true when the danger is in closing a gap (an open corner, coils about to be paralleled):
   * the bank may be energized to measure it, the gap must not be closed
   */
  onClosing?: boolean
}

/** An open corner of a delta: the reading a closing check takes before the corner is closed. */
export interface ClosingCheck {
  units: string[]
  between: [string, string]
  volts: number
  /** the rated voltage of one unit's secondary as wired in the loop */
  coilVolts: number
  /** false when the bank is dead: the gap is there but reads nothing yet */
  energized: boolean
  /** energized and reading at most 5 % of the coil voltage */
  ok: boolean
}

/** Why the wiring is not a proper connection (our addition to the result's `bank`). */
export interface BankProblem {
  code: 'reversed-unit' | 'open-coil' | 'not-three-phase'
  side: 'primary' | 'secondary'
  /** the units at fault; for a reversed unit of a two-unit bank, either one */
  units: string[]
  message: string
}

export interface BankSummary {
  primary: Connection
  secondary: Connection
  coils: CoilMode
  displacementDegrees: number | null
  clock: number | null
}

export interface SolveResult {
  energized: boolean
  meters: Record<string, Reading>
  terminals: Record<string, Reading>
  windings: Record<string, WindingReading>
  devices: Record<string, DeviceReading>
  events: ProtectionEvent[]
  hazards: Hazard[]
  bank: BankSummary
  closingChecks: ClosingCheck[]
  /**
   * our addition to the result of circuit-format.md (like closingChecks; `bank` keeps exactly
   * the spec's fields): empty for a proper connection; otherwise what makes the wiring no
   * proper bank (a reversed or open unit, units that make no three-phase set), and then
   * `bank.displacementDegrees` and `bank.clock` are measurements of a faulted bank, not its
   * vector group
   */
  bankProblems: BankProblem[]
}
