/**
 * The bank drawing of the pre-energization sheet, as plain primitives (lines, boxes, dots,
 * text) in a fixed box, so the print page draws it as SVG and the PDF draws the same thing.
 * Read from a circuit document's wiring: supply lines A B C (N) along the top, the units in a
 * row, the output lines a b c (n) along the bottom; every unit terminal runs to the line it is
 * wired to, terminals joined only to each other (the series jumper X2–X3, a floating star)
 * get a jumper of their own, and a closing-check voltmeter is drawn dashed across the open
 * corner. Pure: no Vue, no DOM.
 */
import type { CircuitInput } from '../circuit/schema'

export interface DrawLine { x1: number; y1: number; x2: number; y2: number; dashed?: boolean; weight?: number }
export interface DrawText { x: number; y: number; text: string; size: number; anchor?: 'start' | 'middle' | 'end'; bold?: boolean }
export interface BankDrawing {
  width: number
  height: number
  lines: DrawLine[]
  boxes: { x: number; y: number; w: number; h: number }[]
  dots: { x: number; y: number }[]
  texts: DrawText[]
}

const WIDTH = 540
const LEFT = 46
const RIGHT = WIDTH - 10
const TOP_BUS = 24
const BUS_STEP = 13
const UNIT_TOP = 112
const UNIT_H = 46
const BOTTOM_BUS = 236

function unionFind(wires: readonly (readonly [string, string])[]) {
  const parent = new Map<string, string>()
  const find = (t: string): string => {
    let p = parent.get(t) ?? t
    if (p !== t) {
      p = find(p)
      parent.set(t, p)
    }
    return p
  }
  for (const [a, b] of wires) {
    const ra = find(a)
    const rb = find(b)
    if (ra !== rb) parent.set(ra, rb)
  }
  return find
}

