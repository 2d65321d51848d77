/**
 * What a correctly wired bank should read at each meter: the values "the ratio predicts",
 * from the nameplates, the supply voltage and the connection alone (no load, no impedance,
 * no compensation). A closing check should read 0 V. A meter that measures nothing the
 * connection names gets no expected value.
 */
import type { Circuit, Transformer } from '../circuit/schema'
import { buildTopology } from './network'
import type { SolveResult } from './types'

export interface ExpectedReading {
  volts: number
  /**
   * the angle a correct bank reads, where one follows: on the output's lines, a three-phase
   * set in the supply's rotation turned by the bank's displacement at a–b to the nearest 30°
   * step, so the a–b meter sets the reference and the others are checked against it
   */
  degrees?: number
  /** how the value follows, in a few words */
  basis: string
}

/** a reading within 5 % of the expected size (or 12 V of 0 V) and 5° of its angle matches */
export const VOLTS_TOLERANCE = 0.05
export const ANGLE_TOLERANCE_DEGREES = 5

export interface ReadingCheck {
  /** measured − expected, in volts, when the size is off */
  voltsOff: number | null
  /** measured − expected in (−180, 180], when the angle is off */
  degreesOff: number | null
}

/** How a reading compares with what a correct bank reads: by size, and by angle where one is expected. */
export function checkReading(reading: { volts: number; degrees: number }, expected: ExpectedReading): ReadingCheck {
  const tolerance = expected.volts === 0 ? VOLTS_TOLERANCE * 240 : VOLTS_TOLERANCE * expected.volts
  const voltsOff = Math.abs(reading.volts - expected.volts) > tolerance ? reading.volts - expected.volts : null
  let degreesOff: number | null = null
  // a reading near 0 V has no angle worth comparing
  if (expected.degrees !== undefined && reading.volts > VOLTS_TOLERANCE * expected.volts) {
    let d = reading.degrees - expected.degrees
    while (d <= -180) d += 360
    while (d > 180) d -= 360
    if (Math.abs(d) > ANGLE_TOLERANCE_DEGREES) degreesOff = d
  }
  return { voltsOff, degreesOff }
}

export function expectedReadings(circuit: Circuit, result: SolveResult): Record<string, ExpectedReading> {
  const topo = buildTopology(circuit)
  const node = (t: string) => topo.terminalNode.get(t)
  const out: Record<string, ExpectedReading> = {}
  const supply = circuit.components.find((c) => c.kind === 'supply')
  const units = circuit.components.filter((c): c is Transformer => c.kind === 'transformer')
  const output = circuit.components.find((c) => c.kind === 'output')

  const gaps = result.closingChecks.map((c) => [node(c.between[0]), node(c.between[1])] as const)
  const secondaryLine = supply?.kind === 'supply' && units.length ? nominalSecondaryLine(circuit, result, supply.lineVolts, units) : null

  const angles = expectedAngles(circuit, result, secondaryLine?.highLeg ?? null)
  for (const m of topo.meters) {
    const ends = [m.a, m.b]
    const pair = (x?: number, y?: number) => (ends[0] === x && ends[1] === y) || (ends[0] === y && ends[1] === x)
    if (gaps.some(([x, y]) => pair(x, y))) {
      out[m.id] = { volts: 0, basis: 'closing check: a correct delta reads near 0 V' }
      continue
    }
    if (!output || !secondaryLine) continue
    const o = (t: string) => node(`${output.id}.${t}`)
    const lines = ['a', 'b', 'c'].filter((t) => (topo.nodeTerminalCount[o(t) ?? -1] ?? 0) > 1)
    const neutralWired = (o('n') ?? -1) < 0 || (topo.nodeTerminalCount[o('n')!] ?? 0) > 1
    for (const [x, y] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) {
      if (lines.includes(x!) && lines.includes(y!) && pair(o(x!), o(y!))) out[m.id] = { volts: secondaryLine.line, ...angles?.(ends[0] === o(x!) ? [x!, y!] : [y!, x!]), basis: secondaryLine.basis }
    }
    if (!neutralWired || secondaryLine.toNeutral === null) continue
    for (const x of lines) {
      if (pair(o(x), o('n'))) {
        const v = secondaryLine.highLeg === x ? (secondaryLine.line * Math.sqrt(3)) / 2 : secondaryLine.toNeutral
        out[m.id] = { volts: v, ...angles?.(ends[0] === o(x) ? [x, 'n'] : ['n', x]), basis: secondaryLine.highLeg === x ? 'high leg: line × √3 / 2' : 'line to neutral' }
      }
    }
  }
  return out
}

type C = [number, number]
const polar = (deg: number): C => [Math.cos((deg * Math.PI) / 180), Math.sin((deg * Math.PI) / 180)]
const angleOf = (z: C) => (Math.atan2(z[1], z[0]) * 180) / Math.PI

