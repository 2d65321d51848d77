/**
 * The pre-energization sheet as a PDF (pdf-lib, standard fonts): title, the cautions, the
 * bank drawing, the plan's figures and warnings, then the test sequence with the expected
 * reading and an empty box for the measured one at every step. The words come from
 * shared/site-check/sheet.ts, so the PDF says what the print page says.
 */
import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage } from 'pdf-lib'
import {
  CLOSING_STEP,
  LOCAL_CODE_FIRST,
  SHEET_CAUTIONS,
  SHEET_TITLE,
  STAGE_HEADINGS,
  leadsText,
  sheetSummary,
  volts,
  type BankDrawing,
  type SitePlan,
} from '#shared/site-check'

const PAGE = { width: 612, height: 792 } // US Letter
const MARGIN = 36
const INK = rgb(0.16, 0.2, 0.25)
const FAINT = rgb(0.45, 0.48, 0.52)
const CAUTION = rgb(0.6, 0.36, 0)
const DANGER = rgb(0.7, 0.1, 0.1)

// The standard fonts encode WinAnsi (Windows-1252) only: spell out the few signs of ours it
// lacks, take the base letter of an accented one it lacks (Ł → L), and put ? for anything else,
// so a name in any script still makes a PDF.
const SIGNS: Record<string, string> = { '√': 'sqrt', '∠': 'at', 'Ω': 'ohm', '≈': '~', '→': '->', '−': '-', 'Ł': 'L', 'ł': 'l', 'Đ': 'D', 'đ': 'd' }
const WIN_ANSI_EXTRA = '€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ'
const encodable = (c: string) => {
  const p = c.codePointAt(0)!
  return (p >= 0x20 && p <= 0x7e) || (p >= 0xa0 && p <= 0xff) || WIN_ANSI_EXTRA.includes(c)
}
export function safe(text: string): string {
  let out = ''
  for (const c of text) {
    if (encodable(c)) out += c
    else if (SIGNS[c]) out += SIGNS[c]
    else if (c === '\n' || c === '\t') out += ' '
    else {
      const base = c.normalize('NFD')[0] ?? ''
      out += base && base !== c && encodable(base) ? base : '?'
    }
  }
  return out
}

interface Fonts { text: PDFFont; bold: PDFFont; mono: PDFFont }

class Writer {
  page!: PDFPage
  y = 0
  pages: PDFPage[] = []
  constructor(private doc: PDFDocument, readonly fonts: Fonts, private title: string) {
    this.newPage()
  }

  newPage() {
    this.page = this.doc.addPage([PAGE.width, PAGE.height])
    this.pages.push(this.page)
    this.y = PAGE.height - MARGIN
    if (this.pages.length > 1) {
      this.text(`${this.title} (continued)`, { size: 9, color: FAINT })
      this.y -= 4
    }
  }

  need(height: number) {
    if (this.y - height < MARGIN + 24) this.newPage()
  }

  wrap(text: string, font: PDFFont, size: number, width: number): string[] {
    const lines: string[] = []
    let line = ''
    for (const word of safe(text).split(/\s+/)) {
      const next = line ? `${line} ${word}` : word
      if (font.widthOfTextAtSize(next, size) > width && line) {
        lines.push(line)
        line = word
      } else line = next
    }
    if (line) lines.push(line)
    return lines
  }

  text(text: string, o: { size?: number; font?: PDFFont; color?: ReturnType<typeof rgb>; x?: number; width?: number; gap?: number } = {}) {
    const size = o.size ?? 9.5
    const font = o.font ?? this.fonts.text
    const x = o.x ?? MARGIN
    const lines = this.wrap(text, font, size, o.width ?? PAGE.width - MARGIN - x)
    for (const line of lines) {
      this.need(size + 3)
      this.y -= size + 2
      this.page.drawText(line, { x, y: this.y, size, font, color: o.color ?? INK })
    }
    this.y -= o.gap ?? 2
  }

  heading(text: string) {
    this.need(40)
    this.y -= 8
    this.text(text, { size: 12, font: this.fonts.bold })
  }
}

