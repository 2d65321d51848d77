// The pre-energization sheet's PDF read back with pdftotext: every test point's expected
// reading is on the row of its meter leads, with the closing-check step and the cautions.
import { describe, expect, it } from 'vitest'
import { CLOSING_STEP, LOCAL_CODE_FIRST, SHEET_CAUTIONS, exampleSiteCheck, planSiteCheck, SiteCheckInputSchema, volts } from '#shared/site-check'
import { safe, siteCheckPdf } from '../../server/services/site-check-pdf'
import { pdfPages, pdfText } from '../support/pdf'

const oneLine = (text: string) => text.replace(/\s+/g, ' ')

describe.each([
  ['a high-leg delta with a larger lighting unit (the form’s example)', exampleSiteCheck()],
  [
    'an open delta',
    SiteCheckInputSchema.parse({
      name: 'Pump house open delta',
      supply: { lineVolts: 480, connection: 'delta' },
      connection: 'open-delta',
      units: [0, 1].map(() => ({ kva: 15, primaryVolts: 480, secondaryVolts: [120, 120] })),
      loads: { threePhaseKva: 20, powerFactor: 0.85 },
    }),
  ],
  [
    'a wye–wye on an ungrounded supply',
    SiteCheckInputSchema.parse({
      name: 'Old service wye–wye',
      supply: { lineVolts: 480, connection: 'wye', grounded: false },
      connection: 'wye-wye',
      units: [0, 1, 2].map(() => ({ kva: 10, primaryVolts: 277, secondaryVolts: [120] })),
    }),
  ],
])('the PDF of %s', (_, input) => {
  const plan = planSiteCheck(input)
  let text = ''
  it('is a PDF', async () => {
    const pdf = await siteCheckPdf(plan, { preparedBy: 'Hollis Baptiste', date: new Date('2026-12-01T12:00:00Z') })
    expect(Buffer.from(pdf.slice(0, 5)).toString()).toBe('%PDF-')
    expect(pdfPages(pdf)).toBeGreaterThanOrEqual(1)
    text = pdfText(pdf)
  })
  it('has every expected reading on the row of its meter leads', () => {
    const lines = text.split('\n')
    for (const p of plan.testPoints) {
      const row = lines.find((l) => l.includes(`${p.leads[0]} to ${p.leads[1]}`) && new RegExp(`(^|\\s)${p.step}\\s`).test(l))
      expect(row, `step ${p.step} ${p.label}`).toBeDefined()
      expect(row).toContain(volts(p.expectedVolts))
    }
  })
  it('has the closing-check step where the bank has a delta secondary, and the cautions', () => {
    const flat = oneLine(text)
    if (plan.testPoints.some((p) => p.kind === 'closing-check')) expect(flat).toContain(oneLine(CLOSING_STEP).slice(0, 60))
    expect(flat).toContain(LOCAL_CODE_FIRST)
    for (const c of SHEET_CAUTIONS) expect(flat).toContain(oneLine(c).slice(0, 40))
    expect(flat).toContain('Measured')
    expect(flat).toContain('NEC 450.3(B)')
  })
  it('names the warnings and the high leg’s rules where they apply', () => {
    const flat = oneLine(text)
    for (const w of plan.warnings) expect(flat).toContain(oneLine(w.message).slice(0, 30).replace(/[√∠Ω≈→−]/g, ''))
    if (input.connection === 'high-leg-delta') {
      expect(flat).toContain('NEC 110.15')
      expect(flat).toContain('NEC 408.3(E)')
    }
  })
})

describe('text outside the standard fonts’ WinAnsi set', () => {
  it.each([
    ['Łódź', 'Lodz'.replace('o', 'ó')],
    ['北京 bank', '?? bank'],
    ['a\u0000b', 'a?b'],
    ['√3 × 120 V ∠ 30°', 'sqrt3 × 120 V at 30°'],
  ])('%s is written as %s', (text, written) => {
    expect(safe(text)).toBe(written)
  })
  it('a site check named in another script still makes a PDF with every reading', async () => {
    const plan = planSiteCheck({ ...exampleSiteCheck(), name: 'Łódź 北京 warsztat' })
    const text = pdfText(await siteCheckPdf(plan))
    expect(text).toContain('Lódz')
    for (const p of plan.testPoints) expect(text).toContain(`${p.leads[0]} to ${p.leads[1]}`)
  })
})
