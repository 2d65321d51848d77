import { readFileSync } from 'node:fs'
import { describe, expect, it } from 'vitest'
import { parseCircuit } from '#shared/circuit/parse'

// The example document of circuit-format.md, as written there.
const example = JSON.parse(readFileSync(new URL('../../examples/one-unit-series.json', import.meta.url), 'utf8'))

const doc = (components: unknown[], wires: unknown[] = []) => ({ format: 'phaseloom.circuit', version: 1, components, wires })
const unit = { id: 'T1', kind: 'transformer', kva: 10, primaryVolts: 480, secondaryVolts: [120, 120] }

describe('parseCircuit: valid documents', () => {
  it('accepts the example of circuit-format.md and fills in its defaults', () => {
    const r = parseCircuit(example)
    expect(r.ok).toBe(true)
    if (!r.ok) return
    const supply = r.circuit.components.find((c) => c.id === 'S1')
    expect(supply).toMatchObject({ kind: 'supply', rotation: 'ABC', sourceOhms: { r: 0.02, x: 0.05 } })
    const t = r.circuit.components.find((c) => c.id === 'T1')
    expect(t).toMatchObject({ impedancePercent: 3, xOverR: 1.5, compensationPercent: 0 })
    expect(r.circuit.layout).toEqual({ T1: { x: 320, y: 80 } })
  })

  it('accepts JSON text as well as an object', () => {
    expect(parseCircuit(JSON.stringify(example)).ok).toBe(true)
  })

  it('keeps fields a later version may add', () => {
    const r = parseCircuit({ ...example, notes: 'bench 4' })
    expect(r.ok && (r.circuit as Record<string, unknown>).notes).toBe('bench 4')
  })

  it('knows each kind of part and its terminals', () => {
    const r = parseCircuit(
      doc(
        [
          { id: 'S1', kind: 'supply', connection: 'wye', lineVolts: 208 },
          { id: 'CB1', kind: 'breaker', poles: 2, amps: 30 },
          { id: 'F1', kind: 'fuse', amps: 15 },
          { id: 'T1', kind: 'transformer', kva: 5, primaryVolts: 208, secondaryVolts: [24] },
          { id: 'L1', kind: 'load', ohms: { r: 4, x: -1 } },
          { id: 'M1', kind: 'voltmeter' },
          { id: 'OUT', kind: 'output' },
          { id: 'G1', kind: 'ground' },
        ],
        [['S1.N', 'G1.g'], ['S1.A', 'CB1.L1'], ['CB1.T2', 'F1.a'], ['T1.X2', 'OUT.n'], ['L1.a', 'M1.b']],
      ),
    )
    expect(r.ok).toBe(true)
  })
})

