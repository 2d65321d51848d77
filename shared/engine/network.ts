/**
 * From a circuit document to network equations, and their solution for one state of the
 * protective devices.
 *
 * Formulation: nodal analysis in which every branch current but the ideal sources' is
 * eliminated analytically. A transformer unit is an ideal core (equal volts per turn on every
 * winding, ampere-turns balance) with a series impedance in each winding; eliminating the
 * core's volts-per-turn gives the unit's nodal admittance
 *     Y = Σ y_k d_k d_kᵀ − c cᵀ / s,   c = Σ n_k y_k d_k,   s = Σ n_k² y_k,
 * where d_k is the incidence vector of winding k (+1 at its dotted terminal), y_k its series
 * admittance and n_k its turns. The exciting branch (circuit-format.md 1.1: a shunt across the
 * ideal core on the primary side, between the two halves of the series impedance) draws
 * ampere-turns Y_m·e from the core, so the balance Σ n_k I_k = Y_m·e only adds Y_m to s:
 *     s = Σ n_k² y_k + Y_m.
 * It is what holds a floating star point near the centre, as the cores do in a real bank,
 * instead of the 1 GΩ leaks. Supply phases and ammeters keep their current as an unknown,
 * so an ideal (zero-impedance) source and a zero-ohm ammeter are allowed.
 */
import Complex from 'complex.js'
import type { Circuit, Component, Transformer } from '../circuit/schema'
import { terminalsOf } from '../circuit/schema'
import type { TerminalIndex } from '../circuit/parse'
import { ComplexSymmetricSystem, SingularSystemError } from './sparse'

/** Every node's conductance to ground (circuit-format.md: 1 GΩ). */
export const LEAK_SIEMENS = 1e-9
/** A voltmeter's resistance (circuit-format.md: 10 MΩ). */
export const VOLTMETER_OHMS = 10e6
/** Resistance of a closed breaker pole or an intact fuse: "a few milliohms". */
export const CLOSED_CONTACT_OHMS = 0.002
/** Each lead of a rotation meter to its common point (circuit-format.md 1.1: 10 MΩ). */
export const ROTATION_LEAD_OHMS = 10e6

export class CircuitSolveError extends Error {
  constructor(
    message: string,
    readonly parts: string[],
  ) {
    super(message)
  }
}

export interface Winding {
  /** e.g. "H1-H2", "X1-X2" */
  name: string
  /** dotted terminal (H1, X1, X3) and the other */
  dot: string
  undot: string
  a: number
  b: number
  turns: number
  ratedVolts: number
  ratedAmps: number
  /** series admittance */
  yRe: number
  yIm: number
}

export interface Unit {
  id: string
  spec: Transformer
  windings: Winding[]
  /**
   * the exciting branch as ampere-turns per volt-per-turn of the core (G − jB): at rated flux
   * (1 V per turn, the turns being the nameplate volts) it draws excitingPercent of the rated
   * primary current, coreLossPercent of the kVA of it as real power
   */
  magRe: number
  magIm: number
  /** the node of each of its terminals: node.X3 */
  node: Record<string, number>
}

/** A complex number as a plain pair (the engine's hot paths build no Complex objects). */
export interface Phasor {
  re: number
  im: number
}

const inverse = (re: number, im: number): Phasor => {
  const d = re * re + im * im
  return { re: re / d, im: -im / d }
}

export interface SupplyPhase {
  supply: string
  phase: 'A' | 'B' | 'C'
  star: number
  line: number
  emf: Phasor
  z: Phasor
}

export interface SwitchPole {
  device: string
  a: number
  b: number
}

