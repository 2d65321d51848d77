/**
 * What the Bench's inspector lets one edit for each kind of part, in the words of its labels.
 * Keys are the circuit document's field names (circuit-format.md); the schema checks the values.
 */
import type { Component } from '#shared/circuit/schema'

export type InspectorOption = { value: string; label: string }
export type InspectorField = {
  key: string
  label: string
  type: 'number' | 'select' | 'checkbox' | 'coils' | 'ohms'
  options?: (string | InspectorOption)[]
  step?: string
  hint?: string
  /** kept under the "advanced" disclosure: values most banks leave at their defaults */
  advanced?: boolean
}
export const INSPECTOR_FIELDS: Record<Component['kind'], InspectorField[]> = {
  supply: [
    { key: 'connection', label: 'Connection', type: 'select', options: ['delta', 'wye'] },
    { key: 'lineVolts', label: 'Line voltage (V)', type: 'number' },
    { key: 'hz', label: 'Frequency (Hz)', type: 'number' },
    { key: 'rotation', label: 'Rotation', type: 'select', options: ['ABC', 'ACB'] },
  ],
  breaker: [
    { key: 'amps', label: 'Rating (A)', type: 'number' },
    { key: 'poles', label: 'Poles', type: 'select', options: ['1', '2', '3'] },
    { key: 'trips', label: 'Trips on overcurrent', type: 'checkbox', hint: 'Off: a disconnect or tie switch, opened and closed by hand only' },
  ],
  fuse: [
    { key: 'amps', label: 'Rating (A)', type: 'number' },
    {
      key: 'curve',
      label: 'Fuse class',
      type: 'select',
      options: [
        { value: 'time-delay', label: 'Time-delay (dual element)' },
        { value: 'fast-acting', label: 'Fast-acting' },
      ],
      hint: 'A time-delay fuse rides through a unit\'s energizing inrush; a fast-acting one may not',
    },
  ],
  transformer: [
    { key: 'kva', label: 'kVA', type: 'number' },
    { key: 'primaryVolts', label: 'Primary (V)', type: 'number' },
    { key: 'secondaryVolts', label: 'Coils (V)', type: 'coils', hint: 'one or two coil voltages, e.g. 120/120' },
    { key: 'impedancePercent', label: 'Impedance (%)', type: 'number', step: '0.1' },
    { key: 'tapPercent', label: 'Primary tap (%)', type: 'number', step: '2.5', hint: '+2.5: more primary turns in use, about 2.5 % less on the secondary' },
    {
      key: 'polarity',
      label: 'Polarity (bushing layout)',
      type: 'select',
      options: [
        { value: 'subtractive', label: 'Subtractive: X1 below H1' },
        { value: 'additive', label: 'Additive: X1 across from H1' },
      ],
    },
    { key: 'xOverR', label: 'X/R', type: 'number', step: '0.1', advanced: true },
    { key: 'compensationPercent', label: 'Compensation (%)', type: 'number', step: '0.5', advanced: true },
    { key: 'excitingPercent', label: 'Exciting current (% of rated)', type: 'number', step: '0.1', advanced: true, hint: 'the no-load current that magnetizes the core' },
    { key: 'coreLossPercent', label: 'Core loss (% of kVA)', type: 'number', step: '0.05', advanced: true, hint: 'the real-power part of the exciting current; at most the exciting current' },
  ],
  load: [{ key: 'ohms', label: 'Ohms (R or R+jX)', type: 'ohms', hint: 'e.g. 12 or 8+j6 or 8-j2' }],
  voltmeter: [],
  ammeter: [],
  'rotation-meter': [],
  output: [],
  ground: [],
}
export const optionOf = (o: string | InspectorOption): InspectorOption => (typeof o === 'string' ? { value: o, label: o } : o)
