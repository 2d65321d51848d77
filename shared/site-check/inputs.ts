/**
 * What a Site check is asked: the supply, each unit's nameplate, the connection and the
 * loads. One zod schema for the form on /site-check and for the server routes.
 */
import { z } from 'zod'

export const SITE_CONNECTIONS = ['closed-delta', 'open-delta', 'delta-wye', 'wye-delta', 'wye-wye', 'high-leg-delta'] as const
export type SiteConnection = (typeof SITE_CONNECTIONS)[number]

export const CONNECTION_LABELS: Record<SiteConnection, string> = {
  'closed-delta': 'Closed delta (delta–delta)',
  'open-delta': 'Open delta (two units)',
  'delta-wye': 'Delta–wye',
  'wye-delta': 'Wye–delta',
  'wye-wye': 'Wye–wye',
  'high-leg-delta': 'High-leg delta 240/120 V (four-wire)',
}

/** Units a connection takes: two for open delta, three otherwise. */
export const unitsFor = (connection: SiteConnection) => (connection === 'open-delta' ? 2 : 3)

/** NEC Table 450.3(B) covers transformers of 1000 V and less, and so does the Site check. */
export const MAX_VOLTS = 1000

const positive = (what: string, min: number, max: number) =>
  z
    .number({ error: `${what} must be a number` })
    .positive({ error: `${what} must be greater than 0` })
    .min(min, { error: `${what} must be at least ${min}` })
    .max(max, { error: `${what} must be at most ${max}` })

export const SiteUnitSchema = z.object({
  kva: positive('kVA', 0.5, 2500),
  primaryVolts: positive('primary volts', 100, MAX_VOLTS),
  secondaryVolts: z
    .array(positive('coil volts', 12, MAX_VOLTS), { error: 'coil volts must be a list' })
    .min(1, { error: 'a unit has one or two secondary coils' })
    .max(2, { error: 'a unit has one or two secondary coils' }),
  impedancePercent: z
    .number({ error: 'percent impedance must be a number' })
    .min(0.5, { error: 'percent impedance must be at least 0.5' })
    .max(20, { error: 'percent impedance must be at most 20' })
    .default(3),
})

export const SiteCheckInputSchema = z
  .object({
    name: z.string({ error: 'name is required' }).trim().min(1, { error: 'give the site check a name' }).max(120, { error: 'name is too long (120 characters at most)' }),
    supply: z.object({
      lineVolts: z
        .number({ error: 'supply volts must be a number' })
        .min(100, { error: 'supply volts must be at least 100' })
        .max(MAX_VOLTS, { error: `the Site check covers banks of ${MAX_VOLTS} V and less (NEC Table 450.3(B))` }),
      connection: z.enum(['wye', 'delta'], { error: 'supply must be wye or delta' }),
      /** for a wye supply: whether its neutral is grounded and brought to the bank */
      grounded: z.boolean({ error: 'grounded must be true or false' }).default(true),
      hz: z.union([z.literal(50), z.literal(60)], { error: 'hz must be 50 or 60' }).default(60),
    }),
    connection: z.enum(SITE_CONNECTIONS, { error: `connection must be one of ${SITE_CONNECTIONS.join(', ')}` }),
    /** how the two coils of each unit are joined */
    coils: z.enum(['series', 'parallel'], { error: 'coils must be series or parallel' }).default('series'),
    units: z.array(SiteUnitSchema, { error: 'units must be a list' }).min(2, { error: 'a bank has two or three units' }).max(3, { error: 'a bank has two or three units' }),
    loads: z
      .object({
        threePhaseKva: z.number({ error: 'three-phase kVA must be a number' }).min(0, { error: 'three-phase kVA cannot be negative' }).max(10_000, { error: 'three-phase kVA must be at most 10000' }).default(0),
        powerFactor: z.number({ error: 'power factor must be a number' }).min(0.5, { error: 'power factor must be between 0.5 and 1' }).max(1, { error: 'power factor must be between 0.5 and 1' }).default(0.9),
        lightingKva: z.number({ error: 'lighting kVA must be a number' }).min(0, { error: 'lighting kVA cannot be negative' }).max(10_000, { error: 'lighting kVA must be at most 10000' }).default(0),
      })
      .default({ threePhaseKva: 0, powerFactor: 0.9, lightingKva: 0 }),
  })
  .superRefine((input, ctx) => {
    const count = unitsFor(input.connection)
    if (input.units.length !== count) {
      ctx.addIssue({ code: 'custom', path: ['units'], message: `a ${CONNECTION_LABELS[input.connection].toLowerCase()} bank takes ${count} units, got ${input.units.length}` })
    }
    if (input.connection === 'high-leg-delta') {
      const lighting = input.units[2]
      if (lighting && lighting.secondaryVolts.length !== 2) {
        ctx.addIssue({ code: 'custom', path: ['units', 2, 'secondaryVolts'], message: 'the lighting unit (T3) of a high-leg delta needs two coils, centre-tapped for the neutral' })
      }
      if (input.coils !== 'series') ctx.addIssue({ code: 'custom', path: ['coils'], message: 'a high-leg delta has its coils in series (the centre tap is the neutral)' })
    } else if (input.loads.lightingKva > 0) {
      ctx.addIssue({ code: 'custom', path: ['loads', 'lightingKva'], message: 'single-phase lighting load is for a high-leg delta; put other load in the three-phase kVA' })
    }
  })

export type SiteCheckInput = z.output<typeof SiteCheckInputSchema>
export type SiteCheckInputRaw = z.input<typeof SiteCheckInputSchema>
export type SiteUnit = z.output<typeof SiteUnitSchema>

/** A 25 kVA unit, 480 V primary, 120/240 V secondary: the form's starting point. */
export const EXAMPLE_UNIT: SiteUnit = { kva: 25, primaryVolts: 480, secondaryVolts: [120, 120], impedancePercent: 3 }

/** The form's starting values: a high-leg delta for lighting and motors, with a larger lighting unit. */
export function exampleSiteCheck(): SiteCheckInput {
  return {
    name: 'Riverbend workshop: high-leg delta',
    supply: { lineVolts: 480, connection: 'delta', grounded: true, hz: 60 },
    connection: 'high-leg-delta',
    coils: 'series',
    units: [{ ...EXAMPLE_UNIT }, { ...EXAMPLE_UNIT }, { ...EXAMPLE_UNIT, kva: 50, impedancePercent: 2.5 }],
    loads: { threePhaseKva: 40, powerFactor: 0.85, lightingKva: 20 },
  }
}

/** Who may use the Site check (product.md: the practitioner; instructors plan lab banks with it too). */
export const SITE_CHECK_ROLES = ['practitioner', 'instructor'] as const

/** A saved Site check: its bank document is the Bench document plus the inputs, under this key. */
export const SITE_CHECK_KEY = 'siteCheck'