export interface Topology {
  circuit: Circuit
  byId: Map<string, Component>
  unitById: Map<string, Unit>
  /** node of each terminal "ID.T"; -1 is ground (the reference); built on first use (see nodeOfTerminal) */
  readonly terminalNode: Map<string, number>
  /** index of each terminal name, in document order */
  terminalIndex: Map<string, number>
  /** the same as two lists in document order: each terminal's name and its node */
  terminalNames: string[]
  terminalNodes: number[]
  /** circuit nodes plus the hidden star point of each delta supply */
  nodeCount: number
  /** the terminals at each node, by name (a star point by its own label); made on first use */
  readonly nodeLabels: string[][]
  /** how many terminals meet at each node */
  nodeTerminalCount: number[]
  units: Unit[]
  phases: SupplyPhase[]
  poles: SwitchPole[]
  loads: { id: string; a: number; b: number; y: Complex }[]
  meters: { id: string; a: number; b: number }[]
  /** (1.1) zero-ohm ammeters: each keeps its current (a to b) as an unknown after the supply phases'; a meter with both ends on one node reads 0 */
  ammeters: { id: string; a: number; b: number }[]
  /** (1.1) rotation meters: three leads to a hidden common node */
  rotationMeters: { id: string; a: number; b: number; c: number; common: number }[]
  /** each node's conductance to ground (LEAK_SIEMENS unless a test scales it) */
  leakSiemens: number
  /** what bank.ts reads from the wiring alone, worked out there on first use */
  bankCache?: unknown
  /** the nominal potentials bank-check.ts works out from the wiring, on first use */
  nominalCache?: unknown
  /** the terminals on ground itself, listed by bank.ts on first use */
  groundLabels?: string[]
}

class UnionFind {
  parent: number[]
  constructor(n: number) {
    this.parent = new Array<number>(n)
    for (let i = 0; i < n; i++) this.parent[i] = i
  }

  find(x: number): number {
    const p = this.parent
    while (p[x] !== x) {
      p[x] = p[p[x]!]!
      x = p[x]!
    }
    return x
  }

  union(a: number, b: number): boolean {
    const ra = this.find(a)
    const rb = this.find(b)
    if (ra === rb) return false
    this.parent[ra] = rb
    return true
  }
}

/** Series impedance of each winding, in ohms at that winding (circuit-format.md). */
export function windingImpedances(t: Transformer): { primary: Complex; coils: Complex[] } {
  const z = windingSeries(t)
  return { primary: new Complex(z.primary.re, z.primary.im), coils: z.coils.map((c) => new Complex(c.re, c.im)) }
}

/** windingImpedances as plain pairs. */
function windingSeries(t: Transformer): { primary: Phasor; coils: Phasor[] } {
  const zpu = t.impedancePercent / 100
  const rpu = zpu / Math.sqrt(1 + t.xOverR * t.xOverR)
  const ur = rpu
  const ui = rpu * t.xOverR
  const va = t.kva * 1000
  let totalCoilVolts = 0
  for (const v of t.secondaryVolts) totalCoilVolts += v
  const kp = (0.5 * t.primaryVolts * t.primaryVolts) / va
  const primary = { re: ur * kp, im: ui * kp }
  const coils = t.secondaryVolts.map((v) => {
    const k = (0.5 * v * v) / (va * (v / totalCoilVolts))
    return { re: ur * k, im: ui * k }
  })
  return { primary, coils }
}

/** Rated current of each winding: the primary at the unit's kVA, each coil at its share. */
export function windingRatedAmps(t: Transformer): { primary: number; coils: number[] } {
  const totalCoilVolts = t.secondaryVolts.reduce((s, v) => s + v, 0)
  return {
    primary: (t.kva * 1000) / t.primaryVolts,
    coils: t.secondaryVolts.map((v) => (t.kva * 1000 * (v / totalCoilVolts)) / v),
  }
}

/**
 * The Topology as a class: the lazy terminalNode map is a getter on the prototype, so every
 * instance keeps V8's fast properties (an accessor in an object literal puts the object in
 * dictionary mode, and every `topo.x` in the engine's loops becomes a hash lookup).
 */
class NetworkTopology implements Topology {
  readonly unitById: Map<string, Unit>
  readonly nodeCount: number
  bankCache?: unknown = undefined
  nominalCache?: unknown = undefined
  groundLabels?: string[] = undefined
  leakSiemens = LEAK_SIEMENS
  #terminalNode: Map<string, number> | undefined = undefined
  #nodeLabels: string[][] | undefined = undefined

