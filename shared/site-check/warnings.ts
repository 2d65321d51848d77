/** The warnings of a Site check plan: each with a severity, plain words and the rule it comes from. */
import { neutralAtBank } from './build'
import type { SitePlan } from './plan'

export type SiteWarningCode =
  | 'unit-overload'
  | 'voltage-unbalance'
  | 'loading-unbalance'
  | 'high-leg-orange'
  | 'high-leg-b-position'
  | 'high-leg-no-120v'
  | 'ungrounded-wye-primary'
  | 'grounded-wye-delta'
  | 'nameplate-voltage'
  | 'unequal-units'
  | 'engine-hazard'

export interface SiteWarning {
  code: SiteWarningCode
  severity: 'danger' | 'caution'
  message: string
  /** the standard or practice it rests on */
  rule?: string
  units?: string[]
}

/** Above this line-to-line unbalance motors must be derated (NEMA MG 1, from memory). */
export const UNBALANCE_LIMIT_PERCENT = 1
/** Units whose loading differs by more than this many points are called out. */
export const LOADING_SPREAD_POINTS = 25

export function siteWarnings(plan: Omit<SitePlan, 'warnings'>): SiteWarning[] {
  const { input } = plan
  const out: SiteWarning[] = []
  for (const u of plan.loading) {
    if (u.percent > 100) {
      out.push({
        code: 'unit-overload',
        severity: 'danger',
        units: [u.unit],
        message: `${u.unit} (${u.kva} kVA${u.lighting ? ', the lighting unit' : ''}) would carry ${u.percent.toFixed(1)} % of its rating under the stated loads: a larger unit, or less load on it`,
        rule: 'nameplate rating',
      })
    }
  }
  if (plan.voltageUnbalancePercent > UNBALANCE_LIMIT_PERCENT) {
    out.push({
      code: 'voltage-unbalance',
      severity: 'caution',
      message: `line-to-line voltages under load are ${plan.voltageUnbalancePercent.toFixed(2)} % unbalanced: motors on this bank run hotter and may need derating`,
      rule: `NEMA MG 1 (from memory): derate motors above ${UNBALANCE_LIMIT_PERCENT} % unbalance`,
    })
  }
  const percents = plan.loading.map((u) => u.percent)
  if (percents.length > 1 && Math.max(...percents) - Math.min(...percents) > LOADING_SPREAD_POINTS) {
    out.push({
      code: 'loading-unbalance',
      severity: 'caution',
      message: `the units are loaded unevenly (${plan.loading.map((u) => `${u.unit} ${u.percent.toFixed(0)} %`).join(', ')}): the bank runs out of room on its busiest unit first`,
      rule: 'common practice',
    })
  }
  if (input.connection === 'high-leg-delta') {
    out.push(
      {
        code: 'high-leg-orange',
        severity: 'caution',
        message: 'mark the high leg (b, about 208 V to the neutral) orange, or otherwise identify it, wherever the neutral is also present',
        rule: 'NEC 110.15',
      },
      {
        code: 'high-leg-b-position',
        severity: 'caution',
        message: 'land the high leg in the B position (the middle) of panelboards and switchboards',
        rule: 'NEC 408.3(E)',
      },
      {
        code: 'high-leg-no-120v',
        severity: 'danger',
        message: 'no 120 V load, lamp or receptacle may go between the high leg and the neutral: it would see about 208 V',
        rule: 'common practice',
      },
    )
  }
  // a floating wye–delta is the usual recommendation and needs no warning: the closed delta
  // and the cores hold its star point (the engine's exciting branch shows it)
  if (input.connection === 'wye-wye' && !neutralAtBank(input)) {
    out.push({
      code: 'ungrounded-wye-primary',
      severity: 'caution',
      message: 'the wye primary has no grounded neutral: its star point floats, and unbalanced load or a lost line shifts the secondary phase voltages far from 120 V',
      rule: 'common practice',
    })
  }
  if (input.connection === 'wye-delta' && neutralAtBank(input)) {
    out.push({
      code: 'grounded-wye-delta',
      severity: 'caution',
      message:
        'the primary star point is tied to the supply neutral, so this bank is a grounding source for the primary system: it carries current for any unbalance or ground fault on the primary, ' +
        'and when one primary fuse or cutout opens the closed delta keeps that unit’s primary live at about its phase voltage (back-feed): a phase opened at the cutout is not dead. ' +
        'Leaving the star point floating is the usual recommendation; tie it only where the serving utility asks for it',
      rule: 'IEEE C57.105 (from memory); common practice',
    })
  }
  for (const p of plan.testPoints) {
    if (p.kind !== 'primary') continue
    const unit = p.label.split(' ')[0]!
    const rated = input.units[Number(unit.slice(1)) - 1]?.primaryVolts
    if (!rated) continue
    const off = (p.expectedVolts - rated) / rated
    if (Math.abs(off) > 0.05) {
      out.push({
        code: 'nameplate-voltage',
        severity: off > 0.1 ? 'danger' : 'caution',
        units: [unit],
        message: `${unit}'s primary would see ${p.expectedVolts.toFixed(1)} V against a ${rated} V nameplate (${(off * 100).toFixed(0)} %): check the connection and the taps`,
        rule: 'nameplate rating',
      })
    }
  }
  const kvas = new Set(input.units.map((u) => u.kva))
  const impedances = new Set(input.units.map((u) => u.impedancePercent))
  if (input.connection !== 'open-delta' && (kvas.size > 1 || impedances.size > 1) && input.connection !== 'wye-wye' && input.connection !== 'delta-wye') {
    out.push({
      code: 'unequal-units',
      severity: 'caution',
      message: 'the units differ in kVA or percent impedance: in a closed delta the load divides by impedance, not by nameplate (the loading above is the engine’s division)',
      rule: 'common practice',
    })
  }
  for (const h of plan.hazards) {
    out.push({ code: 'engine-hazard', severity: h.severity, units: h.units, message: h.message, rule: `engine: ${h.code}` })
  }
  return out
}
