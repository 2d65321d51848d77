/**
 * The same circuit as an ngspice netlist, for an independent check of the engine and for
 * users who want to run it in a SPICE of their own.
 *
 * Each transformer winding is its series resistance and reactance in series with one of a
 * set of inductors coupled with k = 1 − 1e-9. The coupled inductances are proportional to the
 * square of the turns, sized so that the magnetizing reactance is 10⁴ × the unit's base
 * impedance: the magnetizing current is then 10⁻⁴ per unit and the leakage that k adds
 * 2 × 10⁻⁵ per unit, both far below the engine's 0.5 % agreement. A 0 V source in each
 * winding measures its current.
 */
import Complex from 'complex.js'
import { parseCircuit } from '../circuit/parse'
import type { Circuit } from '../circuit/schema'
import { CircuitValidationError } from './solve'
import { buildTopology, CLOSED_CONTACT_OHMS, LEAK_SIEMENS, VOLTMETER_OHMS, windingImpedances, type Topology } from './network'

export const COUPLING = 1 - 1e-9
export const MAGNETIZING_PER_UNIT = 1e4

export interface SpiceOptions {
  /** number of .ac points at (all but exactly) the supply frequency, for timing ngspice per point; 1 by default */
  points?: number
}

/** Names of the printed vectors, so that a caller can read ngspice's output back. */
export interface SpiceProbe {
  kind: 'meter' | 'winding'
  name: string
  /** ngspice expressions: magnitude and phase (degrees) for a meter; real and imaginary current for a winding */
  vectors: string[]
}

export function toSpiceNetlist(input: unknown, options: SpiceOptions = {}): string {
  return spiceWithProbes(input, options).netlist
}

export function spiceWithProbes(input: unknown, options: SpiceOptions = {}): { netlist: string; probes: SpiceProbe[] } {
  const parsed = parseCircuit(input)
  if (!parsed.ok) throw new CircuitValidationError(parsed.errors)
  return writeNetlist(parsed.circuit, options)
}

const num = (x: number) => (Number.isInteger(x) ? String(x) : x.toPrecision(12))
const safe = (s: string) => s.replace(/[^A-Za-z0-9_]/g, '_')