export function drawBank(doc: CircuitInput, options: { highLeg?: string; supplyLabel?: string; outputLabel?: string } = {}): BankDrawing {
  const find = unionFind(doc.wires)
  const d: BankDrawing = { width: WIDTH, height: BOTTOM_BUS + 4 * BUS_STEP + 10, lines: [], boxes: [], dots: [], texts: [] }
  const supply = doc.components.find((c) => c.kind === 'supply')
  const output = doc.components.find((c) => c.kind === 'output')
  const units = doc.components.filter((c) => c.kind === 'transformer')
  const hasTerminal = (t: string) => doc.wires.some(([a, b]) => a === t || b === t)

  // the buses, each with the node it stands for
  const buses: { node: string; y: number; label: string }[] = []
  const topNames = ['A', 'B', 'C', 'N'].filter((p) => supply && hasTerminal(`${supply.id}.${p}`))
  topNames.forEach((p, i) => buses.push({ node: find(`${supply!.id}.${p}`), y: TOP_BUS + i * BUS_STEP, label: p }))
  const bottomNames = ['a', 'b', 'c', 'n'].filter((p) => output && doc.wires.some(([a, b]) => [a, b].includes(`${output.id}.${p}`) && ![a, b].every((t) => t.startsWith(`${output.id}.`) || /^M[abc]/.test(t))))
  bottomNames.forEach((p, i) => buses.push({ node: find(`${output!.id}.${p}`), y: BOTTOM_BUS + i * BUS_STEP, label: p === options.highLeg ? `${p} high leg` : p }))
  for (const b of buses) {
    d.lines.push({ x1: LEFT, y1: b.y, x2: RIGHT, y2: b.y, weight: 1.2 })
    d.texts.push({ x: LEFT - 6, y: b.y + 3, text: b.label.split(' ')[0]!, size: 9, anchor: 'end', bold: true })
    if (b.label.includes('high leg')) d.texts.push({ x: RIGHT, y: b.y - 3, text: 'high leg: mark orange (NEC 110.15)', size: 6.5, anchor: 'end' })
  }
  if (options.supplyLabel && topNames.length) d.texts.push({ x: LEFT, y: TOP_BUS - 10, text: options.supplyLabel, size: 7.5 })
  if (options.outputLabel && bottomNames.length) d.texts.push({ x: LEFT, y: d.height - 2, text: options.outputLabel, size: 7.5 })
  const busOf = (node: string) => buses.find((b) => b.node === node)

  // units and their terminals
  const slot = (RIGHT - LEFT) / Math.max(units.length, 1)
  const unitW = Math.min(140, slot - 24)
  const where = new Map<string, { x: number; y: number }>()
  units.forEach((u, i) => {
    if (u.kind !== 'transformer') return
    const x = LEFT + i * slot + (slot - unitW) / 2
    d.boxes.push({ x, y: UNIT_TOP, w: unitW, h: UNIT_H })
    d.texts.push({ x: x + unitW / 2, y: UNIT_TOP + 19, text: `${u.id}  ${u.kva} kVA`, size: 8.5, anchor: 'middle', bold: true })
    d.texts.push({ x: x + unitW / 2, y: UNIT_TOP + 31, text: `${u.primaryVolts} V : ${u.secondaryVolts.join('/')} V`, size: 7, anchor: 'middle' })
    const hs = ['H1', 'H2']
    const xs = u.secondaryVolts.length === 2 ? ['X1', 'X2', 'X3', 'X4'] : ['X1', 'X2']
    hs.forEach((t, k) => where.set(`${u.id}.${t}`, { x: x + (unitW * (k + 1)) / 3, y: UNIT_TOP }))
    xs.forEach((t, k) => where.set(`${u.id}.${t}`, { x: x + (unitW * (k + 1)) / (xs.length + 1), y: UNIT_TOP + UNIT_H }))
    for (const t of [...hs, ...xs]) {
      const p = where.get(`${u.id}.${t}`)!
      d.texts.push({ x: p.x, y: t.startsWith('H') ? p.y + 9 : p.y - 3, text: t, size: 6.5, anchor: 'middle' })
    }
  })

  // each terminal to its bus; terminals joined only among themselves get a jumper lane
  const groups = new Map<string, string[]>()
  let lanesAbove = 0
  let lanesBelow = 0
  for (const [terminal, p] of where) {
    const node = find(terminal)
    const bus = busOf(node)
    if (bus) {
      d.lines.push({ x1: p.x, y1: p.y, x2: p.x, y2: bus.y })
      d.dots.push({ x: p.x, y: bus.y })
    } else if (hasTerminal(terminal)) groups.set(node, [...(groups.get(node) ?? []), terminal])
  }
  const meters = doc.components.filter((c) => c.kind === 'voltmeter')
  for (const [node, terminals] of groups) {
    const points = terminals.map((t) => where.get(t)!)
    const above = points[0]!.y === UNIT_TOP
    if (points.length > 1) {
      const y = above ? UNIT_TOP - 12 - 6 * lanesAbove++ : UNIT_TOP + UNIT_H + 10 + 6 * lanesBelow++
      const xs = points.map((p) => p.x)
      for (const p of points) d.lines.push({ x1: p.x, y1: p.y, x2: p.x, y2: y })
      d.lines.push({ x1: Math.min(...xs), y1: y, x2: Math.max(...xs), y2: y })
    }
    // a meter across a gap: the closing check, dashed, to the terminal or line on its other side
    for (const m of meters) {
      const [ea, eb] = [find(`${m.id}.a`), find(`${m.id}.b`)]
      if (ea !== node && eb !== node) continue
      const other = ea === node ? eb : ea
      const from = points[0]!
      const bus = busOf(other)
      const y = bus ? bus.y : UNIT_TOP + UNIT_H + 30
      d.lines.push({ x1: from.x, y1: from.y, x2: from.x, y2: y, dashed: true })
      d.texts.push({ x: from.x - 4, y: UNIT_TOP + UNIT_H + 34, text: `open corner: closing check (${m.id})`, size: 6.5, anchor: 'end' })
    }
  }
  return d
}
