/**
 * Where a phasor dial puts each arrow's two-line label (name over reading): beyond the tip
 * when that spot is clear, else beside the tip, so that a label never sits on another
 * arrow, on another label or off the drawing when a better place exists. Pure geometry.
 */

export interface Point {
  x: number
  y: number
}

export interface LabelRequest {
  /** the arrow's direction, degrees counter-clockwise from 3 o'clock */
  degrees: number
  tip: Point
  name: string
  reading: string
}

export interface PlacedLabel {
  x: number
  /** baseline of the name; the reading's baseline is 12 px lower */
  nameY: number
  anchor: 'start' | 'middle' | 'end'
  box: Box
}

export interface Box {
  left: number
  right: number
  top: number
  bottom: number
}

/** rough text widths in the dial's units: 11 px Plex Sans semibold and 10.5 px Plex Mono */
const NAME_CHAR = 6.6
const READING_CHAR = 6.4
const rad = Math.PI / 180

function candidate(tip: Point, towards: number, distance: number, width: number): PlacedLabel {
  const cos = Math.cos(towards * rad)
  const sin = Math.sin(towards * rad)
  const x = tip.x + distance * cos
  const y = tip.y - distance * sin
  const anchor = cos > 0.35 ? 'start' : cos < -0.35 ? 'end' : 'middle'
  const nameY = sin < -0.35 ? y + 10 : sin > 0.35 ? y - 14 : y - 3
  const left = anchor === 'start' ? x : anchor === 'end' ? x - width : x - width / 2
  return { x, nameY, anchor, box: { left, right: left + width, top: nameY - 10, bottom: nameY + 15 } }
}

export const boxesOverlap = (a: Box, b: Box) => a.left < b.right && b.left < a.right && a.top < b.bottom && b.top < a.bottom

function crosses(box: Box, from: Point, to: Point): boolean {
  for (let i = 0; i <= 24; i++) {
    const x = from.x + ((to.x - from.x) * i) / 24
    const y = from.y + ((to.y - from.y) * i) / 24
    if (x > box.left + 1 && x < box.right - 1 && y > box.top + 1 && y < box.bottom - 1) return true
  }
  return false
}

/**
 * Labels in the order given (place the most important first), inside a `width` × `height`
 * drawing, keeping off `obstacles` (such as the grid's own angle labels) where they can.
 */
export function placePhasorLabels(centre: Point, requests: LabelRequest[], width: number, height: number, obstacles: Box[] = [], top = 28): PlacedLabel[] {
  const placed: PlacedLabel[] = []
  // [turn from the arrow's direction, distance from the tip, preference cost]
  const tries: [number, number, number][] = [[0, 12, 0], [45, 12, 0.5], [-45, 12, 0.5], [90, 10, 1], [-90, 10, 1], [0, 30, 1.5]]
  for (const r of requests) {
    const w = Math.max(r.name.length * NAME_CHAR, r.reading.length * READING_CHAR)
    let best: { label: PlacedLabel; cost: number } | undefined
    for (const [turn, distance, preference] of tries) {
      const label = candidate(r.tip, r.degrees + turn, distance, w)
      let cost = preference
      for (const other of requests) if (crosses(label.box, centre, other.tip)) cost += 3
      for (const p of placed) if (boxesOverlap(label.box, p.box)) cost += 5
      for (const o of obstacles) if (boxesOverlap(label.box, o)) cost += 2
      const b = label.box
      if (b.left < 0 || b.right > width || b.top < top || b.bottom > height) cost += 4
      if (!best || cost < best.cost) best = { label, cost }
    }
    placed.push(best!.label)
  }
  return placed
}
