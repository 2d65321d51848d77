// The engine against ngspice on the same circuits: toSpiceNetlist writes each unit as coupled
// inductors (k = 1 − 1e-9) carrying its own exciting branch, with the same series impedances;
// ngspice's .ac solution at the supply frequency must agree with the engine on every voltmeter,
// ammeter and rotation meter and on every winding current, as phasors.
import { describe, expect, it } from 'vitest'
import { buildBank } from '#shared/banks/build'
import type { CircuitInput, ComponentInput } from '#shared/circuit/schema'
import { isAmpReading, isRotationReading, isVoltReading, solveDetailed, spiceWithProbes } from '#shared/engine'
import { phaseSequence } from '#shared/engine/solve'
import { ngspiceAvailable, runNgspice } from '../support/ngspice'

const unit = { kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }
const unit277 = { kva: 10, primaryVolts: 277, secondaryVolts: [120, 120] }
const delta480 = { connection: 'delta' as const, lineVolts: 480 }
const wye480 = { connection: 'wye' as const, lineVolts: 831.38 }

// Agreement: the two phasors differ by at most 0.5 % of the larger. Below a floor both are
// "nothing" (the 1 GΩ leaks' doing): 0.05 V for voltmeters and rotation-meter leads, 0.01 A for
// ammeters, 0.1 % of the unit's rated current for windings (a tenth of the exciting current).
const TOLERANCE = 0.005
const VOLTS_FLOOR = 0.05
const AMMETER_FLOOR = 0.01

type Phasor = [number, number]

/** The document with some fields of the named components replaced (taps, exciting currents). */
function patched(doc: CircuitInput, fields: Record<string, Record<string, unknown>>): CircuitInput {
  return { ...doc, components: doc.components.map((c) => (fields[c.id] ? ({ ...c, ...fields[c.id] } as ComponentInput) : c)) }
}

/** The document with meters added: an ammeter at a terminal takes every wire that met there (it reads the current out of that terminal). */
function withMeters(doc: CircuitInput, meters: { ammetersAt?: Record<string, string>; voltmeters?: Record<string, [string, string]>; rotation?: Record<string, [string, string, string]> }): CircuitInput {
  const components = [...doc.components]
  let wires = doc.wires.map((w) => [...w] as [string, string])
  for (const [id, at] of Object.entries(meters.ammetersAt ?? {})) {
    components.push({ id, kind: 'ammeter' })
    wires = wires.map(([a, b]) => [a === at ? `${id}.b` : a, b === at ? `${id}.b` : b])
    wires.push([at, `${id}.a`])
  }
  for (const [id, [a, b]] of Object.entries(meters.voltmeters ?? {})) {
    components.push({ id, kind: 'voltmeter' })
    wires.push([`${id}.a`, a], [`${id}.b`, b])
  }
  for (const [id, leads] of Object.entries(meters.rotation ?? {})) {
    components.push({ id, kind: 'rotation-meter' })
    leads.forEach((t, k) => wires.push([`${id}.${'abc'[k]}`, t]))
  }
  return { ...doc, components, wires }
}

interface Case {
  doc: CircuitInput
  /** voltmeter readings both must also show: [volts, ± volts] */
  reads?: Record<string, [number, number]>
}