function drawBankOn(w: Writer, drawing: BankDrawing) {
  const scale = (PAGE.width - 2 * MARGIN) / drawing.width
  const height = drawing.height * scale
  w.need(height + 8)
  const top = w.y
  const X = (x: number) => MARGIN + x * scale
  const Y = (y: number) => top - y * scale
  for (const b of drawing.boxes) w.page.drawRectangle({ x: X(b.x), y: Y(b.y + b.h), width: b.w * scale, height: b.h * scale, borderColor: INK, borderWidth: 0.8, color: rgb(1, 1, 1) })
  for (const l of drawing.lines) {
    w.page.drawLine({ start: { x: X(l.x1), y: Y(l.y1) }, end: { x: X(l.x2), y: Y(l.y2) }, thickness: (l.weight ?? 0.7) * scale, color: INK, dashArray: l.dashed ? [3, 2] : undefined })
  }
  for (const d of drawing.dots) w.page.drawCircle({ x: X(d.x), y: Y(d.y), size: 1.8 * scale, color: INK })
  for (const t of drawing.texts) {
    const font = t.bold ? w.fonts.bold : w.fonts.text
    const size = t.size * scale
    const text = safe(t.text)
    const width = font.widthOfTextAtSize(text, size)
    const x = t.anchor === 'middle' ? X(t.x) - width / 2 : t.anchor === 'end' ? X(t.x) - width : X(t.x)
    w.page.drawText(text, { x, y: Y(t.y), size, font, color: INK })
  }
  w.y = top - height - 6
}

function sequence(w: Writer, plan: SitePlan) {
  const cols = { step: MARGIN, label: MARGIN + 26, leads: MARGIN + 236, expected: MARGIN + 356, measured: MARGIN + 440 }
  const header = () => {
    w.need(20)
    w.y -= 12
    const f = w.fonts.bold
    w.page.drawText('Step', { x: cols.step, y: w.y, size: 8.5, font: f, color: INK })
    w.page.drawText('Test point', { x: cols.label, y: w.y, size: 8.5, font: f, color: INK })
    w.page.drawText('Meter leads', { x: cols.leads, y: w.y, size: 8.5, font: f, color: INK })
    w.page.drawText('Expected', { x: cols.expected, y: w.y, size: 8.5, font: f, color: INK })
    w.page.drawText('Measured', { x: cols.measured, y: w.y, size: 8.5, font: f, color: INK })
    w.y -= 4
    w.page.drawLine({ start: { x: MARGIN, y: w.y }, end: { x: PAGE.width - MARGIN, y: w.y }, thickness: 0.6, color: INK })
  }
  let stage: string | null = null
  for (const p of plan.testPoints) {
    if (p.stage !== stage) {
      stage = p.stage
      if (stage === 'complete' && plan.testPoints.some((t) => t.kind === 'closing-check')) {
        w.y -= 4
        w.text('De-energize, lock out and verify absence of voltage; close the corner; re-energize.', { font: w.fonts.bold, size: 9 })
      }
      w.y -= 4
      w.text(STAGE_HEADINGS[p.stage], { font: w.fonts.bold, size: 10 })
      header()
    }
    if (p.kind === 'closing-check') {
      w.y -= 2
      w.text(CLOSING_STEP, { size: 8.5, color: DANGER })
    }
    const labelLines = w.wrap(p.label, w.fonts.text, 8.5, cols.leads - cols.label - 6)
    const noteLines = p.note ? w.wrap(p.note, w.fonts.text, 7.5, cols.measured - cols.label - 10) : []
    const rowHeight = Math.max(18, labelLines.length * 10.5 + 6) + noteLines.length * 9
    w.need(rowHeight + 2)
    const top = w.y
    const base = top - 12
    w.page.drawText(String(p.step), { x: cols.step, y: base, size: 9, font: w.fonts.bold, color: INK })
    labelLines.forEach((line, i) => w.page.drawText(line, { x: cols.label, y: base - i * 10.5, size: 8.5, font: w.fonts.text, color: INK }))
    w.page.drawText(safe(leadsText(p)), { x: cols.leads, y: base, size: 8, font: w.fonts.mono, color: INK })
    w.page.drawText(volts(p.expectedVolts), { x: cols.expected, y: base, size: 9.5, font: w.fonts.mono, color: INK })
    w.page.drawRectangle({ x: cols.measured, y: base - 5, width: PAGE.width - MARGIN - cols.measured, height: 15, borderColor: INK, borderWidth: 0.6 })
    noteLines.forEach((line, i) => w.page.drawText(line, { x: cols.label, y: base - labelLines.length * 10.5 - i * 9, size: 7.5, font: w.fonts.text, color: FAINT }))
    w.y = top - rowHeight
    w.page.drawLine({ start: { x: MARGIN, y: w.y + 2 }, end: { x: PAGE.width - MARGIN, y: w.y + 2 }, thickness: 0.3, color: FAINT })
  }
}

