/**
 * The phasors a diagram of the bank draws, read from a solve result: the primary line
 * voltages at the first supply, the secondary line voltages at the first output block and,
 * when its n is wired, each line to n. Voltages between two terminals are the difference of
 * their readings to ground, taken as complex numbers. Pure: no Vue.
 */
import type { Circuit } from './circuit/schema'
import type { Reading, SolveResult } from './engine/types'
import { bankVerdict } from './bank-words'

export type PhaseLetter = 'A' | 'B' | 'C'

export interface Phasor {
  /** "A–B" on the primary, "a–b" or "b–n" on the secondary */
  name: string
  from: string
  to: string
  volts: number
  /** in (−180, 180] */
  degrees: number
  /** the phase whose colour it takes: the first of its two letters */
  phase: PhaseLetter
  /** line to line, or line to n */
  between: 'lines' | 'line-neutral'
  /** the line of a four-wire delta that stands at about √3 × the others above n */
  highLeg: boolean
}

export interface PhasorView {
  energized: boolean
  primary: Phasor[]
  secondary: Phasor[]
  displacementDegrees: number | null
  clock: number | null
  /** IEC 60076-1 vector group such as "Dyn1", where both sides are a delta or a wye; else null */
  vectorGroup: string | null
  /** for wiring that is no proper connection: what is wrong, in one line (then no clock, no vector group) */
  notValid: string | null
}

const LINE_PAIRS = [['a', 'b'], ['b', 'c'], ['c', 'a']] as const

/** An angle to one decimal, `30.0°` or `−30.0°` (a true minus sign). */
export function formatAngle(degrees: number): string {
  const d = Math.abs(degrees) < 0.05 ? 0 : degrees
  return d < 0 ? `−${(-d).toFixed(1)}°` : `${d.toFixed(1)}°`
}

/** A reading as a meter shows it: `239.8 V ∠ 30.0°`. */
export function formatReading(r: Reading): string {
  return `${r.volts.toFixed(1)} V ∠ ${formatAngle(r.degrees)}`
}

/** V(from) − V(to) from two readings to ground. */
export function difference(from: Reading, to: Reading): Reading {
  const rad = Math.PI / 180
  const re = from.volts * Math.cos(from.degrees * rad) - to.volts * Math.cos(to.degrees * rad)
  const im = from.volts * Math.sin(from.degrees * rad) - to.volts * Math.sin(to.degrees * rad)
  const volts = Math.hypot(re, im)
  if (volts < 1e-6) return { volts: 0, degrees: 0 }
  let degrees = Math.atan2(im, re) / rad
  if (degrees <= -180) degrees += 360
  return { volts, degrees }
}

/** A terminal is wired when a jumper joins it to anything but a voltmeter. */
function wiredTerminals(doc: Circuit): Set<string> {
  const kind = new Map(doc.components.map((c) => [c.id, c.kind]))
  const owner = (t: string) => kind.get(t.slice(0, t.lastIndexOf('.')))
  const wired = new Set<string>()
  for (const [a, b] of doc.wires) {
    if (owner(b) !== 'voltmeter') wired.add(a)
    if (owner(a) !== 'voltmeter') wired.add(b)
  }
  return wired
}

const IEC_LETTER: Partial<Record<string, string>> = { delta: 'D', wye: 'Y' }

export function phasorView(result: SolveResult | null, doc: Circuit): PhasorView {
  const empty: PhasorView = { energized: false, primary: [], secondary: [], displacementDegrees: null, clock: null, vectorGroup: null, notValid: null }
  if (!result || !result.energized) return empty
  const at = (t: string) => result.terminals[t]
  const phasor = (name: string, from: string, to: string, phase: PhaseLetter, between: Phasor['between']): Phasor | null => {
    const a = at(from)
    const b = at(to)
    if (!a || !b) return null
    return { name, from, to, ...difference(a, b), phase, between, highLeg: false }
  }
  const present = (p: Phasor | null): p is Phasor => p !== null

  const supply = doc.components.find((c) => c.kind === 'supply')
  const primary = supply
    ? LINE_PAIRS.map(([x, y]) => {
        const [X, Y] = [x.toUpperCase(), y.toUpperCase()]
        return phasor(`${X}–${Y}`, `${supply.id}.${X}`, `${supply.id}.${Y}`, X as PhaseLetter, 'lines')
      }).filter(present)
    : []

  const output = doc.components.find((c) => c.kind === 'output')
  const wired = wiredTerminals(doc)
  const secondary: Phasor[] = []
  let neutralWired = false
  if (output) {
    const on = (t: string) => wired.has(`${output.id}.${t}`)
    const phaseOf = (x: string) => x.toUpperCase() as PhaseLetter
    for (const [x, y] of LINE_PAIRS) {
      if (on(x) && on(y)) {
        const p = phasor(`${x}–${y}`, `${output.id}.${x}`, `${output.id}.${y}`, phaseOf(x), 'lines')
        if (p) secondary.push(p)
      }
    }
    neutralWired = on('n')
    if (neutralWired) {
      const toNeutral = (['a', 'b', 'c'] as const)
        .filter(on)
        .map((x) => phasor(`${x}–n`, `${output.id}.${x}`, `${output.id}.n`, phaseOf(x), 'line-neutral'))
        .filter(present)
      // a four-wire delta: one line stands well above the other two (√3 × in a high-leg bank)
      if (result.bank.secondary === 'delta' || result.bank.secondary === 'open-delta') {
        const sorted = [...toNeutral].sort((p, q) => q.volts - p.volts)
        if (sorted.length === 3 && sorted[0]!.volts > 1.5 * sorted[1]!.volts) sorted[0]!.highLeg = true
      }
      secondary.push(...toNeutral)
    }
  }

  const verdict = bankVerdict(result)
  // a faulted bank has a measured displacement at a–b but no vector group: say what is wrong instead
  if (!verdict.valid) return { energized: true, primary, secondary, displacementDegrees: null, clock: null, vectorGroup: null, notValid: verdict.headline }
  const { primary: primaryKind, secondary: secondaryKind, clock, displacementDegrees } = result.bank
  const hv = IEC_LETTER[primaryKind]
  const lv = IEC_LETTER[secondaryKind]?.toLowerCase()
  // IEC 60076-1: "n" after the low-voltage letter when the star point is brought out
  const n = lv === 'y' && neutralWired ? 'n' : ''
  const vectorGroup = hv && lv && clock !== null ? `${hv}${lv}${n}${clock}` : null

  return { energized: true, primary, secondary, displacementDegrees, clock, vectorGroup, notValid: null }
}
