import type { Component, ComponentKind } from '#shared/circuit/schema'
import { formatAngle } from '#shared/phasors'
import { isAmpReading, isRotationReading, isVoltReading, type EnergizingCaution, type Hazard, type HazardCode, type MeterReading } from '#shared/engine/types'

/** A part's fields without its id (for each kind of part). */
export type PartFields = Component extends infer C ? (C extends Component ? Omit<C, 'id'> : never) : never

/** What the parts tray offers, with the defaults a new part starts from. */
export const PART_DEFAULTS: Record<ComponentKind, { label: string; prefix: string; fields: PartFields }> = {
  supply: { label: 'Supply', prefix: 'S', fields: { kind: 'supply', connection: 'delta', lineVolts: 480, hz: 60, rotation: 'ABC', sourceOhms: { r: 0.02, x: 0.05 } } },
  breaker: { label: 'Breaker', prefix: 'CB', fields: { kind: 'breaker', poles: 3, amps: 30, closed: false, trips: true } },
  fuse: { label: 'Fuse', prefix: 'F', fields: { kind: 'fuse', amps: 30, blown: false, curve: 'time-delay' } },
  transformer: {
    label: 'Transformer unit',
    prefix: 'T',
    fields: {
      kind: 'transformer',
      kva: 10,
      primaryVolts: 480,
      secondaryVolts: [120, 120],
      impedancePercent: 3,
      xOverR: 1.5,
      compensationPercent: 0,
      excitingPercent: 1,
      coreLossPercent: 0.2,
      tapPercent: 0,
      polarity: 'subtractive',
    },
  },
  load: { label: 'Load', prefix: 'L', fields: { kind: 'load', ohms: 10 } },
  voltmeter: { label: 'Voltmeter', prefix: 'M', fields: { kind: 'voltmeter' } },
  ammeter: { label: 'Ammeter', prefix: 'A', fields: { kind: 'ammeter' } },
  'rotation-meter': { label: 'Rotation meter', prefix: 'R', fields: { kind: 'rotation-meter' } },
  output: { label: 'Output block', prefix: 'OUT', fields: { kind: 'output' } },
  ground: { label: 'Ground', prefix: 'G', fields: { kind: 'ground' } },
}

/** The next free id for a kind: T4 after T1–T3. */
export function nextPartId(kind: ComponentKind, taken: Iterable<string>): string {
  const prefix = PART_DEFAULTS[kind].prefix
  const used = new Set(taken)
  for (let n = 1; ; n++) if (!used.has(`${prefix}${n}`)) return `${prefix}${n}`
}

/** "T2.X3" → "T2 terminal X3", for screen readers. */
export function terminalLabel(terminal: string): string {
  const dot = terminal.lastIndexOf('.')
  return `${terminal.slice(0, dot)} terminal ${terminal.slice(dot + 1)}`
}

/** A value as a meter shows it: `239.8 V`, or with its angle `239.8 V ∠ 30.0°`; amps with unit 'A'. */
export function formatValue(value: number, degrees?: number, unit = 'V'): string {
  const magnitude = `${value >= 1000 ? value.toFixed(0) : value.toFixed(1)} ${unit}`
  // a reading that shows as 0.0 has no angle worth reading
  return degrees === undefined || value < 0.05 ? magnitude : `${magnitude} ∠ ${formatAngle(degrees)}`
}

/** A current as an ammeter shows it: `12.10 A`, or with its angle `12.10 A ∠ −25.8°`. */
export function formatAmps(amps: number, degrees?: number): string {
  const magnitude = `${amps >= 1000 ? amps.toFixed(0) : amps >= 100 ? amps.toFixed(1) : amps.toFixed(2)} A`
  // a current that shows as 0.00 has no angle worth reading
  return degrees === undefined || amps < 0.005 ? magnitude : `${magnitude} ∠ ${formatAngle(degrees)}`
}

/** A rotation meter's sequence in words: the letters in the order the leads see them. */
export function formatSequence(sequence: 'ABC' | 'ACB' | 'none'): string {
  return sequence === 'none' ? 'no rotation' : sequence.split('').join('-')
}

/** What any meter reads, in the words and units its face shows. */
export function formatMeter(reading: MeterReading | undefined, withAngle = true): string {
  if (isVoltReading(reading)) return formatValue(reading.volts, withAngle ? reading.degrees : undefined)
  if (isAmpReading(reading)) return formatAmps(reading.amps, withAngle ? reading.degrees : undefined)
  if (isRotationReading(reading)) return formatSequence(reading.sequence)
  return '—'
}

/** Plain titles for the engine's hazard codes and energizing cautions. */
export const HAZARD_TITLES: Record<HazardCode | EnergizingCaution['code'], string> = {
  'reversed-winding': 'A unit is connected backwards',
  'loop-voltage': 'Voltage across a gap',
  'fault-current': 'Fault current',
  'winding-overvoltage': 'Winding over its voltage',
  overload: 'Overload',
  backfeed: 'Live beyond an open device',
  'output-voltage': 'Output voltage wrong',
  'neutral-shift': 'Floating star point moved',
  inrush: 'May open when energized (inrush)',
}

/** One row of the hazards panel: every hazard or caution of one code, with all the parts they name. */
export interface HazardRow {
  code: HazardCode | EnergizingCaution['code']
  severity: 'danger' | 'caution'
  title: string
  parts: string[]
  messages: string[]
  onClosing: boolean
}

/** Hazards (and cautions) grouped one row per code, danger rows first, each keeping the engine's order. */
export function hazardRows(items: readonly (Hazard | EnergizingCaution)[]): HazardRow[] {
  const rows = new Map<string, HazardRow>()
  for (const h of items) {
    const row = rows.get(h.code) ?? { code: h.code, severity: h.severity, title: HAZARD_TITLES[h.code] ?? h.code, parts: [], messages: [], onClosing: true }
    if (h.severity === 'danger') row.severity = 'danger'
    for (const p of h.units) if (!row.parts.includes(p)) row.parts.push(p)
    if (!row.messages.includes(h.message)) row.messages.push(h.message)
    row.onClosing &&= 'onClosing' in h && h.onClosing === true
    rows.set(h.code, row)
  }
  const all = [...rows.values()]
  return [...all.filter((r) => r.severity === 'danger'), ...all.filter((r) => r.severity !== 'danger')]
}

/** parts whose tops are within this many pixels count as one row of the Tab order */
export const ROW_SLACK = 40

/** Parts in reading order: row by row from the top, each row from left to right. */
export function readingOrder<T extends { position: { x: number; y: number } }>(parts: T[]): T[] {
  const byTop = [...parts].sort((p, q) => p.position.y - q.position.y)
  const rows: T[][] = []
  for (const p of byTop) {
    const row = rows.at(-1)
    if (row && p.position.y - row[0]!.position.y < ROW_SLACK) row.push(p)
    else rows.push([p])
  }
  return rows.flatMap((row) => row.sort((p, q) => p.position.x - q.position.x))
}
