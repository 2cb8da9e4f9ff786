/**
 * Fonts for the PDF. DejaVu Sans (Debian fonts-dejavu-core) has the glyphs the report uses (Ω, µ, ε,
 * ×, —); PDFKit's built-in Helvetica has only WinAnsi, so without DejaVu those characters are spelled
 * out in ASCII instead of printing as garbage.
 */
import { existsSync } from 'node:fs';
import { join } from 'node:path';

export const DEJAVU_DIR = '/usr/share/fonts/truetype/dejavu';

export interface PdfFonts {
  regular: string;
  bold: string;
  /** True when the fonts cover Unicode (DejaVu); false for the built-in Helvetica fallback. */
  unicode: boolean;
  /** Font files to register, name -> path (empty for the built-in fonts). */
  files: Record<string, string>;
}

export function choosePdfFonts(dir: string = DEJAVU_DIR): PdfFonts {
  const regular = join(dir, 'DejaVuSans.ttf');
  const bold = join(dir, 'DejaVuSans-Bold.ttf');
  if (existsSync(regular) && existsSync(bold)) {
    return { regular: 'Body', bold: 'Body-Bold', unicode: true, files: { Body: regular, 'Body-Bold': bold } };
  }
  return { regular: 'Helvetica', bold: 'Helvetica-Bold', unicode: false, files: {} };
}

const ASCII_FOR: Record<string, string> = {
  'Ω': 'ohm', 'µ': 'u', 'ε': 'eps_', '×': 'x', '—': '-', '–': '-', '·': '|', '−': '-', '≥': '>=', '≤': '<=', '…': '...',
};

/** Text safe for a WinAnsi font: the report's few non-ASCII symbols spelled out. */
export function toWinAnsi(text: string): string {
  return text.replace(/[Ωµε×—–·−≥≤…]/g, (c) => ASCII_FOR[c] ?? '?');
}
