import type { Component, ComponentKind } from '#shared/circuit/schema'
import { formatAngle } from '#shared/phasors'

/** A part's fields without its id (for each kind of part). */
export type PartFields = Component extends infer C ? (C extends Component ? Omit<C, 'id'> : never) : never

/** What the parts tray offers, with the defaults a new part starts from. */
export const PART_DEFAULTS: Record<ComponentKind, { label: string; prefix: string; fields: PartFields }> = {
  supply: { label: 'Supply', prefix: 'S', fields: { kind: 'supply', connection: 'delta', lineVolts: 480, hz: 60, rotation: 'ABC', sourceOhms: { r: 0.02, x: 0.05 } } },
  breaker: { label: 'Breaker', prefix: 'CB', fields: { kind: 'breaker', poles: 3, amps: 30, closed: false } },
  fuse: { label: 'Fuse', prefix: 'F', fields: { kind: 'fuse', amps: 30, blown: false } },
  transformer: {
    label: 'Transformer unit',
    prefix: 'T',
    fields: { kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120], impedancePercent: 3, xOverR: 1.5, compensationPercent: 0 },
  },
  load: { label: 'Load', prefix: 'L', fields: { kind: 'load', ohms: 10 } },
  voltmeter: { label: 'Voltmeter', prefix: 'M', fields: { kind: 'voltmeter' } },
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

/** Plain titles for the engine's hazard codes. */
export const HAZARD_TITLES: Record<string, string> = {
  'reversed-winding': 'A unit is connected backwards',
  'loop-voltage': 'Voltage across a gap',
  'fault-current': 'Fault current',
  'winding-overvoltage': 'Winding over its voltage',
  overload: 'Overload',
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