  constructor(
    readonly circuit: Circuit,
    readonly byId: Map<string, Component>,
    readonly terminalIndex: Map<string, number>,
    readonly terminalNames: string[],
    readonly terminalNodes: number[],
    readonly nodeTerminalCount: number[],
    private readonly extraLabels: string[],
    readonly units: Unit[],
    readonly phases: SupplyPhase[],
    readonly poles: SwitchPole[],
    readonly loads: Topology['loads'],
    readonly meters: Topology['meters'],
    readonly ammeters: Topology['ammeters'],
    readonly rotationMeters: Topology['rotationMeters'],
  ) {
    this.unitById = new Map(units.map((u) => [u.id, u]))
    this.nodeCount = nodeTerminalCount.length
  }

  get nodeLabels(): string[][] {
    if (!this.#nodeLabels) {
      const labels: string[][] = Array.from({ length: this.nodeCount }, (_, node) => (this.extraLabels[node] === undefined ? [] : [this.extraLabels[node]!]))
      for (let k = 0; k < this.terminalNames.length; k++) {
        const node = this.terminalNodes[k]!
        if (node >= 0) labels[node]!.push(this.terminalNames[k]!)
      }
      this.#nodeLabels = labels
    }
    return this.#nodeLabels
  }

  get terminalNode(): Map<string, number> {
    if (!this.#terminalNode) {
      const map = new Map<string, number>()
      for (let k = 0; k < this.terminalNames.length; k++) map.set(this.terminalNames[k]!, this.terminalNodes[k]!)
      this.#terminalNode = map
    }
    return this.#terminalNode
  }
}

/** The exciting branch of a unit in ampere-turns per volt-per-turn (see Unit.magRe). */
export function excitingAdmittance(t: Transformer): Phasor {
  const va = t.kva * 1000
  const exciting = t.excitingPercent / 100
  const loss = Math.min(t.coreLossPercent / 100, exciting)
  // at 1 V per turn: loss·S watts and √(exc² − loss²)·S vars, lagging
  return { re: loss * va, im: -Math.sqrt(exciting * exciting - loss * loss) * va }
}

/**
 * @param terminals the terminals and wire ends as parseCircuitIndexed found them in this very
 * document, unchanged since (worked out here when absent)
 */
