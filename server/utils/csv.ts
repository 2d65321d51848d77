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
