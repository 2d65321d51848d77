/**
 * The same circuit as an ngspice netlist, for an independent check of the engine and for
 * users who want to run it in a SPICE of their own.
 *
 * Each transformer winding is its series resistance and reactance, a 0 V source that measures
 * its current, and one of a set of inductors coupled with k = 1 − 1e-9. Coupled inductors in
 * proportion to the square of the turns are an ideal core with the magnetizing inductance of
 * the first across it, so the primary's is the unit's own magnetizing reactance referred to
 * the primary's n_p turns (tap included): L_p = n_p² / (ω·B), each other winding's
 * L_p·(n_k/n_p)²; a resistor n_p² / G across the primary's coupled inductor draws the core
 * loss (circuit-format.md 1.1: the exciting branch across the ideal core on the primary side,
 * G − jB = excitingAdmittance, in ampere-turns per volt-per-turn). The leakage that k adds is
 * 2·(1 − k)·L_p, about 2 × 10⁻⁷ per unit at the default 1 % exciting current and at most
 * 2 × 10⁻⁵ per unit (magnetizing reactance capped at 10⁴ per unit, where B is all but 0):
 * far below the engine's 0.5 % agreement.
 *
 * Ammeters are 0 V sources, rotation meters three 10 MΩ leads to their common point. Every
 * probe prints the real and imaginary part of its phasor.
 */
import { parseCircuit } from '../circuit/parse'
import type { Circuit } from '../circuit/schema'
import { CircuitValidationError } from './solve'
import { buildTopology, CLOSED_CONTACT_OHMS, excitingAdmittance, LEAK_SIEMENS, ROTATION_LEAD_OHMS, VOLTMETER_OHMS, windingImpedances, type Topology } from './network'

export const COUPLING = 1 - 1e-9
/**
 * The largest magnetizing reactance written, per unit of the primary's base: a core whose
 * loss is nearly all of its exciting current has B near 0 (an infinite inductance); 10⁴ per
 * unit keeps the leakage of k at 2 × 10⁻⁵ per unit and the extra current at 10⁻⁴ per unit.
 */
export const MAX_MAGNETIZING_PER_UNIT = 1e4

export interface SpiceOptions {
  /** number of .ac points at (all but exactly) the supply frequency, for timing ngspice per point; 1 by default */
  points?: number
}

/** Names of the printed vectors, so that a caller can read ngspice's output back. */
export interface SpiceProbe {
  /**
   * meter: V(a) − V(b) of a voltmeter; ammeter: its current from a to b; winding: the current
   * into its dotted terminal; rotation: V(a), V(b), V(c) each less V(common)
   */
  kind: 'meter' | 'ammeter' | 'winding' | 'rotation'
  name: string
  /** ngspice expressions, in pairs: the real and the imaginary part of each phasor */
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
const node = (n: number) => (n < 0 ? '0' : `n${n}`)

/**
 * Real and imaginary part of V(a) − V(b). ngspice has no vector for ground, so `v(0,nX)` is
 * refused: with `a` grounded the difference is −V(b). Nothing when a and b are one node.
 */
function voltageVectors(a: number, b: number): string[] {
  if (a === b) return []
  const v = b < 0 ? `v(${node(a)})` : a < 0 ? `-v(${node(b)})` : `v(${node(a)},${node(b)})`
  return [`real(${v})`, `imag(${v})`]
}

function writeNetlist(circuit: Circuit, options: SpiceOptions): { netlist: string; probes: SpiceProbe[] } {
  const topo: Topology = buildTopology(circuit)
  const supply = circuit.components.find((c) => c.kind === 'supply')
  const hz = supply?.kind === 'supply' ? supply.hz : 60
  const omega = 2 * Math.PI * hz
  const lines: string[] = [`* Phaseloom netlist: ${(circuit.name ?? 'bank').replace(/[\r\n]/g, ' ')}`, '* generated from a Phaseloom circuit document (format 1.1); nodes:']
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
    const emf = `DC 0 AC ${num(Math.hypot(ph.emf.re, ph.emf.im))} ${num(deg)}`
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
  lines.push(`* voltmeters: ${VOLTMETER_OHMS} Ω (one with both ends on one node reads 0 and is left out)`)
  for (const m of topo.meters) {
    if (m.a === m.b) continue
    lines.push(`RMETER_${safe(m.id)} ${node(m.a)} ${node(m.b)} ${num(VOLTMETER_OHMS)}`)
    probes.push({ kind: 'meter', name: m.id, vectors: voltageVectors(m.a, m.b) })
  }
  lines.push('* ammeters: 0 V sources, the current from a to b (one with both ends on one node reads 0)')
  for (const m of topo.ammeters) {
    if (m.a === m.b) continue
    const source = `VAM_${safe(m.id)}`
    lines.push(`${source} ${node(m.a)} ${node(m.b)} 0`)
    probes.push({ kind: 'ammeter', name: m.id, vectors: [`real(i(${source}))`, `imag(i(${source}))`] })
  }
  lines.push(`* rotation meters: three ${ROTATION_LEAD_OHMS} Ω leads to a common point`)
  for (const r of topo.rotationMeters) {
    const leads = [r.a, r.b, r.c]
    leads.forEach((lead, k) => lines.push(`RROT_${safe(r.id)}_${'abc'[k]} ${node(lead)} ${node(r.common)} ${num(ROTATION_LEAD_OHMS)}`))
    probes.push({ kind: 'rotation', name: r.id, vectors: leads.flatMap((lead) => voltageVectors(lead, r.common)) })
  }

  lines.push(`* transformer units: series impedance, a 0 V current probe, coupled inductors (k = ${COUPLING}), the core loss across the primary's`)
  for (const u of topo.units) {
    const z = windingImpedances(u.spec)
    const zs = [z.primary, ...z.coils]
    const primaryTurns = u.windings[0]!.turns
    const va = u.spec.kva * 1000
    // the exciting branch G − jB at 1 V per turn, referred to the primary: Y / n_p²
    const exciting = excitingAdmittance(u.spec)
    const susceptance = Math.max(-exciting.im, va / MAX_MAGNETIZING_PER_UNIT)
    const lPrimary = (primaryTurns * primaryTurns) / (omega * susceptance)
    const coupled: string[] = []
    u.windings.forEach((w, k) => {
      const tag = `${safe(u.id)}_${w.name.replace('-', '')}`
      const a = node(w.a)
      const mid1 = `w_${tag}_1`
      const mid2 = `w_${tag}_2`
      series(`W_${tag}`, a, mid1, zs[k]!.re, zs[k]!.im)
      lines.push(`VI_${tag} ${mid1} ${mid2} 0`)
      const ratio = w.turns / primaryTurns
      lines.push(`LC_${tag} ${mid2} ${node(w.b)} ${num(lPrimary * ratio * ratio)}`)
      if (k === 0 && exciting.re > 0) lines.push(`RCORE_${safe(u.id)} ${mid2} ${node(w.b)} ${num((primaryTurns * primaryTurns) / exciting.re)}`)
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