export function buildTopology(circuit: Circuit, terminals?: TerminalIndex): Topology {
  const comps = circuit.components
  const byId = new Map<string, Component>()
  /** index of each component's first terminal; its terminals follow in terminalsOf order */
  const base: number[] = new Array<number>(comps.length)
  let count = 0
  for (let k = 0; k < comps.length; k++) {
    const c = comps[k]!
    byId.set(c.id, c)
    base[k] = count
    count += terminalsOf(c).length
  }
  const wires = circuit.wires
  let index: Map<string, number>
  let terminalNames: string[]
  let wireEnds: number[]
  if (terminals && terminals.index.size === count && terminals.wireEnds.length === 2 * wires.length) {
    ;({ index, names: terminalNames, wireEnds } = terminals)
  } else {
    index = new Map<string, number>()
    terminalNames = []
    for (const c of comps) {
      for (const t of terminalsOf(c)) {
        index.set(`${c.id}.${t}`, terminalNames.length)
        terminalNames.push(`${c.id}.${t}`)
      }
    }
    wireEnds = new Array<number>(2 * wires.length)
    for (let w = 0; w < wires.length; w++) {
      wireEnds[2 * w] = index.get(wires[w]![0]) ?? -1
      wireEnds[2 * w + 1] = index.get(wires[w]![1]) ?? -1
    }
  }
  const GROUND = count
  const uf = new UnionFind(count + 1)
  for (let w = 0; w < wires.length; w++) {
    const a = wireEnds[2 * w]!
    const b = wireEnds[2 * w + 1]!
    if (a >= 0 && b >= 0) uf.union(a, b)
  }
  for (let k = 0; k < comps.length; k++) {
    const c = comps[k]!
    if (c.kind === 'ground') uf.union(base[k]!, GROUND)
    // circuit-format.md: a wye supply's N is bonded to ground (N is its fourth terminal)
    if (c.kind === 'supply' && c.connection === 'wye') uf.union(base[k]! + 3, GROUND)
  }
  const groundRoot = uf.find(GROUND)
  /** node of each terminal by its index */
  const nodeOf: number[] = new Array<number>(count)
  const rootNode: number[] = new Array<number>(count + 1).fill(-1)
  /** how many terminals meet at each node (the labels themselves are made when asked for) */
  const terminalCount: number[] = []
  /** nodes that are no terminal's: the hidden star point of each delta supply */
  const extraLabels: string[] = []
  for (let i = 0; i < count; i++) {
    const root = uf.find(i)
    let node = -1
    if (root !== groundRoot) {
      node = rootNode[root]!
      if (node < 0) {
        node = terminalCount.length
        rootNode[root] = node
        terminalCount.push(1)
      } else terminalCount[node]!++
    }
    nodeOf[i] = node
  }

  const units: Unit[] = []
  const phases: SupplyPhase[] = []
  const poles: SwitchPole[] = []
  const loads: Topology['loads'] = []
  const meters: Topology['meters'] = []
  const ammeters: Topology['ammeters'] = []
  const rotationMeters: Topology['rotationMeters'] = []
  for (let k = 0; k < comps.length; k++) {
    const c = comps[k]!
    const b0 = base[k]!
    switch (c.kind) {
      case 'supply': {
        let star = -1
        if (c.connection === 'delta') {
          // a delta source is modelled by its wye equivalent behind the same per-phase
          // impedance, the star point floating: identical line-to-line phasors, no neutral
          star = terminalCount.length
          terminalCount.push(0)
          extraLabels[star] = `${c.id} (star point)`
        }
        const vPhase = c.lineVolts / Math.sqrt(3)
        // circuit-format.md: V(A−N) at 0°, V(B−N) at −120°, V(C−N) at +120° for ABC
        const angles = c.rotation === 'ABC' ? { A: 0, B: -120, C: 120 } : { A: 0, B: 120, C: -120 }
        for (let q = 0; q < 3; q++) {
          const phase = (['A', 'B', 'C'] as const)[q]!
          const arg = (angles[phase] * Math.PI) / 180
          phases.push({
            supply: c.id,
            phase,
            star,
            line: nodeOf[b0 + q]!,
            emf: { re: vPhase * Math.cos(arg), im: vPhase * Math.sin(arg) },
            z: { re: c.sourceOhms.r, im: c.sourceOhms.x },
          })
        }
        break
      }
      case 'transformer': {
        const z = windingSeries(c)
        const rated = windingRatedAmps(c)
        const gain = 1 + c.compensationPercent / 100
        const windings: Winding[] = []
        // terminals H1, H2, X1, X2 (, X3, X4) from b0 on: a winding's ends are consecutive
        const add = (name: string, dot: string, undot: string, at: number, turns: number, volts: number, amps: number, zw: Phasor) => {
          const y = inverse(zw.re, zw.im)
          windings.push({ name, dot, undot, a: nodeOf[at]!, b: nodeOf[at + 1]!, turns, ratedVolts: volts, ratedAmps: amps, yRe: y.re, yIm: y.im })
        }
        // a tap above nominal puts more primary turns in use (circuit-format.md 1.1)
        add('H1-H2', 'H1', 'H2', b0, c.primaryVolts * (1 + c.tapPercent / 100), c.primaryVolts, rated.primary, z.primary)
        add('X1-X2', 'X1', 'X2', b0 + 2, c.secondaryVolts[0]! * gain, c.secondaryVolts[0]!, rated.coils[0]!, z.coils[0]!)
        if (c.secondaryVolts.length === 2) {
          add('X3-X4', 'X3', 'X4', b0 + 4, c.secondaryVolts[1]! * gain, c.secondaryVolts[1]!, rated.coils[1]!, z.coils[1]!)
        }
        const node: Record<string, number> = {}
        const names = terminalsOf(c)
        for (let j = 0; j < names.length; j++) node[names[j]!] = nodeOf[b0 + j]!
        const mag = excitingAdmittance(c)
        units.push({ id: c.id, spec: c, windings, node, magRe: mag.re, magIm: mag.im })
        break
      }
      case 'breaker':
        // L1..Lp, then T1..Tp
        for (let p = 0; p < c.poles; p++) poles.push({ device: c.id, a: nodeOf[b0 + p]!, b: nodeOf[b0 + c.poles + p]! })
        break
      case 'fuse':
        poles.push({ device: c.id, a: nodeOf[b0]!, b: nodeOf[b0 + 1]! })
        break
      case 'load': {
        const y = typeof c.ohms === 'number' ? inverse(c.ohms, 0) : inverse(c.ohms.r, c.ohms.x)
        loads.push({ id: c.id, a: nodeOf[b0]!, b: nodeOf[b0 + 1]!, y: new Complex(y.re, y.im) })
        break
      }
      case 'voltmeter':
        meters.push({ id: c.id, a: nodeOf[b0]!, b: nodeOf[b0 + 1]! })
        break
      case 'ammeter':
        ammeters.push({ id: c.id, a: nodeOf[b0]!, b: nodeOf[b0 + 1]! })
        break
      case 'rotation-meter': {
        const common = terminalCount.length
        terminalCount.push(0)
        extraLabels[common] = `${c.id} (common point)`
        rotationMeters.push({ id: c.id, a: nodeOf[b0]!, b: nodeOf[b0 + 1]!, c: nodeOf[b0 + 2]!, common })
        break
      }
    }
  }
  const topo = new NetworkTopology(circuit, byId, index, terminalNames, nodeOf, terminalCount, extraLabels, units, phases, poles, loads, meters, ammeters, rotationMeters)
  checkSourceLoops(topo)
  return topo
}

