/**
 * A larger network for the benchmark and for property tests: units / 3 three-unit banks
 * fed from one 480 V delta supply, each bank behind its own closed 3-pole breaker and primary
 * fuses, with a voltmeter on every output line pair and a load well inside its rating.
 *
 * The banks cycle through three connections so that the network is not one bank repeated:
 * - delta–delta 480 → 240 V, coils in series, delta (line-to-line) loads at 0.9 power factor;
 * - delta–wye 480 → 208Y/120, coils in parallel, wye loads (resistive);
 * - delta–wye 480 → 416Y/240, coils in series, wye loads at 0.8 power factor,
 * and through unit sizes, percent impedances and load levels. Fuses and breakers are sized
 * from the bank's full-load primary current (125 %, rounded up to an NEC 240.6(A) rating),
 * and no load exceeds 80 % of the bank, so nothing operates and no hazard is raised.
 *
 * The supply's source impedance is the format's default per phase divided by the number of
 * banks: a service sized to the load it feeds, so the supply voltage sags about 1 % at any size.
 *
 * Pure: no Node imports, the same in the browser, on the server and in tests.
 */
import type { CircuitInput, ComponentInput } from '../circuit/schema'
import { CIRCUIT_FORMAT, CIRCUIT_VERSION } from '../circuit/schema'
import { fullLoadAmps, nextStandardUp } from '../engine/ratings'
import { buildBank, type BankSpec } from './build'

const SUPPLY_VOLTS = 480
const DEFAULT_SOURCE = { r: 0.02, x: 0.05 }
const UNIT_KVA = [25, 10, 15, 37.5, 50]
const IMPEDANCE_PERCENT = [3, 2.5, 3.5, 4]
/** share of the bank's kVA that the load draws */
const LOAD_SHARE = [0.7, 0.5, 0.6, 0.8]

interface BankKind {
  secondary: 'delta' | 'wye'
  coils: 'series' | 'parallel'
  /** line-to-line output voltage */
  lineVolts: number
  load: 'delta' | 'wye'
  powerFactor: number
}

const KINDS: BankKind[] = [
  { secondary: 'delta', coils: 'series', lineVolts: 240, load: 'delta', powerFactor: 0.9 },
  { secondary: 'wye', coils: 'parallel', lineVolts: 120 * Math.sqrt(3), load: 'wye', powerFactor: 1 },
  { secondary: 'wye', coils: 'series', lineVolts: 240 * Math.sqrt(3), load: 'wye', powerFactor: 0.8 },
]

/** The specification of bank number `index` (0-based) of a generated network. */
export function networkBankSpec(index: number): BankSpec {
  const kind = KINDS[index % KINDS.length]!
  const kva = UNIT_KVA[index % UNIT_KVA.length]!
  const impedancePercent = IMPEDANCE_PERCENT[index % IMPEDANCE_PERCENT.length]!
  const share = LOAD_SHARE[index % LOAD_SHARE.length]!
  const primaryAmps = fullLoadAmps(3 * kva, SUPPLY_VOLTS)
  const fuseAmps = nextStandardUp(Math.max(15, 1.25 * primaryAmps))!
  const breakerAmps = nextStandardUp(fuseAmps + 1)!
  // each of the three loads takes a third of the bank's share, at its own voltage
  const loadVolts = kind.load === 'delta' ? kind.lineVolts : kind.lineVolts / Math.sqrt(3)
  const z = (loadVolts * loadVolts) / (share * kva * 1000)
  const pf = kind.powerFactor
  const ohms = pf === 1 ? z : { r: z * pf, x: z * Math.sqrt(1 - pf * pf) }
  return {
    supply: { connection: 'delta', lineVolts: SUPPLY_VOLTS },
    units: { kva, primaryVolts: 480, secondaryVolts: [120, 120], impedancePercent },
    primary: 'delta',
    secondary: kind.secondary,
    coils: kind.coils,
    // alternate the 30° shift of the delta–wye banks: lagging (Dyn1) and leading (Dyn11)
    ...(kind.secondary === 'wye' && { shift: Math.floor(index / KINDS.length) % 2 === 0 ? 'lag' : 'lead' }),
    fuseAmps,
    breaker: { amps: breakerAmps, closed: true },
    load: { ohms, connection: kind.load },
  }
}

/**
 * A circuit document of `units` / 3 banks on one supply S1. Component ids are the bank's
 * own (buildBank's T1, F1, CB1, Mab, ...) prefixed with the bank number: B1-T1, B12-Mab.
 */
export function generateNetwork(units: number): CircuitInput {
  if (!Number.isInteger(units) || units < 3 || units % 3 !== 0) throw new Error(`units must be a positive multiple of 3, got ${units}`)
  const banks = units / 3
  const components: ComponentInput[] = [
    {
      id: 'S1',
      kind: 'supply',
      connection: 'delta',
      lineVolts: SUPPLY_VOLTS,
      hz: 60,
      sourceOhms: { r: DEFAULT_SOURCE.r / banks, x: DEFAULT_SOURCE.x / banks },
    },
  ]
  const wires: [string, string][] = []
  for (let b = 0; b < banks; b++) {
    const prefix = `B${b + 1}-`
    const doc = buildBank(networkBankSpec(b))
    // the bank's own supply becomes the shared S1; everything else gets the prefix
    const rename = (terminal: string) => {
      const dot = terminal.lastIndexOf('.')
      const id = terminal.slice(0, dot)
      return id === 'S1' ? terminal : `${prefix}${terminal}`
    }
    for (const c of doc.components) if (c.kind !== 'supply') components.push({ ...c, id: `${prefix}${c.id}` })
    for (const [from, to] of doc.wires) wires.push([rename(from), rename(to)])
  }
  return {
    format: CIRCUIT_FORMAT,
    version: CIRCUIT_VERSION,
    name: `Generated network: ${units} units in ${banks} bank${banks === 1 ? '' : 's'} on one 480 V supply`,
    components,
    wires,
  }
}