const cases: [string, Case][] = [
  ['delta-delta closed, 240 V series coils', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series' }) }],
  ['delta-delta closed, delta load', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', load: { ohms: 4, connection: 'delta' } }) }],
  ['delta-delta, open corner, phased right', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', openCorner: true }) }],
  ['delta-delta, open corner, T2 reversed', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', openCorner: true, reversed: ['T2'] }) }],
  ['delta-delta closed onto a reversed unit (circulating current, no protection)', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', reversed: ['T3'] }) }],
  ['delta-wye 208Y/120, parallel coils, IEEE lag', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: { r: 4, x: 2 }, connection: 'wye' } }) }],
  ['delta-wye, low side leading', { doc: buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', shift: 'lead', load: { ohms: 3, connection: 'wye' } }) }],
  ['wye-delta, loaded', { doc: buildBank({ supply: wye480, units: unit, primary: 'wye', secondary: 'delta', coils: 'series', load: { ohms: { r: 6, x: 3 }, connection: 'delta' } }) }],
  ['open delta with a balanced load', { doc: buildBank({ supply: delta480, units: unit, primary: 'open-delta', secondary: 'open-delta', coils: 'series', load: { ohms: 10, connection: 'delta' } }) }],
  ['high-leg delta with lighting load on the centre tap', { doc: buildBank({ supply: delta480, units: [unit, unit, { ...unit, kva: 25 }], primary: 'delta', secondary: 'high-leg', coils: 'series', lightingOhms: 3, load: { ohms: 8, connection: 'delta' } }) }],
  ['open high-leg delta', { doc: buildBank({ supply: delta480, units: [{ ...unit, kva: 25 }, unit], primary: 'open-delta', secondary: 'open-high-leg', coils: 'series', lightingOhms: 5 }) }],
  ['5 % impedance, X/R 4, with fuses, breaker and an inductive load', { doc: buildBank({ supply: { ...delta480, sourceOhms: { r: 0.05, x: 0.2 } }, units: { ...unit, kva: 15, impedancePercent: 5, xOverR: 4 }, primary: 'delta', secondary: 'delta', coils: 'series', fuseAmps: 40, breaker: { amps: 50, closed: true }, load: { ohms: { r: 5, x: 4 }, connection: 'delta' } }) }],
  ['compensated units, single phase, parallel coils, capacitive load', { doc: buildBank({ supply: delta480, units: { ...unit, compensationPercent: 2.5 }, primary: 'single', secondary: 'single', coils: 'parallel', load: { ohms: { r: 3, x: -2 }, connection: 'delta' } }) }],
  ['ungrounded wye primary on a delta supply, wye secondary', { doc: buildBank({ supply: delta480, units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single', load: { ohms: 2, connection: 'wye' } }) }],

  // (1.1) taps: +2.5 % puts more primary turns in use, so less on the secondary
  ['one unit on its +2.5 % tap, no load', { doc: patched(buildBank({ supply: delta480, units: unit, primary: 'single', secondary: 'single', coils: 'series' }), { T1: { tapPercent: 2.5 } }), reads: { Mab: [240 / 1.025, 1] } }],
  ['one unit on its −5 % tap, resistive load', { doc: patched(buildBank({ supply: delta480, units: unit, primary: 'single', secondary: 'single', coils: 'series', load: { ohms: 8, connection: 'delta' } }), { T1: { tapPercent: -5 } }) }],
  ['delta-wye with T1 on +2.5 % and T2 on −5 %, loaded', { doc: patched(buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: 4, connection: 'wye' } }), { T1: { tapPercent: 2.5 }, T2: { tapPercent: -5 } }) }],
  ['closed delta-delta with T1 on +2.5 % (circulating current)', { doc: patched(buildBank({ supply: delta480, units: unit, primary: 'delta', secondary: 'delta', coils: 'series', load: { ohms: 6, connection: 'delta' } }), { T1: { tapPercent: 2.5 } }) }],

  // (1.1) floating star points, held by the cores' exciting branches alone
  [
    'floating wye-delta on a three-wire 480 V delta, last corner open: the gap reads near 0',
    { doc: withMeters(buildBank({ supply: delta480, units: unit277, primary: 'wye', secondary: 'delta', coils: 'series', openCorner: true }), { rotation: { R1: ['S1.A', 'S1.B', 'S1.C'] } }), reads: { MC: [0, 0.5] } },
  ],
  ['wye-wye, floating primary star point, no load', { doc: buildBank({ supply: delta480, units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single' }) }],
  [
    'wye-wye, floating primary star point, T2 with 3 % exciting current (the star point moves)',
    { doc: withMeters(patched(buildBank({ supply: delta480, units: { kva: 10, primaryVolts: 277, secondaryVolts: [120] }, primary: 'wye', secondary: 'wye', coils: 'single' }), { T2: { excitingPercent: 3, coreLossPercent: 0.5 } }), { voltmeters: { MH2: ['T2.H1', 'T2.H2'] } }) },
  ],
  [
    'two 120 V primaries in series across 240 V: each takes half',
    {
      doc: {
        format: 'phaseloom.circuit',
        version: 1,
        name: 'two primaries in series',
        components: [
          { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 240 },
          { id: 'T1', kind: 'transformer', kva: 1, primaryVolts: 120, secondaryVolts: [24] },
          { id: 'T2', kind: 'transformer', kva: 1, primaryVolts: 120, secondaryVolts: [24] },
          { id: 'MH1', kind: 'voltmeter' },
          { id: 'MH2', kind: 'voltmeter' },
          { id: 'MX1', kind: 'voltmeter' },
        ],
        wires: [['S1.A', 'T1.H1'], ['T1.H2', 'T2.H1'], ['T2.H2', 'S1.B'], ['MH1.a', 'T1.H1'], ['MH1.b', 'T1.H2'], ['MH2.a', 'T2.H1'], ['MH2.b', 'T2.H2'], ['MX1.a', 'T1.X1'], ['MX1.b', 'T1.X2']],
      },
      reads: { MH1: [120, 1], MH2: [120, 1], MX1: [24, 0.2] },
    },
  ],

  // (1.1) ammeters, rotation meters, a voltmeter with its a end on ground
  [
    'ammeters in a line and in series with a load, the return through an ammeter to ground',
    {
      doc: {
        format: 'phaseloom.circuit',
        version: 1,
        name: 'ammeters',
        components: [
          { id: 'S1', kind: 'supply', connection: 'delta', lineVolts: 480 },
          { id: 'T1', kind: 'transformer', ...unit },
          { id: 'L1', kind: 'load', ohms: { r: 5, x: 2 } },
          { id: 'AL', kind: 'ammeter' },
          { id: 'AS', kind: 'ammeter' },
          { id: 'AG', kind: 'ammeter' },
          { id: 'AZ', kind: 'ammeter' },
          { id: 'MG', kind: 'voltmeter' },
          { id: 'MZ', kind: 'voltmeter' },
          { id: 'G1', kind: 'ground' },
        ],
        wires: [
          ['S1.A', 'AL.a'], ['AL.b', 'T1.H1'], ['S1.B', 'T1.H2'], ['T1.X2', 'T1.X3'],
          ['T1.X1', 'AS.a'], ['AS.b', 'L1.a'], ['L1.b', 'G1.g'], ['T1.X4', 'AG.a'], ['AG.b', 'G1.g'],
          ['AZ.a', 'T1.X2'], ['AZ.b', 'T1.X3'],
          ['MG.a', 'G1.g'], ['MG.b', 'T1.X1'], ['MZ.a', 'G1.g'], ['MZ.b', 'G1.g'],
        ],
      },
    },
  ],
  [
    'delta-wye on an ACB supply with ammeters in the three lines and on a secondary lead, a rotation meter, a voltmeter from ground',
    {
      doc: withMeters(buildBank({ supply: { ...delta480, rotation: 'ACB' }, units: unit, primary: 'delta', secondary: 'wye', coils: 'parallel', load: { ohms: { r: 4, x: 1 }, connection: 'wye' } }), {
        ammetersAt: { IA: 'S1.A', IB: 'S1.B', IC: 'S1.C', IX: 'T1.X2' },
        voltmeters: { MGa: ['G1.g', 'OUT.a'] },
        rotation: { R1: ['OUT.a', 'OUT.b', 'OUT.c'], R2: ['S1.A', 'S1.B', 'S1.C'] },
      }),
    },
  ],
]

const phasorOf = (magnitude: number, degrees: number): Phasor => [magnitude * Math.cos((degrees * Math.PI) / 180), magnitude * Math.sin((degrees * Math.PI) / 180)]
const size = (z: Phasor) => Math.hypot(z[0], z[1])
const show = (z: Phasor) => `${size(z).toPrecision(6)}∠${((Math.atan2(z[1], z[0]) * 180) / Math.PI).toFixed(2)}°`

/** Both phasors are "nothing" (below floor) or they differ by at most TOLERANCE of the larger; true when compared. */
function agree(what: string, ours: Phasor, theirs: Phasor, floor: number): boolean {
  const larger = Math.max(size(ours), size(theirs))
  if (larger < floor) return false
  const gap = Math.hypot(ours[0] - theirs[0], ours[1] - theirs[1])
  expect(gap, `${what}: engine ${show(ours)}, ngspice ${show(theirs)}`).toBeLessThanOrEqual(TOLERANCE * larger)
  return true
}

describe('engine agrees with ngspice within 0.5 %', () => {
  it('ngspice is installed (npm test installs the Debian package when missing)', () => {
    expect(ngspiceAvailable()).toBe(true)
  })

  it.each(cases)('%s', (_, { doc, reads }) => {
    const { result, topo, final } = solveDetailed(doc)
    expect(result.events).toEqual([]) // ngspice sees the state as written: nothing may operate
    const { netlist, probes } = spiceWithProbes(doc)
    const spice = runNgspice(netlist)
    const printed = (probe: { vectors: string[] }): Phasor[] => {
      const values = probe.vectors.map((v) => {
        expect(spice.has(v.toLowerCase()), `ngspice printed ${v}`).toBe(true)
        return spice.get(v.toLowerCase())!
      })
      const pairs: Phasor[] = []
      for (let k = 0; k < values.length; k += 2) pairs.push([values[k]!, values[k + 1]!])
      return pairs
    }
    const nodeVolts = (n: number): Phasor => (n < 0 ? [0, 0] : [final.vRe[n]!, final.vIm[n]!])
    const spiceVolts = new Map<string, number>()
    let compared = 0
    for (const probe of probes) {
      const [first, ...rest] = printed(probe)
      const reading = result.meters[probe.name]
      if (probe.kind === 'meter') {
        if (!isVoltReading(reading)) throw new Error(`${probe.name} is no voltmeter in the result`)
        spiceVolts.set(probe.name, size(first!))
        if (agree(probe.name, phasorOf(reading.volts, reading.degrees), first!, VOLTS_FLOOR)) compared++
      } else if (probe.kind === 'ammeter') {
        if (!isAmpReading(reading)) throw new Error(`${probe.name} is no ammeter in the result`)
        if (agree(probe.name, phasorOf(reading.amps, reading.degrees), first!, AMMETER_FLOOR)) compared++
      } else if (probe.kind === 'rotation') {
        if (!isRotationReading(reading)) throw new Error(`${probe.name} is no rotation meter in the result`)
        const meter = topo.rotationMeters.find((r) => r.id === probe.name)!
        const leads = [first!, ...rest]
        ;[meter.a, meter.b, meter.c].forEach((lead, k) => {
          const ours = nodeVolts(lead)
          const common = nodeVolts(meter.common)
          agree(`${probe.name}.${'abc'[k]}`, [ours[0] - common[0], ours[1] - common[1]], leads[k]!, VOLTS_FLOOR)
        })
        expect(phaseSequence(leads[0]!, leads[1]!, leads[2]!), `${probe.name}: the sequence ngspice's leads make`).toBe(reading.sequence)
        compared++
      } else {
        const [unitId, windingName] = probe.name.split('.') as [string, string]
        const ui = topo.units.findIndex((u) => u.id === unitId)
        const k = topo.units[ui]!.windings.findIndex((w) => w.name === windingName)
        const current = final.units[ui]!.current[k]!
        const ours: Phasor = [current.re, current.im]
        if (agree(probe.name, ours, first!, 1e-3 * topo.units[ui]!.windings[0]!.ratedAmps)) compared++
      }
    }
    // a meter the netlist leaves out has both ends on one node: it reads 0
    for (const [id, m] of Object.entries(result.meters)) {
      if (probes.some((p) => p.name === id) || isRotationReading(m)) continue
      expect(isVoltReading(m) ? m.volts : m.amps, `${id} (both ends on one node)`).toBe(0)
    }
    for (const [id, [volts, within]] of Object.entries(reads ?? {})) {
      const ours = result.meters[id]
      if (!isVoltReading(ours)) throw new Error(`${id} is no voltmeter in the result`)
      expect(Math.abs(ours.volts - volts), `${id} by the engine: ${ours.volts} V`).toBeLessThanOrEqual(within)
      expect(Math.abs(spiceVolts.get(id)! - volts), `${id} by ngspice: ${spiceVolts.get(id)} V`).toBeLessThanOrEqual(within)
    }
    expect(compared).toBeGreaterThanOrEqual(3)
  })
})