/** The node of a terminal "ID.T" (-1: ground), or undefined when there is no such terminal. */
export function nodeOfTerminal(topo: Topology, terminal: string): number | undefined {
  const k = topo.terminalIndex.get(terminal)
  return k === undefined ? undefined : topo.terminalNodes[k]
}

/** Ideal (zero-impedance) supply phases and ammeters that close a loop have no solution: say which. */
function checkSourceLoops(topo: Topology) {
  const uf = new UnionFind(topo.nodeCount + 1)
  const key = (n: number) => (n < 0 ? topo.nodeCount : n)
  for (const m of topo.ammeters) {
    if (m.a === m.b) continue // shorted by a jumper: it reads 0
    if (!uf.union(key(m.a), key(m.b))) {
      const where = m.a >= 0 ? topo.nodeLabels[m.a]!.join(', ') : 'ground'
      throw new CircuitSolveError(
        `ammeter ${m.id} closes a loop of zero-ohm paths (other ammeters or an ideal supply) at ${where}: the current has no one way to divide. ` +
          `Put each ammeter in series with a conductor, not in parallel with another.`,
        [m.id],
      )
    }
  }
  const seen: SupplyPhase[] = []
  for (const ph of topo.phases) {
    if (ph.z.re !== 0 || ph.z.im !== 0) continue
    seen.push(ph)
    if (!uf.union(key(ph.star), key(ph.line))) {
      const parts = [...new Set(seen.map((p) => p.supply))]
      const where = ph.line >= 0 ? topo.nodeLabels[ph.line]!.join(', ') : 'ground'
      throw new CircuitSolveError(
        `a loop of zero-impedance supply phases with nothing to limit the current: ${ph.supply}.${ph.phase} closes it at ${where}. ` +
          `Remove the jumper that ties supply lines together, or give the supply a source impedance.`,
        parts,
      )
    }
  }
}

export interface UnitSolution {
  id: string
  /** volts per turn of the core */
  eRe: number
  eIm: number
  /** winding currents into the dotted terminal */
  current: { re: number; im: number }[]
}