/**
 * The angle each pair of output terminals reads on a correct bank, or null where none
 * follows (dead, no output block on a and b, a single-phase or unnamed secondary).
 */
function expectedAngles(circuit: Circuit, result: SolveResult, highLeg: string | null): ((pair: [string, string]) => { degrees?: number }) | null {
  const supply = circuit.components.find((c) => c.kind === 'supply')
  const disp = result.bank.displacementDegrees
  const kind = result.bank.secondary
  if (!result.energized || disp === null || supply?.kind !== 'supply' || !['delta', 'open-delta', 'wye', 'open-wye'].includes(kind)) return null
  const A = result.terminals[`${supply.id}.A`]
  const B = result.terminals[`${supply.id}.B`]
  if (!A || !B) return null
  const AB: C = [A.volts * Math.cos((A.degrees * Math.PI) / 180) - B.volts * Math.cos((B.degrees * Math.PI) / 180), A.volts * Math.sin((A.degrees * Math.PI) / 180) - B.volts * Math.sin((B.degrees * Math.PI) / 180)]
  const theta = angleOf(AB) + 30 * Math.round(disp / 30)
  const s = supply.rotation === 'ACB' ? -1 : 1
  // each line's potential about the middle of the set, so that V(a) − V(b) stands at theta
  const at: Record<string, C> = { a: polar(theta - s * 30), b: polar(theta - s * 150), c: polar(theta + s * 90) }
  const wye = kind === 'wye' || kind === 'open-wye'
  if (wye) at.n = [0, 0]
  else if (highLeg) {
    const [p, q] = ['a', 'b', 'c'].filter((x) => x !== highLeg).map((x) => at[x]!)
    at.n = [(p![0] + q![0]) / 2, (p![1] + q![1]) / 2]
  }
  return ([x, y]) => {
    const p = at[x]
    const q = at[y]
    if (!p || !q) return {}
    let d = angleOf([p[0] - q[0], p[1] - q[1]])
    if (d <= -180) d += 360
    return { degrees: Math.round(d * 100) / 100 }
  }
}

function nominalSecondaryLine(circuit: Circuit, result: SolveResult, supplyLineVolts: number, units: Transformer[]) {
  const u = units[0]!
  const applied = result.bank.primary === 'wye' || result.bank.primary === 'open-wye' ? supplyLineVolts / Math.sqrt(3) : supplyLineVolts
  const ratio = applied / u.primaryVolts
  const coil = u.secondaryVolts[0]!
  const composite = result.bank.coils === 'series' ? u.secondaryVolts.reduce((s, v) => s + v, 0) : coil
  const winding = composite * ratio
  switch (result.bank.secondary) {
    case 'delta':
    case 'open-delta': {
      // a centre-tapped unit makes a high-leg delta: the leg opposite it reads line × √3 / 2
      const tapped = result.bank.coils === 'series' ? highLegOf(circuit, result) : null
      return { line: winding, toNeutral: tapped ? winding / 2 : null, highLeg: tapped, basis: 'delta: line = coil voltage × ratio' }
    }
    case 'wye':
    case 'open-wye':
      return { line: winding * Math.sqrt(3), toNeutral: winding, highLeg: null, basis: 'wye: line = √3 × coil voltage × ratio' }
    case 'single-phase':
      return { line: winding, toNeutral: result.bank.coils === 'series' ? winding / 2 : null, highLeg: null, basis: 'single phase: coil voltage × ratio' }
    default:
      return null
  }
}

/**
 * The output line not adjacent to the centre-tapped (lighting) unit of a four-wire delta.
 * With the delta's last corner open, an end of the lighting unit may sit at the gap: the
 * terminal across the gap stands for it.
 */
function highLegOf(circuit: Circuit, result: SolveResult): string | null {
  const topo = buildTopology(circuit)
  const output = circuit.components.find((c) => c.kind === 'output')
  if (!output) return null
  const n = topo.terminalNode.get(`${output.id}.n`)
  if (n === undefined) return null
  for (const u of topo.units) {
    if (u.windings.length < 3) continue
    const tap = topo.terminalNode.get(`${u.id}.X2`)
    if (tap !== n || topo.terminalNode.get(`${u.id}.X3`) !== n) continue
    const ends = [topo.terminalNode.get(`${u.id}.X1`), topo.terminalNode.get(`${u.id}.X4`)]
    for (const check of result.closingChecks) {
      const [x, y] = check.between.map((t) => topo.terminalNode.get(t))
      if (ends.includes(x)) ends.push(y)
      if (ends.includes(y)) ends.push(x)
    }
    const line = ['a', 'b', 'c'].find((t) => !ends.includes(topo.terminalNode.get(`${output.id}.${t}`)))
    return line ?? null
  }
  return null
}