function writeNetlist(circuit: Circuit, options: SpiceOptions): { netlist: string; probes: SpiceProbe[] } {
  const topo: Topology = buildTopology(circuit)
  const supply = circuit.components.find((c) => c.kind === 'supply')
  const hz = supply?.kind === 'supply' ? supply.hz : 60
  const omega = 2 * Math.PI * hz
  const node = (n: number) => (n < 0 ? '0' : `n${n}`)
  const lines: string[] = [`* Phaseloom netlist: ${(circuit.name ?? 'bank').replace(/[\r\n]/g, ' ')}`, '* generated from a Phaseloom circuit document (format 1); nodes:']
  topo.nodeLabels.forEach((labels, i) => lines.push(`*   n${i} = ${labels.join(' ')}`))
  lines.push('*   0 = ground')

  // a series R + jX between two nodes through an internal node; negative X is a capacitor
  const series = (name: string, a: string, b: string, r: number, x: number) => {
    if (x === 0) {
      lines.push(`R${name} ${a} ${b} ${num(r > 0 ? r : 1e-9)}`)
      return
    }
    const mid = `${a === '0' ? 'g' : a}_${safe(name)}`
    if (r > 0) lines.push(`R${name} ${a} ${mid} ${num(r)}`)
    const from = r > 0 ? mid : a
    if (x > 0) lines.push(`L${name} ${from} ${b} ${num(x / omega)}`)
    else lines.push(`C${name} ${from} ${b} ${num(-1 / (omega * x))}`)
  }

  lines.push('* every node leaks 1 GΩ to ground')
  for (let i = 0; i < topo.nodeCount; i++) lines.push(`RLEAK${i} n${i} 0 ${num(1 / LEAK_SIEMENS)}`)

  lines.push('* supplies: EMF behind the per-phase source impedance')
  for (const ph of topo.phases) {
    const name = `${safe(ph.supply)}_${ph.phase}`
    const deg = (Math.atan2(ph.emf.im, ph.emf.re) * 180) / Math.PI
    const emf = `DC 0 AC ${num(new Complex(ph.emf.re, ph.emf.im).abs())} ${num(deg)}`
    if (ph.z.re === 0 && ph.z.im === 0) lines.push(`VS_${name} ${node(ph.line)} ${node(ph.star)} ${emf}`)
    else {
      const inner = `s_${name}`
      lines.push(`VS_${name} ${inner} ${node(ph.star)} ${emf}`)
      series(`S_${name}`, inner, node(ph.line), ph.z.re, ph.z.im)
    }
  }

  const open = new Set<string>()
  for (const c of circuit.components) {
    if ((c.kind === 'breaker' && !c.closed) || (c.kind === 'fuse' && c.blown)) open.add(c.id)
  }
  lines.push(`* closed breaker poles and intact fuses: ${CLOSED_CONTACT_OHMS} Ω`)
  topo.poles.forEach((p, k) => {
    if (!open.has(p.device)) lines.push(`RSW_${safe(p.device)}_${k} ${node(p.a)} ${node(p.b)} ${num(CLOSED_CONTACT_OHMS)}`)
  })
  lines.push('* loads')
  for (const l of topo.loads) {
    const z = l.y.inverse()
    series(`LOAD_${safe(l.id)}`, node(l.a), node(l.b), z.re, z.im)
  }

  const probes: SpiceProbe[] = []
  const diff = (fn: string, a: number, b: number) => (b < 0 ? `${fn}(${node(a)})` : a < 0 ? `${fn}(0,${node(b)})` : `${fn}(${node(a)},${node(b)})`)
  lines.push(`* voltmeters: ${VOLTMETER_OHMS} Ω`)
  for (const m of topo.meters) {
    lines.push(`RMETER_${safe(m.id)} ${node(m.a)} ${node(m.b)} ${num(VOLTMETER_OHMS)}`)
    if (m.a === m.b) continue
    probes.push({ kind: 'meter', name: m.id, vectors: [diff('vm', m.a, m.b), diff('vp', m.a, m.b)] })
  }

  lines.push(`* transformer units: series impedance, a 0 V current probe, coupled inductors (k = ${COUPLING})`)
  for (const u of topo.units) {
    const z = windingImpedances(u.spec)
    const zs = [z.primary, ...z.coils]
    const zBase = (u.spec.primaryVolts * u.spec.primaryVolts) / (u.spec.kva * 1000)
    const lMag = (MAGNETIZING_PER_UNIT * zBase) / omega
    const primaryTurns = u.windings[0]!.turns
    const coupled: string[] = []
    u.windings.forEach((w, k) => {
      const tag = `${safe(u.id)}_${w.name.replace('-', '')}`
      const a = node(w.a)
      const mid1 = `w_${tag}_1`
      const mid2 = `w_${tag}_2`
      series(`W_${tag}`, a, mid1, zs[k]!.re, zs[k]!.im)
      lines.push(`VI_${tag} ${mid1} ${mid2} 0`)
      const ratio = w.turns / primaryTurns
      lines.push(`LC_${tag} ${mid2} ${node(w.b)} ${num(lMag * ratio * ratio)}`)
      coupled.push(`LC_${tag}`)
      probes.push({ kind: 'winding', name: `${u.id}.${w.name}`, vectors: [`real(i(VI_${tag}))`, `imag(i(VI_${tag}))`] })
    })
    for (let i = 0; i < coupled.length; i++) {
      for (let j = i + 1; j < coupled.length; j++) lines.push(`K_${safe(u.id)}_${i}${j} ${coupled[i]} ${coupled[j]} ${num(COUPLING)}`)
    }
  }

  const points = Math.max(1, Math.floor(options.points ?? 1))
  // ngspice 39 runs `ac lin N f f` as a single point: repeated points need a sliver of a span
  const stop = points > 1 ? hz * (1 + 1e-8) : hz
  lines.push('.control', `ac lin ${points} ${num(hz)} ${num(stop)}`)
  for (const p of probes) lines.push(`print ${p.vectors.join(' ')}`)
  lines.push('quit', '.endc', '.end', '')
  return { netlist: lines.join('\n'), probes }
}