export interface StageSolution {
  /** node voltages, by node index (the supply phases' unknowns follow the nodes) */
  vRe: readonly number[]
  vIm: readonly number[]
  units: UnitSolution[]
  /** supply phase currents out of the line terminal, in topology order */
  phaseCurrent: { re: number; im: number }[]
  /** each ammeter's current from a to b, in topology order */
  ammeterCurrent: { re: number; im: number }[]
  /** current through each conducting switch pole (0 for open), in topology order */
  poleCurrent: { re: number; im: number }[]
}

/** Solves the network with the given breakers and fuses open (removed). */
export function solveStage(topo: Topology, open: ReadonlySet<string>): StageSolution {
  const n = topo.nodeCount
  const firstAmmeter = n + topo.phases.length
  const leak = topo.leakSiemens
  const sys = new ComplexSymmetricSystem(firstAmmeter + topo.ammeters.length, n, leak)
  for (let i = 0; i < n; i++) sys.add(i, i, leak, 0)

  topo.phases.forEach((ph, k) => {
    // row of the phase current I (out of the line terminal): V(star) − V(line) − Z·I = −E
    const row = n + k
    if (ph.line >= 0) sys.add(row, ph.line, -1, 0)
    if (ph.star >= 0) sys.add(row, ph.star, 1, 0)
    sys.add(row, row, -ph.z.re, -ph.z.im)
    sys.addRhs(row, -ph.emf.re, -ph.emf.im)
  })
  const gClosed = 1 / CLOSED_CONTACT_OHMS
  for (const p of topo.poles) if (!open.has(p.device)) sys.addAdmittance(p.a, p.b, gClosed, 0)
  for (const l of topo.loads) sys.addAdmittance(l.a, l.b, l.y.re, l.y.im)
  for (const m of topo.meters) sys.addAdmittance(m.a, m.b, 1 / VOLTMETER_OHMS, 0)
  for (const r of topo.rotationMeters) {
    for (const lead of [r.a, r.b, r.c]) sys.addAdmittance(lead, r.common, 1 / ROTATION_LEAD_OHMS, 0)
  }
  topo.ammeters.forEach((m, k) => {
    // the current I from a to b: it leaves node a, enters node b, and V(a) − V(b) = 0
    const row = firstAmmeter + k
    if (m.a === m.b) {
      sys.add(row, row, 1, 0) // shorted: I = 0
      return
    }
    if (m.a >= 0) sys.add(row, m.a, 1, 0)
    if (m.b >= 0) sys.add(row, m.b, -1, 0)
  })
  for (const u of topo.units) stampUnit(sys, u)

  let x: { re: number[]; im: number[] }
  try {
    x = sys.solve()
  } catch (e) {
    if (e instanceof SingularSystemError) throw singularError(topo, e.unknown)
    throw e
  }
  const vRe = x.re
  const vIm = x.im

  const units: UnitSolution[] = new Array<UnitSolution>(topo.units.length)
  for (let k = 0; k < units.length; k++) units[k] = unitSolution(topo.units[k]!, vRe, vIm)
  const phaseCurrent = topo.phases.map((_, k) => ({ re: x.re[n + k]!, im: x.im[n + k]! }))
  const ammeterCurrent = topo.ammeters.map((_, k) => ({ re: x.re[firstAmmeter + k]!, im: x.im[firstAmmeter + k]! }))
  const poleCurrent: { re: number; im: number }[] = new Array(topo.poles.length)
  for (let k = 0; k < poleCurrent.length; k++) {
    const p = topo.poles[k]!
    if (open.has(p.device)) {
      poleCurrent[k] = { re: 0, im: 0 }
      continue
    }
    const dr = (p.a < 0 ? 0 : vRe[p.a]!) - (p.b < 0 ? 0 : vRe[p.b]!)
    const di = (p.a < 0 ? 0 : vIm[p.a]!) - (p.b < 0 ? 0 : vIm[p.b]!)
    poleCurrent[k] = { re: dr * gClosed, im: di * gClosed }
  }
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(vRe[i]!) || !Number.isFinite(vIm[i]!)) throw singularError(topo, i)
  }
  return { vRe, vIm, units, phaseCurrent, ammeterCurrent, poleCurrent }
}