// Each row: a broken document, the JSON path the error must name, and words it must say.
const invalid: [string, unknown, string, RegExp][] = [
  ['unknown kind', doc([{ id: 'C1', kind: 'capacitor' }]), 'components[0].kind', /unknown kind/],
  ['unknown terminal', doc([unit], [['T1.X5', 'T1.X1']]), 'wires[0][0]', /unknown terminal "T1\.X5"/],
  ['a terminal of a second coil the unit does not have', doc([{ ...unit, secondaryVolts: [240] }], [['T1.X3', 'T1.X1']]), 'wires[0][0]', /has H1, H2, X1, X2$/],
  ['a wire to a part that does not exist', doc([unit], [['T1.X1', 'T9.X1']]), 'wires[0][1]', /no component "T9"/],
  ['duplicate id', doc([unit, { ...unit }]), 'components[1].id', /duplicate id "T1"/],
  ['a wire to itself', doc([unit], [['T1.X1', 'T1.X1']]), 'wires[0]', /to itself/],
  ['negative kVA', doc([{ ...unit, kva: -10 }]), 'components[0].kva', /greater than 0/],
  ['a kVA given as text', doc([{ ...unit, kva: '10' }]), 'components[0].kva', /must be a number/],
  ['three coils', doc([{ ...unit, secondaryVolts: [120, 120, 120] }]), 'components[0].secondaryVolts', /at most two/],
  ['a supply with no connection', doc([{ id: 'S1', kind: 'supply', lineVolts: 480 }]), 'components[0].connection', /"wye" or "delta"/],
  ['a four-pole breaker', doc([{ id: 'CB1', kind: 'breaker', poles: 4, amps: 20 }]), 'components[0].poles', /1, 2 or 3/],
  ['a zero-ohm load', doc([{ id: 'L1', kind: 'load', ohms: { r: 0, x: 0 } }]), 'components[0].ohms', /at least 0\.0001 Ω/],
  ['an id with a dot', doc([{ ...unit, id: 'T.1' }]), 'components[0].id', /start with a letter/],
  ['a wire that is not a pair', doc([unit], [['T1.X1']]), 'wires[0]', /pair of terminal names/],
  ['a terminal name without a dot', doc([unit], [['T1X1', 'T1.X2']]), 'wires[0][0]', /ID\.TERMINAL/],
  ['the wrong format', { ...doc([unit]), format: 'other' }, 'format', /phaseloom\.circuit/],
  ['a later version', { ...doc([unit]), version: 2 }, 'version', /version must be 1/],
  ['no components list', { format: 'phaseloom.circuit', version: 1, wires: [] }, 'components', /must be a list/],
  ['not an object', [1, 2, 3], '(document)', /JSON object/],
  ['malformed JSON text', '{"format": "phaseloom.circuit",', '(document)', /not valid JSON/],
]

describe('parseCircuit: every error names its path and says what is wrong', () => {
  it.each(invalid)('%s', (_, input, path, message) => {
    const r = parseCircuit(input)
    expect(r.ok).toBe(false)
    if (r.ok) return
    const hit = r.errors.find((e) => e.path === path)
    expect(hit, `errors were ${JSON.stringify(r.errors)}`).toBeDefined()
    expect(hit!.message).toMatch(message)
  })

  it('reports shape errors and wiring errors together', () => {
    const r = parseCircuit(doc([{ ...unit, kva: 0 }, { ...unit }], [['T1.H1', 'T1.H1'], ['T1.X1', 'T2.X1']]))
    expect(r.ok).toBe(false)
    if (r.ok) return
    expect(r.errors.map((e) => e.path).sort()).toEqual(['components[0].kva', 'components[1].id', 'wires[0]', 'wires[1][1]'].sort())
  })

  // one check per component holds the ranges of its numbers: it must still report every
  // problem of that component, a wrong type in one field beside a range in another
  it('reports a wrong type and out-of-range numbers of one component together', () => {
    const r = parseCircuit(doc([{ ...unit, id: '9T', kva: 'ten', primaryVolts: -480, secondaryVolts: [120, 0], xOverR: 500 }]))
    expect(r.ok).toBe(false)
    if (r.ok) return
    const byPath = Object.fromEntries(r.errors.map((e) => [e.path, e.message]))
    expect(byPath).toEqual({
      'components[0].id': 'id must start with a letter and hold only letters, digits, "-" or "_"',
      'components[0].kva': 'kva must be a number',
      'components[0].primaryVolts': 'primaryVolts must be greater than 0',
      'components[0].secondaryVolts[1]': 'secondaryVolts must be greater than 0',
      'components[0].xOverR': 'xOverR must be between 0 and 100',
    })
  })

  it('gives a number that is not finite its type error alone, and checks no id in a layout entry', () => {
    const r = parseCircuit(doc([{ ...unit, kva: Number.NaN, primaryVolts: Number.POSITIVE_INFINITY }]))
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.errors).toEqual([{ path: 'components[0].kva', message: 'kva must be a number' }, { path: 'components[0].primaryVolts', message: 'primaryVolts must be a number' }])
    const laid = parseCircuit({ ...doc([unit]), layout: { T1: { x: 1, y: 2, id: 'kept as it is!' } } })
    expect(laid.ok).toBe(true)
  })
})
