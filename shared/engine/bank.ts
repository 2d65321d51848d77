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
// worked out once per topology (kept on it), however many times the protection study solves it
interface BankCache {
  coilModes: Map<Unit, UnitCoilMode>
  edges?: { primary: BankEdge[]; secondary: BankEdge[] }
}

function cacheOf(topo: Topology): BankCache {
  return (topo.bankCache ??= { coilModes: new Map() }) as BankCache
}

export function unitCoilMode(topo: Topology, unit: Unit): UnitCoilMode {
  const modes = cacheOf(topo).coilModes
  let mode = modes.get(unit)
  if (!mode) modes.set(unit, (mode = readCoilMode(topo, unit)))
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
  const m = edges.length
  /** the merged node at each end: 2i the dotted end of edge i, 2i + 1 the other */
  const end: number[] = new Array<number>(2 * m)
  const byNode = new Map<number, number[]>()
  for (let i = 0; i < m; i++) {
    const e = edges[i]!
    end[2 * i] = merge(e.from)
    end[2 * i + 1] = merge(e.to)
    for (let s = 0; s < 2; s++) {
      const n = end[2 * i + s]!
      const list = byNode.get(n)
      if (list) list.push(i)
      else byNode.set(n, [i])
    }
  }
  const seen: boolean[] = new Array<boolean>(m).fill(false)
  const groups: BankEdge[][] = []
  const stack: number[] = []
  for (let i = 0; i < m; i++) {
    if (seen[i]) continue
    const group: BankEdge[] = []
    stack.push(i)
    seen[i] = true
    while (stack.length) {
      const k = stack.pop()!
      group.push(edges[k]!)
      for (let s = 0; s < 2; s++) {
        const list = byNode.get(end[2 * k + s]!)!
        for (let q = 0; q < list.length; q++) {
          const j = list[q]!
          if (!seen[j]) {
            seen[j] = true
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
  const cache = cacheOf(topo)
  let edges = cache.edges
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
    cache.edges = edges
  }
  const { primary: primaryEdges, secondary: secEdges } = edges
  return {
    primary: { edges: primaryEdges, groups: groupEdges(primaryEdges, merge) },
    secondary: { edges: secEdges, groups: groupEdges(secEdges, merge) },
  }
}

/** The terminals on ground itself (a wye supply's N, a ground part's g, whatever is wired to them). */
function groundLabels(topo: Topology): string[] {
  return (topo.groundLabels ??= topo.terminalNames.filter((_, k) => topo.terminalNodes[k]! < 0))
}

/**
 * What the terminals at a node say it is: a neutral (an output's n, a supply's N), a line (an
 * output's a–c, a supply's A–C), grounded (a ground part, or ground itself).
 */
export function nodeRoles(topo: Topology, node: number): { neutral: boolean; line: boolean; grounded: boolean } {
  let neutral = false
  let line = false
  let grounded = node < 0
  for (const label of node < 0 ? groundLabels(topo) : topo.nodeLabels[node]!) {
    const dot = label.indexOf('.')
    const id = dot < 0 ? label : label.slice(0, dot)
    const t = dot < 0 ? undefined : label.slice(dot + 1) // ids hold no dot
    const kind = topo.byId.get(id)?.kind
    if (kind === 'output') (t === 'n' ? (neutral = true) : (line = true))
    if (kind === 'supply') (t === 'N' ? (neutral = true) : (line = true))
    if (kind === 'ground') grounded = true
  }
  return { neutral, line, grounded }
}

export function classifyGroup(topo: Topology, group: BankEdge[], merge: (n: number) => number): Connection {
  // a winding with both ends on one node is shorted out: no connection the trade names
  for (const e of group) if (merge(e.from) === merge(e.to)) return 'other'
  if (group.length === 1) return 'single-phase'
  if (group.length !== 2 && group.length !== 3) return 'other'
  // the (at most six) merged nodes of the group: degree, the ends meeting there, one raw node
  const nodes: number[] = []
  const degree: number[] = []
  const dots: number[] = []
  const rawNode: number[] = []
  for (const e of group) {
    for (let s = 0; s < 2; s++) {
      const n = s === 0 ? e.from : e.to
      const m = merge(n)
      let k = nodes.indexOf(m)
      if (k < 0) {
        k = nodes.length
        nodes.push(m)
        degree.push(0)
        dots.push(0)
        rawNode.push(n)
      }
      degree[k]!++
      if (s === 0) dots[k]!++
      rawNode[k] = n
    }
  }
  const count = (d: number) => degree.reduce((c, x) => c + (x === d ? 1 : 0), 0)
  // every end meeting there is alike: all dotted, or all undotted
  const alike = (k: number) => dots[k] === 0 || dots[k] === degree[k]
  const starLike = (k: number) => {
    const roles = nodeRoles(topo, rawNode[k]!)
    if (roles.neutral || roles.grounded) return true
    if (roles.line) return false
    return alike(k)
  }
  /**
   * The middle of two units: a line brought out makes it a corner of an open delta, a neutral
   * brought out a star point; a ground alone says neither (a corner-grounded open delta grounds
   * a line), so the ends meeting there decide, as they would for an ungrounded one.
   */
  const openCentreIsStar = (k: number) => {
    const roles = nodeRoles(topo, rawNode[k]!)
    if (roles.line) return false
    if (roles.neutral) return true
    return alike(k)
  }
  const size = nodes.length
  if (group.length === 2) {
    const centre = degree.indexOf(2)
    // two units across the same pair of nodes are in parallel: not a three-phase connection
    if (size !== 3 || centre < 0) return 'other'
    return openCentreIsStar(centre) ? 'open-wye' : 'open-delta'
  }
  if (size === 3 && count(2) === 3) return 'delta'
  const centre = degree.indexOf(3)
  if (size === 4 && count(1) === 3 && count(3) === 1 && centre >= 0) return starLike(centre) ? 'wye' : 'other'
  if (size === 4 && count(1) === 2 && count(2) === 2) return 'delta' // a delta with one corner open
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
    if (group.length !== 3 || group[0]!.unit === group[1]!.unit || group[0]!.unit === group[2]!.unit || group[1]!.unit === group[2]!.unit) continue
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

/** The merged node every edge of a group meets at (a wye's star point), or null. */
export function starOf(group: BankEdge[], merge: (n: number) => number): number | null {
  const degree = new Map<number, number>()
  for (const e of group) for (const n of [merge(e.from), merge(e.to)]) degree.set(n, (degree.get(n) ?? 0) + 1)
  for (const [node, d] of degree) if (d === group.length) return node
  return null
}

/** Whether a group of three edges closes a ring (a closed delta). */
export function isClosedRing(group: BankEdge[], merge: (n: number) => number): boolean {
  const degree = new Map<number, number>()
  for (const e of group) for (const n of [merge(e.from), merge(e.to)]) degree.set(n, (degree.get(n) ?? 0) + 1)
  return degree.size === 3 && [...degree.values()].every((d) => d === 2)
}