export async function siteCheckPdf(plan: SitePlan, meta: { preparedBy?: string; date?: Date } = {}): Promise<Uint8Array> {
  const doc = await PDFDocument.create()
  const title = `Phaseloom Site check: ${plan.input.name}`
  doc.setTitle(`${SHEET_TITLE}: ${plan.input.name}`)
  doc.setSubject('Site check pre-energization sheet')
  doc.setCreator('Phaseloom')
  doc.setProducer('Phaseloom (pdf-lib)')
  const fonts: Fonts = {
    text: await doc.embedFont(StandardFonts.Helvetica),
    bold: await doc.embedFont(StandardFonts.HelveticaBold),
    mono: await doc.embedFont(StandardFonts.Courier),
  }
  const w = new Writer(doc, fonts, title)
  w.text(`${SHEET_TITLE}`, { size: 18, font: fonts.bold, gap: 0 })
  w.text(title, { size: 11, font: fonts.bold })
  w.text(`${meta.preparedBy ? `Prepared by ${meta.preparedBy}, ` : ''}${(meta.date ?? new Date()).toISOString().slice(0, 10)}. Site: ______________________   Electrician: ______________________`, { size: 8.5, color: FAINT, gap: 6 })
  w.text(`DANGER: ${LOCAL_CODE_FIRST}`, { size: 11, font: fonts.bold, color: DANGER })
  for (const c of SHEET_CAUTIONS) w.text(`- ${c}`, { size: 8.5, x: MARGIN + 6 })

  w.heading('The bank')
  drawBankOn(w, plan.drawing)
  for (const [label, value] of sheetSummary(plan)) {
    const lines = w.wrap(value, fonts.text, 8.5, PAGE.width - 2 * MARGIN - 180)
    w.need(lines.length * 10.5 + 2)
    w.page.drawText(safe(label), { x: MARGIN, y: w.y - 10.5, size: 8.5, font: fonts.bold, color: INK })
    lines.forEach((line, i) => w.page.drawText(line, { x: MARGIN + 180, y: w.y - 10.5 * (i + 1), size: 8.5, font: fonts.text, color: INK }))
    w.y -= lines.length * 10.5 + 2
  }

  if (plan.warnings.length) {
    w.heading('Warnings')
    for (const warning of plan.warnings) {
      const tag = warning.severity === 'danger' ? 'DANGER' : 'CAUTION'
      w.text(`${tag}: ${warning.message}${warning.rule ? ` (${warning.rule})` : ''}`, { size: 8.5, color: warning.severity === 'danger' ? DANGER : CAUTION })
    }
  }

  w.heading('Test sequence')
  w.text('Read each point with a meter rated for the circuit; write the reading in the Measured column. A reading far from the expected one: stop, de-energize and find out why before going on.', { size: 8.5 })
  sequence(w, plan)

  w.y -= 8
  w.text(`${LOCAL_CODE_FIRST} Real banks can kill: this sheet plans the work, it does not make it safe.`, { size: 9, font: fonts.bold, color: DANGER })

  w.pages.forEach((page, i) => {
    page.drawText(safe(`${LOCAL_CODE_FIRST}  Phaseloom Site check, page ${i + 1} of ${w.pages.length}`), { x: MARGIN, y: MARGIN - 12, size: 7.5, font: fonts.text, color: FAINT })
  })
  return doc.save()
}