function stampUnit(sys: ComplexSymmetricSystem, u: Unit) {
  // c = Σ n_k y_k d_k as (node, coefficient) pairs; s = Σ n_k² y_k
  const cNode: number[] = []
  const cRe: number[] = []
  const cIm: number[] = []
  let sRe = 0
  let sIm = 0
  const addC = (node: number, re: number, im: number) => {
    if (node < 0) return
    const i = cNode.indexOf(node)
    if (i < 0) {
      cNode.push(node)
      cRe.push(re)
      cIm.push(im)
    } else {
      cRe[i]! += re
      cIm[i]! += im
    }
  }
  for (const w of u.windings) {
    sys.addAdmittance(w.a, w.b, w.yRe, w.yIm)
    addC(w.a, w.turns * w.yRe, w.turns * w.yIm)
    addC(w.b, -w.turns * w.yRe, -w.turns * w.yIm)
    sRe += w.turns * w.turns * w.yRe
    sIm += w.turns * w.turns * w.yIm
  }
  sRe += u.magRe
  sIm += u.magIm
  const sm = sRe * sRe + sIm * sIm
  const invRe = sRe / sm
  const invIm = -sIm / sm
  for (let p = 0; p < cNode.length; p++) {
    // −c_p / s
    const qr = -(cRe[p]! * invRe - cIm[p]! * invIm)
    const qi = -(cRe[p]! * invIm + cIm[p]! * invRe)
    for (let q = p; q < cNode.length; q++) {
      sys.add(cNode[p]!, cNode[q]!, qr * cRe[q]! - qi * cIm[q]!, qr * cIm[q]! + qi * cRe[q]!)
    }
  }
}

function unitSolution(u: Unit, vRe: readonly number[], vIm: readonly number[]): UnitSolution {
  let numRe = 0
  let numIm = 0
  let sRe = 0
  let sIm = 0
  const ws = u.windings
  const m = ws.length
  const dropRe: number[] = new Array<number>(m)
  const dropIm: number[] = new Array<number>(m)
  for (let k = 0; k < m; k++) {
    const w = ws[k]!
    const dr = (w.a < 0 ? 0 : vRe[w.a]!) - (w.b < 0 ? 0 : vRe[w.b]!)
    const di = (w.a < 0 ? 0 : vIm[w.a]!) - (w.b < 0 ? 0 : vIm[w.b]!)
    dropRe[k] = dr
    dropIm[k] = di
    numRe += w.turns * (w.yRe * dr - w.yIm * di)
    numIm += w.turns * (w.yRe * di + w.yIm * dr)
    sRe += w.turns * w.turns * w.yRe
    sIm += w.turns * w.turns * w.yIm
  }
  sRe += u.magRe
  sIm += u.magIm
  const sm = sRe * sRe + sIm * sIm
  const eRe = (numRe * sRe + numIm * sIm) / sm
  const eIm = (numIm * sRe - numRe * sIm) / sm
  const current: { re: number; im: number }[] = new Array(m)
  for (let k = 0; k < m; k++) {
    const w = ws[k]!
    const ur = dropRe[k]! - w.turns * eRe
    const ui = dropIm[k]! - w.turns * eIm
    current[k] = { re: w.yRe * ur - w.yIm * ui, im: w.yRe * ui + w.yIm * ur }
  }
  return { id: u.id, eRe, eIm, current }
}

function singularError(topo: Topology, unknown: number): CircuitSolveError {
  let where = 'the network'
  let parts: string[] = []
  if (unknown >= 0 && unknown < topo.nodeCount) {
    const labels = topo.nodeLabels[unknown]!
    where = labels.join(', ')
    parts = [...new Set(labels.map((l) => l.split('.')[0]!.split(' ')[0]!))]
  } else if (unknown >= topo.nodeCount) {
    const ph = topo.phases[unknown - topo.nodeCount]
    if (ph) {
      where = `${ph.supply}.${ph.phase}`
      parts = [ph.supply]
    }
  }
  return new CircuitSolveError(`the circuit has no unique solution at ${where}: look for a loop with nothing to limit its current`, parts)
}
