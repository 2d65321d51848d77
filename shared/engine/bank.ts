/**
 * What the wiring is, read from the wiring alone: the primary and secondary connection of
 * the bank, how each unit's coils are joined, and the loops and open corners of the
 * secondary that the closing check is about.
 */
import type { Topology, Unit } from './network'

export type Connection = 'delta' | 'wye' | 'open-delta' | 'open-wye' | 'single-phase' | 'other'
export type CoilMode = 'series' | 'parallel' | 'single' | 'mixed'
type UnitCoilMode = 'series' | 'parallel' | 'antiparallel' | 'single' | 'other'

/** One unit's winding, or its two coils joined, as a single edge between two nodes. */
export interface BankEdge {
  unit: string
  /** the dotted end (H1 or X1, or X3 when the coils are joined X4–X1) and the other */
  fromTerminal: string
  toTerminal: string
  from: number
  to: number
  /** the windings this edge is made of, as indices into the unit's windings */
  windings: number[]
}

export interface SideGraph {
  edges: BankEdge[]
  /** connected groups of edges */
  groups: BankEdge[][]
}

/** A three-unit chain (a delta with one corner open) or a three-unit ring (a closed delta). */
export interface DeltaLoop {
  closed: boolean
  /** edges in order around the loop, each with the direction it is traversed (+1: dot to undot) */
  path: { edge: BankEdge; sign: 1 | -1 }[]
  /** for an open corner: the two terminals either side of the gap */
  gap?: [string, string]
}

/** Nodes joined through closed breakers and intact fuses count as one for the bank's shape. */
export function contactMerge(topo: Topology, open: ReadonlySet<string>): (node: number) => number {
  const parent = new Array<number>(topo.nodeCount + 1)
  for (let i = 0; i <= topo.nodeCount; i++) parent[i] = i
  const key = (n: number) => (n < 0 ? topo.nodeCount : n)
  const find = (x: number): number => {
    while (parent[x] !== x) {
      parent[x] = parent[parent[x]!]!
      x = parent[x]!
    }
    return x
  }
  for (const p of topo.poles) {
    if (open.has(p.device)) continue
    const a = find(key(p.a))
    const b = find(key(p.b))
    if (a !== b) parent[a] = b
  }
  return (n) => find(key(n))
}

function isUsed(topo: Topology, unit: Unit, terminal: string): boolean {
  const node = unit.node[terminal]!
  if (node < 0) return true
  return topo.nodeLabels[node]!.some((label) => {
    if (label === `${unit.id}.${terminal}`) return false
    const kind = topo.byId.get(label.split('.')[0]!)?.kind
    return kind !== 'voltmeter'
  })
}

// how each unit's coils are joined, and the edges of each side, depend on the wiring alone:
// worked out once per topology, however many times the protection study solves it
const coilModes = new WeakMap<Topology, Map<string, UnitCoilMode>>()
const edgeCache = new WeakMap<Topology, { primary: BankEdge[]; secondary: BankEdge[] }>()

export function unitCoilMode(topo: Topology, unit: Unit): UnitCoilMode {
  let modes = coilModes.get(topo)
  if (!modes) coilModes.set(topo, (modes = new Map()))
  let mode = modes.get(unit.id)
  if (!mode) modes.set(unit.id, (mode = readCoilMode(topo, unit)))
  return mode
}

function readCoilMode(topo: Topology, unit: Unit): UnitCoilMode {
  if (unit.windings.length < 3) return 'single'
  const n = (t: string) => unit.node[t]!
  const same = (a: string, b: string) => n(a) === n(b)
  if (same('X1', 'X3') && same('X2', 'X4')) return same('X1', 'X2') ? 'other' : 'parallel'
  if (same('X1', 'X4') && same('X2', 'X3')) return 'antiparallel'
  if (same('X2', 'X3') && !same('X1', 'X4')) return 'series'
  if (same('X4', 'X1') && !same('X3', 'X2')) return 'series'
  const firstUsed = isUsed(topo, unit, 'X1') || isUsed(topo, unit, 'X2')
  const secondUsed = isUsed(topo, unit, 'X3') || isUsed(topo, unit, 'X4')
  if (firstUsed !== secondUsed) return 'single'
  return 'other'
}

