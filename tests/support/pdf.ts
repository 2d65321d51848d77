// Reads a PDF back with Debian's poppler-utils (installed by `npm test`, scripts/test.mjs):
// pdftotext for its text, pdftoppm to render a page to PNG.
import { execFileSync } from 'node:child_process'
import { copyFileSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'

function withFile<T>(pdf: Uint8Array, use: (file: string, dir: string) => T): T {
  const dir = mkdtempSync(join(tmpdir(), 'phaseloom-pdf-'))
  try {
    const file = join(dir, 'sheet.pdf')
    writeFileSync(file, pdf)
    return use(file, dir)
  } finally {
    rmSync(dir, { recursive: true, force: true })
  }
}

/** The PDF's text, laid out as on the page (`pdftotext -layout`), so a table row stays one line. */
export function pdfText(pdf: Uint8Array): string {
  return withFile(pdf, (file) => execFileSync('pdftotext', ['-layout', '-enc', 'UTF-8', file, '-'], { encoding: 'utf8' }))
}

/** How many pages the PDF has (pdftotext ends each page with a form feed). */
export function pdfPages(pdf: Uint8Array): number {
  return pdfText(pdf).split('\f').filter((p) => p.trim()).length
}

/** Renders page 1 at 100 dpi to PNG and copies it to `outPath`. */
export function renderFirstPage(pdf: Uint8Array, outPath: string): void {
  withFile(pdf, (file, dir) => {
    execFileSync('pdftoppm', ['-png', '-r', '100', '-f', '1', '-l', '1', '-singlefile', file, join(dir, 'page')])
    copyFileSync(join(dir, 'page.png'), outPath)
  })
}
