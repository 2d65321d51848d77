/**
 * Will a fuse or breaker open on the units' energizing inrush? Inrush is taken as 12 × the
 * full-load current for 0.1 s (common practice, see protection.ts); the full-load current
 * through a device is that of the unit primaries on its far side at their rated current and
 * unity power factor, added as phasors along the voltages the wiring puts on them (two delta
 * windings on one line give √3 × one, as a balanced delta does).
 */
import { nominalPotentialsOf } from './bank-check'
import { contactMerge } from './bank'
import type { Topology } from './network'
import { curveOf, INRUSH_MULTIPLE, INRUSH_SECONDS, operatingTime } from './protection'
import type { EnergizingCaution } from './types'

/** Above this many devices the check is skipped: it re-groups the network once per device. */
export const INRUSH_DEVICE_LIMIT = 200

export function inrushCautions(topo: Topology, hz: number): EnergizingCaution[] {
  const devices = topo.circuit.components.filter((c) => c.kind === 'fuse' || (c.kind === 'breaker' && c.trips))
  if (devices.length === 0 || topo.units.length === 0 || devices.length > INRUSH_DEVICE_LIMIT) return []
  const at = nominalPotentialsOf(topo)
  // each primary's full-load current phasor at unity power factor, along its nominal voltage
  const primaries = topo.units.flatMap((u) => {
    const w = u.windings[0]!
    const a = at(w.a)
    const b = at(w.b)
    if (!a || !b) return []
    const d: [number, number] = [a[0] - b[0], a[1] - b[1]]
    const size = Math.hypot(d[0], d[1])
    if (size === 0) return []
    return [{ unit: u.id, a: w.a, b: w.b, re: (w.ratedAmps * d[0]) / size, im: (w.ratedAmps * d[1]) / size }]
  })
  const cautions: EnergizingCaution[] = []
  for (const device of devices) {
    if (device.kind !== 'fuse' && device.kind !== 'breaker') continue
    // every other device closed, this one open: its far side is the part without a supply line
    const merge = contactMerge(topo, new Set([device.id]))
    const fed = new Set(topo.phases.map((p) => merge(p.line)))
    let worst = { amps: 0, units: [] as string[] }
    for (const pole of topo.poles) {
      if (pole.device !== device.id) continue
      const far = [pole.a, pole.b].map(merge).filter((g) => !fed.has(g))
      if (far.length !== 1) continue
      const side = far[0]!
      let re = 0
      let im = 0
      const units: string[] = []
      for (const p of primaries) {
        const sign = (merge(p.a) === side ? 1 : 0) - (merge(p.b) === side ? 1 : 0)
        if (sign === 0) continue
        re += sign * p.re
        im += sign * p.im
        units.push(p.unit)
      }
      const amps = INRUSH_MULTIPLE * Math.hypot(re, im)
      if (amps > worst.amps) worst = { amps, units }
    }
    if (worst.amps === 0) continue
    const op = operatingTime(curveOf(device), device.amps, worst.amps, hz)
    if (!op || op.seconds > INRUSH_SECONDS) continue
    const what = device.kind === 'fuse' ? `${device.curve} fuse` : 'breaker'
    cautions.push({
      code: 'inrush',
      severity: 'caution',
      units: [device.id, ...worst.units],
      amps: Math.round(worst.amps * 10) / 10,
      seconds: Math.round(op.seconds * 1e4) / 1e4,
      message:
        `${device.id} (${device.amps} A ${what}) may open on energizing: the inrush of ${worst.units.join(', ')} is about ${worst.amps.toFixed(0)} A ` +
        `(12 × full-load for 0.1 s, a rule of thumb) and it would ${device.kind === 'fuse' ? 'blow' : 'trip'} in about ${(op.seconds * 1000).toFixed(0)} ms. ` +
        `A time-delay fuse sized by NEC 450.3(B) rides through inrush; check the device's class and rating against the maker's curve.`,
    })
  }
  return cautions
}
