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
  /** how the value follows, in a few words */
  basis: string
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

  for (const m of topo.meters) {
    const ends = [m.a, m.b]
    const pair = (x?: number, y?: number) => (ends[0] === x && ends[1] === y) || (ends[0] === y && ends[1] === x)
    if (gaps.some(([x, y]) => pair(x, y))) {
      out[m.id] = { volts: 0, basis: 'closing check: a correct delta reads near 0 V' }
      continue
    }
    if (!output || !secondaryLine) continue
    const o = (t: string) => node(`${output.id}.${t}`)
    const lines = ['a', 'b', 'c'].filter((t) => (topo.nodeLabels[o(t) ?? -1]?.length ?? 0) > 1)
    const neutralWired = (o('n') ?? -1) < 0 || (topo.nodeLabels[o('n')!]?.length ?? 0) > 1
    for (const [x, y] of [['a', 'b'], ['b', 'c'], ['c', 'a']]) {
      if (lines.includes(x!) && lines.includes(y!) && pair(o(x!), o(y!))) out[m.id] = { volts: secondaryLine.line, basis: secondaryLine.basis }
    }
    if (!neutralWired || secondaryLine.toNeutral === null) continue
    for (const x of lines) {
      if (pair(o(x), o('n'))) {
        const v = secondaryLine.highLeg === x ? (secondaryLine.line * Math.sqrt(3)) / 2 : secondaryLine.toNeutral
        out[m.id] = { volts: v, basis: secondaryLine.highLeg === x ? 'high leg: line × √3 / 2' : 'line to neutral' }
      }
    }
  }
  return out
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
      const tapped = result.bank.coils === 'series' ? highLegOf(circuit) : null
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

/** The output line not adjacent to the centre-tapped (lighting) unit of a four-wire delta. */
function highLegOf(circuit: Circuit): string | null {
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
    const line = ['a', 'b', 'c'].find((t) => !ends.includes(topo.terminalNode.get(`${output.id}.${t}`)))
    return line ?? null
  }
  return null
}
