/**
 * A Site check's inputs as circuit documents, all made by `buildBank`:
 * - `benchDocument`: what opens on the Bench — main breaker open, primary fuses by NEC
 *   450.3(B) (primary only), a delta secondary left open at one corner with the closing-check
 *   voltmeter MC across it, meters on every line pair, no load;
 * - the documents the plan solves: the same bank with no protection, open and closed, with
 *   one unit reversed (what a wrong closing check reads), and under the stated loads.
 */
import { buildBank, type BankSpec, type PrimaryConnection, type SecondaryConnection } from '../banks/build'
import { layoutBank } from '../banks/layout'
import type { CircuitInput } from '../circuit/schema'
import { bankKva, fullLoadAmps, primaryOnlyProtection, STANDARD_AMPS, type BankConnection } from '../engine/ratings'
import type { SiteCheckInput, SiteConnection } from './inputs'

const SIDES: Record<SiteConnection, { primary: PrimaryConnection; secondary: SecondaryConnection }> = {
  'closed-delta': { primary: 'delta', secondary: 'delta' },
  'open-delta': { primary: 'open-delta', secondary: 'open-delta' },
  'delta-wye': { primary: 'delta', secondary: 'wye' },
  'wye-delta': { primary: 'wye', secondary: 'delta' },
  'wye-wye': { primary: 'wye', secondary: 'wye' },
  'high-leg-delta': { primary: 'delta', secondary: 'high-leg' },
}

export const ratingConnection = (connection: SiteConnection): BankConnection =>
  connection === 'open-delta' ? 'open-delta' : SIDES[connection].primary === 'wye' ? 'wye' : 'delta'

export const hasDeltaSecondary = (connection: SiteConnection) => ['closed-delta', 'wye-delta', 'high-leg-delta'].includes(connection)
export const hasNeutral = (connection: SiteConnection) => ['delta-wye', 'wye-wye', 'high-leg-delta'].includes(connection)
export const hasWyePrimary = (connection: SiteConnection) => SIDES[connection].primary === 'wye'

/**
 * The neutral reaches the bank only from a grounded wye supply; an ungrounded wye supply
 * feeds the bank like a delta (three lines, no neutral), so a wye primary's star point floats.
 */
export const neutralAtBank = (input: SiteCheckInput) => input.supply.connection === 'wye' && input.supply.grounded

/** Three-phase loads on the output, one per line pair (delta connected), by stated kVA and pf at `lineVolts`. */
export function threePhaseLoadOhms(kva: number, powerFactor: number, lineVolts: number) {
  const z = (lineVolts * lineVolts) / ((kva * 1000) / 3)
  return { r: z * powerFactor, x: z * Math.sqrt(Math.max(0, 1 - powerFactor * powerFactor)) }
}

/** Lighting load of a high-leg bank: half on a–n and half on c–n, resistive, at `neutralVolts`. */
export function lightingOhms(kva: number, neutralVolts: number) {
  return (neutralVolts * neutralVolts) / ((kva * 1000) / 2)
}

function spec(input: SiteCheckInput, extra: Partial<BankSpec> = {}): BankSpec {
  return {
    name: input.name,
    supply: { connection: neutralAtBank(input) ? 'wye' : 'delta', lineVolts: input.supply.lineVolts, hz: input.supply.hz },
    units: input.units.map((u) => ({ kva: u.kva, primaryVolts: u.primaryVolts, secondaryVolts: [...u.secondaryVolts], impedancePercent: u.impedancePercent })),
    ...SIDES[input.connection],
    coils: input.coils,
    ...extra,
  }
}

/** Primary fuses by NEC Table 450.3(B), primary protection only, for the bank's rating. */
export function benchFuseAmps(input: SiteCheckInput): number {
  const kva = bankKva(ratingConnection(input.connection), input.units.map((u) => u.kva))
  return primaryOnlyProtection(fullLoadAmps(kva, input.supply.lineVolts)).maxDeviceAmps ?? STANDARD_AMPS.at(-1)!
}

/** The bank as it opens on the Bench: de-energized, fused, the delta's last corner open with MC across it. */
export function benchDocument(input: SiteCheckInput): CircuitInput {
  const fuseAmps = benchFuseAmps(input)
  const breakerAmps = STANDARD_AMPS.find((a) => a > fuseAmps) ?? fuseAmps
  const doc = buildBank(spec(input, { fuseAmps, breaker: { amps: breakerAmps, closed: false }, openCorner: hasDeltaSecondary(input.connection) }))
  return { ...doc, layout: layoutBank(doc) }
}

/** The bare bank (no breaker, no fuses), energized, no load; `open` leaves the delta corner open with MC across it. */
export function noLoadDocument(input: SiteCheckInput, options: { open?: boolean; reversed?: string[] } = {}): CircuitInput {
  return buildBank(spec(input, { openCorner: options.open && hasDeltaSecondary(input.connection), reversed: options.reversed }))
}

/**
 * The bank under the stated loads. Fuses far above any load current (6000 A, the largest
 * NEC 240.6(A) size) stand in the primary lines as ammeters: the result's devices give the
 * primary line currents, and nothing operates.
 */
/** Loads below this are none at all (a load of a few VA on a bank is lost in its magnetising current). */
const NEGLIGIBLE_KVA = 0.01

export function loadedDocument(input: SiteCheckInput, lineVolts: number, neutralVolts: number | null): CircuitInput {
  const { powerFactor } = input.loads
  const threePhaseKva = input.loads.threePhaseKva >= NEGLIGIBLE_KVA ? input.loads.threePhaseKva : 0
  const lightingKva = input.loads.lightingKva >= NEGLIGIBLE_KVA ? input.loads.lightingKva : 0
  return buildBank(
    spec(input, {
      fuseAmps: 6000,
      load: threePhaseKva > 0 ? { ohms: threePhaseLoadOhms(threePhaseKva, powerFactor, lineVolts), connection: 'delta' } : undefined,
      lightingOhms: lightingKva > 0 && neutralVolts ? lightingOhms(lightingKva, neutralVolts) : undefined,
    }),
  )
}
