/** The engine's result (circuit-format.md, "Result"), plus optional fields of our own. */
import type { CoilMode, Connection } from './bank'

export interface Reading {
  volts: number
  degrees: number
}

/** (1.1) an ammeter: the current from a to b through it */
export interface AmmeterReading {
  amps: number
  degrees: number
}

/** (1.1) a rotation meter: the phase sequence of its leads a, b, c */
export interface RotationReading {
  sequence: 'ABC' | 'ACB' | 'none'
}

/** What a meter reads: a voltmeter's Reading, an ammeter's current or a rotation meter's sequence. */
export type MeterReading = Reading | AmmeterReading | RotationReading

export const isVoltReading = (m: MeterReading | undefined): m is Reading => m !== undefined && 'volts' in m
export const isAmpReading = (m: MeterReading | undefined): m is AmmeterReading => m !== undefined && 'amps' in m
export const isRotationReading = (m: MeterReading | undefined): m is RotationReading => m !== undefined && 'sequence' in m
/** A voltmeter's reading in volts; undefined for no such meter or another kind of meter. */
export const meterVolts = (m: MeterReading | undefined): number | undefined => (isVoltReading(m) ? m.volts : undefined)

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

export type HazardCode =
  | 'reversed-winding'
  | 'loop-voltage'
  | 'fault-current'
  | 'winding-overvoltage'
  | 'overload'
  | 'backfeed'
  | 'output-voltage'
  | 'neutral-shift'

export interface Hazard {
  code: HazardCode
  severity: 'danger' | 'caution'
  /** the parts involved: transformer units, a fuse or breaker, an output block */
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
  /** (1.1) as a nameplate gives it: the standard sequence, the higher-voltage side first */
  clock: number | null
  /** (1.1) IEC 60076-1, e.g. "Dyn1", "YNd11"; null when the wiring is no proper connection */
  vectorGroup: string | null
}

/**
 * A caution about energizing that is no hazard of the settled state (our addition to the
 * result, like closingChecks): a fuse or breaker that would open on a unit's inrush.
 */
export interface EnergizingCaution {
  code: 'inrush'
  severity: 'caution'
  /** the device, then the units whose inrush it carries */
  units: string[]
  /** the inrush current estimated through the device, and how long it would take to open */
  amps: number
  seconds: number
  message: string
}

export interface SolveResult {
  energized: boolean
  meters: Record<string, MeterReading>
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
  /** cautions about the moment of energizing (inrush); empty when there are none */
  cautions: EnergizingCaution[]
}