function secondaryEdges(topo: Topology, unit: Unit): BankEdge[] {
  const node = (t: string) => unit.node[t]!
  const edge = (fromTerminal: string, toTerminal: string, windings: number[]): BankEdge => ({
    unit: unit.id,
    fromTerminal: `${unit.id}.${fromTerminal}`,
    toTerminal: `${unit.id}.${toTerminal}`,
    from: node(fromTerminal),
    to: node(toTerminal),
    windings,
  })
  if (unit.windings.length < 3) return [edge('X1', 'X2', [1])]
  switch (unitCoilMode(topo, unit)) {
    case 'series':
      return node('X2') === node('X3') ? [edge('X1', 'X4', [1, 2])] : [edge('X3', 'X2', [2, 1])]
    case 'parallel':
    case 'antiparallel':
      return [edge('X1', 'X2', [1])]
    case 'single':
      return isUsed(topo, unit, 'X1') || isUsed(topo, unit, 'X2') ? [edge('X1', 'X2', [1])] : [edge('X3', 'X4', [2])]
    default:
      return [edge('X1', 'X2', [1]), edge('X3', 'X4', [2])]
  }
}

function groupEdges(edges: BankEdge[], merge: (n: number) => number): BankEdge[][] {
  const byNode = new Map<number, number[]>()
  edges.forEach((e, i) => {
    for (const n of [merge(e.from), merge(e.to)]) {
      const list = byNode.get(n) ?? []
      list.push(i)
      byNode.set(n, list)
    }
  })
  const seen = new Uint8Array(edges.length)
  const groups: BankEdge[][] = []
  for (let i = 0; i < edges.length; i++) {
    if (seen[i]) continue
    const group: BankEdge[] = []
    const stack = [i]
    seen[i] = 1
    while (stack.length) {
      const k = stack.pop()!
      const e = edges[k]!
      group.push(e)
      for (const n of [merge(e.from), merge(e.to)]) {
        for (const j of byNode.get(n)!) {
          if (!seen[j]) {
            seen[j] = 1
            stack.push(j)
          }
        }
      }
    }
    groups.push(group)
  }
  return groups
}

export function sideGraphs(topo: Topology, merge: (n: number) => number): { primary: SideGraph; secondary: SideGraph } {
  let edges = edgeCache.get(topo)
  if (!edges) {
    edges = {
      primary: topo.units.map((u) => ({
        unit: u.id,
        fromTerminal: `${u.id}.H1`,
        toTerminal: `${u.id}.H2`,
        from: u.windings[0]!.a,
        to: u.windings[0]!.b,
        windings: [0],
      })),
      secondary: topo.units.flatMap((u) => secondaryEdges(topo, u)),
    }
    edgeCache.set(topo, edges)
  }
  const { primary: primaryEdges, secondary: secEdges } = edges
  return {
    primary: { edges: primaryEdges, groups: groupEdges(primaryEdges, merge) },
    secondary: { edges: secEdges, groups: groupEdges(secEdges, merge) },
  }
}

function nodeRoles(topo: Topology, node: number): { neutral: boolean; line: boolean } {
  if (node < 0) return { neutral: true, line: false }
  let neutral = false
  let line = false
  for (const label of topo.nodeLabels[node]!) {
    const [id, t] = label.split('.')
    const kind = topo.byId.get(id!)?.kind
    if (kind === 'output') (t === 'n' ? (neutral = true) : (line = true))
    if (kind === 'supply') (t === 'N' ? (neutral = true) : (line = true))
    if (kind === 'ground') neutral = true
  }
  return { neutral, line }
}

