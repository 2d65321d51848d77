/** The phasor engine: pure TypeScript, run alike in the browser, on the server and on the command line. */
export { solve, solveDetailed, solveCircuit, degreesOf, CircuitValidationError, type SolveDetail } from './solve'
export { CircuitSolveError, LEAK_SIEMENS, VOLTMETER_OHMS, CLOSED_CONTACT_OHMS } from './network'
export { toSpiceNetlist, spiceWithProbes, type SpiceProbe } from './spice'
export { operatingTime, CURVES, HORIZON_SECONDS } from './protection'
export * from './ratings'
export type * from './types'
export type { Connection, CoilMode } from './bank'
export { expectedReadings, checkReading, VOLTS_TOLERANCE, ANGLE_TOLERANCE_DEGREES, type ExpectedReading, type ReadingCheck } from './expected'
