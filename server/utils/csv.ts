import type { H3Event } from 'h3'
import { z } from 'zod'

/**
 * RFC 4180 text from a header and rows. A cell starting with = + - @ (or a tab or return) is
 * prefixed with ' so that a spreadsheet does not run it as a formula.
 */
export function csvText(header: readonly string[], rows: readonly (readonly unknown[])[]): string {
  const cell = (v: unknown) => {
    let text = v === null || v === undefined ? '' : String(v)
    if (/^[=+\-@\t\r]/.test(text)) text = `'${text}`
    return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text
  }
  return [header, ...rows].map(r => r.map(cell).join(',')).join('\r\n') + '\r\n'
}

/** The `?format=json|csv` query of a route that also offers a spreadsheet. */
export const FormatQuerySchema = z.object({ format: z.enum(['json', 'csv'], { error: 'format is json or csv' }).default('json') })

/** Answers CSV text as a download named `filename`. */
export function sendCsv(event: H3Event, filename: string, csv: string): string {
  setResponseHeader(event, 'Content-Type', 'text/csv; charset=utf-8')
  setResponseHeader(event, 'Content-Disposition', `attachment; filename="${filename}"`)
  return csv
}
