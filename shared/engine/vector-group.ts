/**
 * The vector group as a nameplate gives it (IEC 60076-1 clause 6 and annex D; IEEE C57.12.70
 * for the angular displacement): the higher-voltage side first in capitals (D, Y, or YN where
 * its neutral is brought out), the lower-voltage side in lower case (d, y, yn), then the clock
 * number: the lag of the lower-voltage side behind the higher in 30° steps, for the standard
 * sequence. On an ACB supply the measured displacement is the mirror image of the same wiring's
 * on ABC, so it is mirrored back; a step-up bank (secondary above primary) reads from its
 * secondary, which turns the clock round.
 */
import { nodeRoles, starOf, type Connection, type SideGraph } from './bank'
import type { Topology } from './network'

/** The letter of one side, or null when the connection has none. */
function sideLetter(topo: Topology, graph: SideGraph, merge: (n: number) => number, connection: Connection): string | null {
  if (connection === 'delta' || connection === 'open-delta') return 'D'
  if (connection === 'single-phase') return 'I' // IEC 60076-1: a single-phase winding
  if (connection !== 'wye' && connection !== 'open-wye') return null
  // the star point: the node every edge of a group meets at
  const neutralOut = graph.groups.some((group) => {
    const centre = starOf(group, merge)
    if (centre === null) return false
    if (centre === merge(-1)) return true
    const raw = group.map((e) => (merge(e.from) === centre ? e.from : e.to))[0]!
    const roles = nodeRoles(topo, raw)
    return roles.neutral || roles.grounded
  })
  return neutralOut ? 'YN' : 'Y'
}

export interface VectorGroup {
  clock: number
  vectorGroup: string
}

/**
 * @param displacementDegrees angle(V(out.a − out.b)) − angle(V(S.A − S.B)) as measured
 */
export function vectorGroupOf(
  topo: Topology,
  graphs: { primary: SideGraph; secondary: SideGraph },
  merge: (n: number) => number,
  connections: { primary: Connection; secondary: Connection },
  displacementDegrees: number,
  rotation: 'ABC' | 'ACB',
): VectorGroup | null {
  const primary = sideLetter(topo, graphs.primary, merge, connections.primary)
  const secondary = sideLetter(topo, graphs.secondary, merge, connections.secondary)
  if (!primary || !secondary || (primary === 'I') !== (secondary === 'I')) return null
  const unit = topo.units[0]
  if (!unit) return null
  const secondaryVolts = unit.spec.secondaryVolts.reduce((s, v) => s + v, 0)
  const stepUp = secondaryVolts > unit.spec.primaryVolts
  // the standard sequence: a lag on ABC is a lead on ACB
  const standard = rotation === 'ACB' ? -displacementDegrees : displacementDegrees
  // the lower-voltage side's lag behind the higher-voltage side's
  const lag = stepUp ? standard : -standard
  const clock = ((Math.round(lag / 30) % 12) + 12) % 12 || 0
  const [high, low] = stepUp ? [secondary, primary] : [primary, secondary]
  return { clock, vectorGroup: `${high}${low.toLowerCase()}${clock}` }
}
