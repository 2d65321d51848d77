/**
 * Canvas positions for a bank document, in three bands: the supply, the main breaker and the
 * primary fuses along the top; the units in one row below them (each drawn with its H side up
 * and X side down); the output block, its meters, loads and any other meter at the bottom.
 *
 * Works for any document: parts are placed by kind, in the order the document lists them,
 * so a bank made by `buildBank` comes out in the order a person would draw it. Positions are
 * the top-left corners of node boxes in canvas pixels; `NODE_BOX` is the largest box each
 * kind is given, and no two boxes overlap. Pure: no Vue, no DOM.
 */
import type { ComponentKind } from '../circuit/schema'

export type Layout = Record<string, { x: number; y: number }>

interface LayoutPart {
  id: string
  kind: string
}
interface LayoutDocument {
  components: readonly LayoutPart[]
  wires: readonly (readonly [string, string])[]
}

/** The space each kind of node may take on the canvas, in pixels (width, height). */
export const NODE_BOX: Record<ComponentKind | 'other', { width: number; height: number }> = {
  supply: { width: 200, height: 180 },
  breaker: { width: 200, height: 180 },
  fuse: { width: 180, height: 90 },
  transformer: { width: 220, height: 200 },
  load: { width: 180, height: 90 },
  voltmeter: { width: 180, height: 90 },
  ammeter: { width: 180, height: 90 },
  'rotation-meter': { width: 200, height: 100 },
  output: { width: 200, height: 180 },
  ground: { width: 160, height: 90 },
  other: { width: 220, height: 200 },
}

/** Space between neighbouring boxes, so jumpers have room to run. */
const GAP = 60
const STEP_X = 220 + GAP
const STACK_GAP = 30
/** line meters per column beside the output block */
const METERS_PER_COLUMN = 3

const box = (kind: string) => NODE_BOX[kind as ComponentKind] ?? NODE_BOX.other
const KNOWN = new Set<string>(['supply', 'breaker', 'fuse', 'transformer', 'output', 'voltmeter', 'load', 'ground'])

export function layoutBank(doc: LayoutDocument): Layout {
  const layout: Layout = {}
  const of = (kind: string) => doc.components.filter((c) => c.kind === kind)
  const outputs = new Set(of('output').map((c) => c.id))
  const owner = (terminal: string) => terminal.slice(0, terminal.lastIndexOf('.'))

  // a meter wired to an output block reads the bank's lines; any other meter (a closing
  // check across an open corner, a probe on a winding) sits under the units
  const onOutput = (meterId: string) =>
    doc.wires.some(([a, b]) => {
      const ends = [owner(a), owner(b)]
      return ends.includes(meterId) && ends.some((id) => outputs.has(id))
    })
  const lineMeters = of('voltmeter').filter((m) => onOutput(m.id))
  const otherMeters = of('voltmeter').filter((m) => !onOutput(m.id))

  // Three bands, so the drawing stays about as tall as it is wide and reads at a useful size:
  // the supply, breaker and fuses along the top; the units in one row under them (H side up,
  // towards the fuses); the output block, its meters, loads and other meters at the bottom.
  let x = 0
  let y0 = 0
  let bandBottom = 0
  /** a column of parts stacked from the band's top; the next column starts right of it */
  const column = (parts: readonly LayoutPart[]) => {
    if (parts.length === 0) return
    let y = y0
    for (const p of parts) {
      layout[p.id] = { x, y }
      y += box(p.kind).height + STACK_GAP
    }
    bandBottom = Math.max(bandBottom, y - STACK_GAP)
    x += STEP_X
  }
  const band = () => {
    x = 0
    y0 = bandBottom + GAP
  }

  column(of('supply'))
  column(of('breaker'))
  column(of('fuse'))
  column(doc.components.filter((c) => !KNOWN.has(c.kind)))
  if (Object.keys(layout).length > 0) band()
  for (const unit of of('transformer')) column([unit])
  if (of('transformer').length > 0) band()
  column(of('output'))
  for (let i = 0; i < lineMeters.length; i += METERS_PER_COLUMN) column(lineMeters.slice(i, i + METERS_PER_COLUMN))
  const rest = [...otherMeters, ...of('load'), ...of('ground')]
  for (let i = 0; i < rest.length; i += METERS_PER_COLUMN) column(rest.slice(i, i + METERS_PER_COLUMN))
  return layout
}
