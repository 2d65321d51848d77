/**
 * The words of the pre-energization sheet, shared by the print page and the PDF so that both
 * say the same: the cautions (product.md's safety words), the stages of the test sequence and
 * the summary lines. Pure: no Vue, no Nitro.
 */
import { CONNECTION_LABELS } from './inputs'
import type { SitePlan, TestPoint } from './plan'

export const SHEET_TITLE = 'Pre-energization sheet'

/** Local code and licensed practice first: printed at the top and foot of every sheet. */
export const LOCAL_CODE_FIRST = 'Local code and licensed practice first.'

export const SHEET_CAUTIONS = [
  'This is a practice and planning tool: the readings are what a correctly wired bank should read, not a proof that this one is.',
  'Real banks can kill.',
  'De-energize, lock out and verify absence of voltage before touching anything.',
  'Wear rated PPE for the voltage and the available fault current.',
  'The local electrical code, the authority having jurisdiction, your instructor and licensed practice come first.',
  'Take the closing check before closing the last corner of a delta: close it only on a reading near 0 V.',
]

export const STAGE_HEADINGS: Record<TestPoint['stage'], string> = {
  'corner-open': 'Energize with the last corner of the delta open and no load connected',
  complete: 'The complete bank, no load connected',
}

export const CLOSING_STEP =
  'Closing check: with the corner still open, read across it. Near 0 V: de-energize, lock out, close the corner, re-energize. ' +
  'About twice the coil voltage: a unit is connected backwards; do not close (closing it is a dead short), de-energize and correct the polarity.'

/** A reading as a meter shows it: one decimal and the unit. */
export const volts = (v: number) => `${v.toFixed(1)} V`
export const amps = (a: number) => `${a.toFixed(1)} A`

export const leadsText = (p: TestPoint) => `${p.leads[0]} to ${p.leads[1]}`

/** The plan as labelled summary lines (capacity, loading, currents, protection). */
export function sheetSummary(plan: SitePlan): [string, string][] {
  const { input } = plan
  const rows: [string, string][] = [
    ['Connection', CONNECTION_LABELS[input.connection]],
    ['Supply', `${input.supply.lineVolts} V ${input.supply.connection}${input.supply.connection === 'wye' ? (input.supply.grounded ? ', neutral grounded' : ', neutral not at the bank') : ''}, ${input.supply.hz} Hz`],
    ['Units', input.units.map((u, i) => `T${i + 1} ${u.kva} kVA ${u.primaryVolts}–${u.secondaryVolts.join('/')} V ${u.impedancePercent} %Z`).join('; ')],
    ['Loads', `${input.loads.threePhaseKva} kVA three-phase at pf ${input.loads.powerFactor}${input.loads.lightingKva ? `; ${input.loads.lightingKva} kVA lighting (120 V, a–n and c–n)` : ''}`],
    ['Bank capacity', `${plan.capacity.kva.toFixed(1)} kVA three-phase (units total ${plan.capacity.unitSumKva} kVA)`],
  ]
  if (plan.capacity.openDelta) {
    const o = plan.capacity.openDelta
    rows.push(['Open-delta derating', `${o.ofClosedPercent.toFixed(1)} % of the ${o.closedBankKva} kVA closed bank, ${o.ofUnitsPercent.toFixed(1)} % of the two units`])
  }
  rows.push(['Unit loading', plan.loading.map((u) => `${u.unit}${u.lighting ? ' (lighting)' : ''} ${u.percent.toFixed(1)} %`).join('; ')])
  rows.push(['Primary line currents', `A ${amps(plan.currents.primary.A)}, B ${amps(plan.currents.primary.B)}, C ${amps(plan.currents.primary.C)} (full load ${amps(plan.currents.fullLoad.primary)})`])
  rows.push(['Secondary line currents', `${Object.entries(plan.currents.secondary).map(([l, a]) => `${l} ${amps(a)}`).join(', ') || 'no load'} (full load ${amps(plan.currents.fullLoad.secondary)})`])
  const p = plan.protection
  const device = (a: number | null) => (a === null ? 'none in the table' : `${a} A`)
  rows.push(['Primary only (NEC 450.3(B))', `at most ${device(p.primaryOnly.maxDeviceAmps)} (${p.primaryOnly.percent} % of ${amps(p.primaryAmps)})`])
  rows.push([
    'Primary and secondary (NEC 450.3(B))',
    `primary at most ${device(p.primaryAndSecondary.primary.maxDeviceAmps)} (${p.primaryAndSecondary.primary.percent} %), secondary at most ${device(p.primaryAndSecondary.secondary.maxDeviceAmps)} (${p.primaryAndSecondary.secondary.percent} % of ${amps(p.secondaryAmps)})`,
  ])
  rows.push(['Sizes', 'NEC 240.6(A) standard ratings; Note 1 of Table 450.3(B) permits the next higher size where it applies'])
  return rows
}
