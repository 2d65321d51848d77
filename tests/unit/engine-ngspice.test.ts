// The engine against ngspice on the same circuits: toSpiceNetlist writes each bank as coupled
// inductors (k = 1 − 1e-9) with the same series impedances; ngspice's .ac solution at the
// supply frequency must agree with the engine on every meter and every winding current.
import { describe, expect, it } from 'vitest'
import { buildBank, type BankSpec } from '#shared/banks/build'
import { solve, spiceWithProbes } from '#shared/engine'
import { ngspiceAvailable, runNgspice } from '../support/ngspice'

const unit = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const wye480 = { connection: 'wye' as const, lineVolts: 831.38 }

// Agreement: 0.5 % of the larger value. Below a floor the values are both "nothing": 0.05 V for
// meters, and for winding currents 0.1 % of the unit's rated current — ngspice's coupled
// inductors draw a magnetizing current of 10⁻⁴ per unit that the engine's ideal core does not.
const TOLERANCE = 0.005

const banks: [string, BankSpec][] = [
  ['delta-delta closed, 240 V series coils', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series' }],
  ['delta-delta closed, delta load', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', load: { ohms: 4, connection: 'delta' } }],
  ['delta-delta, open corner, phased right', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', openCorner: true }],
  ['delta-delta, open corner, T2 reversed', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', openCorner: true, reversed: ['T2'] }],
  ['delta-delta closed onto a reversed unit (circulating current, no protection)', { supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', reversed: ['T3'] }],
  ['delta-wye 208Y/120, parallel coils, IEEE lag', { supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: { r: 4, x: 2 }, connection: 'wye' } }],
  ['delta-wye, low side leading', { supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', shift: 'lead', load: { ohms: 3, connection: 'wye' } }],
  ['wye-delta, loaded', { supply: wye480, units: unit, primary: 'wye', secondary: 'delta', coils: 'series', load: { ohms: { r: 6, x: 3 }, connection: 'delta' } }],
  ['open delta with a balanced load', { supply: delta480, units: unit, primary: 'open-delta', secondary: 'open-delta', coils: 'series', load: { ohms: 10, connection: 'delta' } }],
  ['high-leg delta with lighting load on the centre tap', { supply: delta480, units: [unit, unit, { ...unit, kva: 25 }], primary: 'delta', secondary: 'high-leg', coils: 'series', lightingOhms: 3, load: { ohms: 8, connection: 'delta' } }],
  ['open high-leg delta', { supply: delta480, units: [{ ...unit, kva: 25 }, unit], primary: 'open-delta', secondary: 'open-high-leg', coils: 'series', lightingOhms: 5 }],
  ['5 % impedance, X/R 4, with fuses, breaker and an inductive load', { supply: { ...delta480, sourceOhms: { r: 0.05, x: 0.2 } }, units: { ...unit, kva: 15, impedancePercent: 5, xOverR: 4 }, primary: 'delta', secondary: 'delta', coils: 'series', fuseAmps: 40, breaker: { amps: 50, closed: true }, load: { ohms: { r: 5, x: 4 }, connection: 'delta' } }],
  ['compensated units, single phase, parallel coils, capacitive load', { supply: delta480, units: { ...unit, compensationPercent: 2.5 }, primary: 'single', secondary: 'single', coils: 'parallel', load: { ohms: { r: 3, x: -2 }, connection: 'delta' } }],
  ['ungrounded wye primary on a delta supply, wye secondary', { supply: delta480, units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single', load: { ohms: 2, connection: 'wye' } }],
]

describe('engine agrees with ngspice within 0.5 %', () => {
  it('ngspice is installed (npm test installs the Debian package when missing)', () => {
    expect(ngspiceAvailable()).toBe(true)
  })

  it.each(banks)('%s', (_, spec) => {
    const doc = buildBank(spec)
    const result = solve(doc)
    expect(result.events).toEqual([]) // ngspice sees the state as written: nothing may operate
    const { netlist, probes } = spiceWithProbes(doc)
    const spice = runNgspice(netlist)
    let compared = 0
    for (const probe of probes) {
      const [v0, v1] = probe.vectors.map((v) => v.toLowerCase())
      expect(spice.has(v0!), `ngspice printed ${v0}`).toBe(true)
      if (probe.kind === 'meter') {
        const ours = result.meters[probe.name]!.volts
        const theirs = spice.get(v0!)!
        if (Math.max(ours, theirs) < 0.05) continue
        expect(Math.abs(ours - theirs), `${probe.name}: engine ${ours} V, ngspice ${theirs} V`).toBeLessThanOrEqual(TOLERANCE * Math.max(ours, theirs))
      } else {
        const ours = result.windings[probe.name]!.amps
        const theirs = Math.hypot(spice.get(v0!)!, spice.get(v1!)!)
        const unitId = probe.name.split('.')[0]!
        const t = doc.components.find((c) => c.id === unitId) as { kva: number; primaryVolts: number }
        if (Math.max(ours, theirs) < 1e-3 * ((t.kva * 1000) / t.primaryVolts)) continue
        expect(Math.abs(ours - theirs), `${probe.name}: engine ${ours} A, ngspice ${theirs} A`).toBeLessThanOrEqual(TOLERANCE * Math.max(ours, theirs))
      }
      compared++
    }
    expect(compared).toBeGreaterThanOrEqual(3)
  })
})