export function classifyGroup(topo: Topology, group: BankEdge[], merge: (n: number) => number): Connection {
  // a winding with both ends on one node is shorted out: no connection the trade names
  if (group.some((e) => merge(e.from) === merge(e.to))) return 'other'
  if (group.length === 1) return 'single-phase'
  const degree = new Map<number, number>()
  const ends = new Map<number, ('dot' | 'undot')[]>()
  const rawNode = new Map<number, number>()
  for (const e of group) {
    for (const [n, end] of [[e.from, 'dot'], [e.to, 'undot']] as const) {
      const m = merge(n)
      degree.set(m, (degree.get(m) ?? 0) + 1)
      ends.set(m, [...(ends.get(m) ?? []), end])
      rawNode.set(m, n)
    }
  }
  const degrees = [...degree.values()].sort()
  const starLike = (centre: number) => {
    const roles = nodeRoles(topo, rawNode.get(centre)!)
    if (roles.neutral) return true
    if (roles.line) return false
    const e = ends.get(centre)!
    return e.every((x) => x === e[0])
  }
  if (group.length === 2) {
    const centre = [...degree].find(([, d]) => d === 2)?.[0]
    // two units across the same pair of nodes are in parallel: not a three-phase connection
    if (degree.size !== 3 || centre === undefined) return 'other'
    return starLike(centre) ? 'open-wye' : 'open-delta'
  }
  if (group.length === 3) {
    if (degree.size === 3 && degrees.every((d) => d === 2)) return 'delta'
    const centre = [...degree].find(([, d]) => d === 3)?.[0]
    if (degree.size === 4 && degrees.join() === '1,1,1,3' && centre !== undefined) return starLike(centre) ? 'wye' : 'other'
    if (degree.size === 4 && degrees.join() === '1,1,2,2') return 'delta' // a delta with one corner open
  }
  return 'other'
}

export function classifySide(topo: Topology, graph: SideGraph, merge: (n: number) => number): Connection {
  if (graph.groups.length === 0) return 'other'
  const kinds = new Set(graph.groups.map((g) => classifyGroup(topo, g, merge)))
  return kinds.size === 1 ? [...kinds][0]! : 'other'
}

export function classifyCoils(topo: Topology): CoilMode {
  if (topo.units.length === 0) return 'single'
  const modes = new Set(topo.units.map((u) => unitCoilMode(topo, u)))
  if (modes.size !== 1) return 'mixed'
  const mode = [...modes][0]!
  return mode === 'series' || mode === 'parallel' || mode === 'single' ? mode : 'mixed'
}

/** Three-unit chains and rings of the secondary: the deltas a closing check applies to. */
export function deltaLoops(graph: SideGraph, merge: (n: number) => number): DeltaLoop[] {
  const loops: DeltaLoop[] = []
  for (const group of graph.groups) {
    if (group.length !== 3 || new Set(group.map((e) => e.unit)).size !== 3) continue
    const degree = new Map<number, number>()
    for (const e of group) for (const n of [merge(e.from), merge(e.to)]) degree.set(n, (degree.get(n) ?? 0) + 1)
    const values = [...degree.values()]
    const closed = degree.size === 3 && values.every((d) => d === 2)
    const open = degree.size === 4 && values.filter((d) => d === 1).length === 2 && values.filter((d) => d === 2).length === 2
    if (!closed && !open) continue
    // walk the loop from an end (open) or from the first edge's dotted end (closed)
    let at = closed ? merge(group[0]!.from) : [...degree].find(([, d]) => d === 1)![0]
    const start = at
    const left = [...group]
    const path: DeltaLoop['path'] = []
    while (left.length) {
      const i = left.findIndex((e) => merge(e.from) === at || merge(e.to) === at)
      if (i < 0) break
      const e = left.splice(i, 1)[0]!
      const sign = merge(e.from) === at ? 1 : -1
      path.push({ edge: e, sign })
      at = sign === 1 ? merge(e.to) : merge(e.from)
    }
    if (path.length !== 3) continue
    const loop: DeltaLoop = { closed, path }
    if (!closed) {
      const first = path[0]!
      const last = path[2]!
      const startTerminal = first.sign === 1 ? first.edge.fromTerminal : first.edge.toTerminal
      const endTerminal = last.sign === 1 ? last.edge.toTerminal : last.edge.fromTerminal
      if (start === at) continue
      loop.gap = [startTerminal, endTerminal]
    }
    loops.push(loop)
  }
  return loops
}
