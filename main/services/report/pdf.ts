/**
 * The report as a PDF (pdfkit): A4 pages, vector charts (ECharts SVG drawn by svg-to-pdfkit), table
 * headers repeated on every page a table runs onto, and "page N of M" with the report's fingerprint
 * line in every footer.
 */
import PDFDocument from 'pdfkit';
import type { EChartsOption } from 'echarts';
import SVGtoPDF from 'svg-to-pdfkit';
import type { ReportBlock, ReportDocument, ReportTable } from '../../../core/report/document.js';
import type { Status } from '../../../core/budget/results.js';
import { STATUS_COLOR } from '../../../core/charts/style.js';
import { ChartDrawings } from './chart-drawings.js';
import { choosePdfFonts, toWinAnsi, type PdfFonts } from './fonts.js';

const PAGE = { size: 'A4' as const, margin: { top: 56, bottom: 56, left: 48, right: 48 } };
const FONT = { body: 9.5, small: 8, table: 8, h1: 20, h2: 14, h3: 11.5 };
const CELL_PAD = { x: 3, y: 2.5 };
const PX_TO_PT = 0.75;

export interface PdfRenderOptions {
  /** Folder with DejaVuSans.ttf and DejaVuSans-Bold.ttf; default the Debian location. */
  fontDir?: string;
  /** Chart drawings shared with the export's other formats; default drawn for this PDF alone. */
  charts?: ChartDrawings;
}

class PdfWriter {
  readonly doc: PDFKit.PDFDocument;
  private readonly fonts: PdfFonts;

  constructor(doc: PDFKit.PDFDocument, fonts: PdfFonts, private readonly charts: ChartDrawings) {
    this.doc = doc;
    this.fonts = fonts;
    for (const [name, path] of Object.entries(fonts.files)) doc.registerFont(name, path);
  }

  text(s: string): string {
    return this.fonts.unicode ? s : toWinAnsi(s);
  }

  get left(): number { return this.doc.page.margins.left; }
  get width(): number { return this.doc.page.width - this.doc.page.margins.left - this.doc.page.margins.right; }
  get bottom(): number { return this.doc.page.height - this.doc.page.margins.bottom; }
  get atTop(): boolean { return this.doc.y <= this.doc.page.margins.top + 1; }

  /** Starts a new page unless `height` more points fit on this one. */
  ensure(height: number): void {
    if (this.doc.y + height > this.bottom && !this.atTop) this.doc.addPage();
  }

  font(bold: boolean, size: number): void {
    this.doc.font(bold ? this.fonts.bold : this.fonts.regular).fontSize(size);
  }

  heading(level: 1 | 2 | 3, text: string, status?: Status): void {
    const size = level === 1 ? FONT.h1 : level === 2 ? FONT.h2 : FONT.h3;
    // Keep a heading with at least a few lines of what follows it.
    this.ensure(size * 1.4 + 60);
    if (!this.atTop) this.doc.moveDown(level === 3 ? 0.5 : 0.8);
    this.font(true, size);
    const label = this.text(text);
    const y = this.doc.y;
    this.doc.fillColor(status ? STATUS_COLOR[status] : '#1d1d1f').text(label, this.left, y, { width: this.width });
    if (level === 2) {
      const lineY = this.doc.y + 1;
      this.doc.moveTo(this.left, lineY).lineTo(this.left + this.width, lineY).lineWidth(0.8).strokeColor('#bbbbbb').stroke();
      this.doc.y = lineY + 4;
    } else {
      this.doc.y += 3;
    }
    this.doc.fillColor('#1d1d1f');
  }

  paragraph(text: string, tone: 'normal' | 'note' | 'caution' = 'normal'): void {
    this.font(false, FONT.body);
    const s = this.text(text);
    const inset = tone === 'normal' ? 0 : 8;
    const height = this.doc.heightOfString(s, { width: this.width - inset });
    this.ensure(Math.min(height, 200) + 6);
    const y = this.doc.y;
    if (tone !== 'normal') {
      this.doc.rect(this.left, y - 2, this.width, height + 5).fill(tone === 'caution' ? '#fbeeec' : '#f3f3ee');
      this.doc.rect(this.left, y - 2, 2.5, height + 5).fill(tone === 'caution' ? STATUS_COLOR.fail : '#999999');
    }
    this.doc.fillColor('#1d1d1f').text(s, this.left + inset, y, { width: this.width - inset });
    this.doc.y += 6;
  }

  facts(items: { label: string; value: string }[]): void {
    const labelWidth = 170;
    for (const item of items) {
      this.font(false, FONT.body);
      const value = this.text(item.value);
      const h = Math.max(
        this.doc.heightOfString(value, { width: this.width - labelWidth }),
        this.doc.heightOfString(this.text(item.label), { width: labelWidth - 8 }),
      );
      this.ensure(h + 2);
      const y = this.doc.y;
      this.doc.fillColor('#555555').text(this.text(item.label), this.left, y, { width: labelWidth - 8 });
      this.doc.fillColor('#1d1d1f').text(value, this.left + labelWidth, y, { width: this.width - labelWidth });
      this.doc.y = Math.max(this.doc.y, y + h) + 1.5;
    }
    this.doc.y += 4;
  }

  list(items: string[]): void {
    this.font(false, FONT.body);
    for (const item of items) {
      const s = this.text(item);
      const h = this.doc.heightOfString(s, { width: this.width - 14 });
      this.ensure(h + 2);
      const y = this.doc.y;
      this.doc.fillColor('#1d1d1f').text('•', this.left + 3, y, { width: 10 });
      this.doc.text(s, this.left + 14, y, { width: this.width - 14 });
      this.doc.y = Math.max(this.doc.y, y + h) + 2;
    }
    this.doc.y += 4;
  }

  private columnWidths(t: ReportTable): number[] {
    const total = t.columns.reduce((sum, c) => sum + c.weight, 0);
    return t.columns.map((c) => (c.weight / total) * this.width);
  }

  private rowHeight(cells: string[], widths: number[], bold: boolean): number {
    this.font(bold, FONT.table);
    let h = 0;
    cells.forEach((cell, i) => {
      h = Math.max(h, this.cellHeight(this.text(cell) || ' ', widths[i] - 2 * CELL_PAD.x));
    });
    return h + 2 * CELL_PAD.y;
  }

  /**
   * True when pdfkit's line wrapper would keep `text` on one line in a box of `width` in the current
   * font: no line break, and narrower than the box with 2 % to spare (most table cells).
   */
  private fitsOneLine(text: string, width: number): boolean {
    return !text.includes('\n') && this.doc.widthOfString(text) <= 0.98 * width;
  }

  /**
   * heightOfString of a cell's text in the current font. A one-line cell (fitsOneLine) is one line's
   * height, taken as heightOfString takes it (the y after the line less the y before, no line gap is
   * set), without running pdfkit's line wrapper over it.
   */
  private cellHeight(text: string, width: number): number {
    if (this.fitsOneLine(text, width)) {
      const y = this.doc.y;
      return y + this.doc.currentLineHeight(true) - y;
    }
    return this.doc.heightOfString(text, { width });
  }

  /**
   * A cell's text in a box of `width` at (x, y). A one-line cell (fitsOneLine) left or right aligned
   * is placed as pdfkit's line wrapper would place it (right: the box width less the text's width
   * without trailing spaces) and drawn without running the wrapper over it.
   */
  private cellText(text: string, x: number, y: number, width: number, align: 'left' | 'right' | 'center'): void {
    if (align !== 'center' && text.length > 0 && this.fitsOneLine(text, width)) {
      const shift = align === 'right' ? width - this.doc.widthOfString(text.replace(/\s+$/, '')) : 0;
      this.doc.text(text, x + shift, y, { lineBreak: false });
      return;
    }
    this.doc.text(text, x, y, { width, align });
  }

  /** Draws a row of height `h` (rowHeight of its cells). */
  private drawRow(cells: string[], widths: number[], t: ReportTable, opts: { header?: boolean; status?: Status; total?: boolean }, h: number): void {
    const bold = Boolean(opts.header || opts.total);
    const y = this.doc.y;
    if (opts.header) this.doc.rect(this.left, y, this.width, h).fill('#e9e9e4');
    let x = this.left;
    cells.forEach((cell, i) => {
      const statusCell = opts.status && i === t.statusColumn;
      this.font(bold || Boolean(statusCell), FONT.table);
      this.doc.fillColor(statusCell ? STATUS_COLOR[opts.status!] : '#1d1d1f');
      this.cellText(this.text(cell), x + CELL_PAD.x, y + CELL_PAD.y, widths[i] - 2 * CELL_PAD.x, t.columns[i]?.align ?? 'left');
      x += widths[i];
    });
    const lineY = y + h;
    this.doc.moveTo(this.left, lineY).lineTo(this.left + this.width, lineY)
      .lineWidth(opts.header || opts.total ? 0.8 : 0.3).strokeColor(opts.header ? '#888888' : '#cfcfca').stroke();
    if (opts.total) this.doc.moveTo(this.left, y).lineTo(this.left + this.width, y).lineWidth(0.8).strokeColor('#555555').stroke();
    this.doc.fillColor('#1d1d1f');
    this.doc.y = lineY;
  }

  table(caption: string, t: ReportTable): void {
    if (!t.rows.length) {
      this.paragraph(`${caption}: ${t.emptyText}`, 'note');
      return;
    }
    const widths = this.columnWidths(t);
    const header = t.columns.map((c) => c.title);
    const headerH = this.rowHeight(header, widths, true);
    const captionText = this.text(caption);
    this.font(true, FONT.body);
    const captionH = this.doc.heightOfString(captionText, { width: this.width });
    // Caption, header and the first row stay together.
    this.ensure(captionH + headerH + this.rowHeight(t.rows[0].cells, widths, false) + 8);
    this.doc.y += 2;
    this.doc.fillColor('#1d1d1f').text(captionText, this.left, this.doc.y, { width: this.width });
    this.doc.y += 2;
    const drawHeader = () => this.drawRow(header, widths, t, { header: true }, this.rowHeight(header, widths, true));
    drawHeader();
    for (const row of t.rows) {
      // measured once where it is drawn (heightOfString's result carries the rounding of the y it starts at)
      let h = this.rowHeight(row.cells, widths, Boolean(row.total));
      if (this.doc.y + h > this.bottom) {
        this.doc.addPage();
        this.font(false, FONT.small);
        this.doc.fillColor('#666666').text(this.text(`${caption} (continued)`), this.left, this.doc.y, { width: this.width });
        this.doc.y += 2;
        drawHeader();
        h = this.rowHeight(row.cells, widths, Boolean(row.total));
      }
      this.drawRow(row.cells, widths, t, { status: row.status, total: row.total }, h);
    }
    this.doc.y += 10;
  }

  /**
   * Draws a chart at the full text width. It is laid out at that width in px (so fonts keep their
   * size), and only scaled down when taller than a page. svg-to-pdfkit sizes the drawing from the root
   * element's width/height (px), so those are set to the box the chart gets.
   */
  async chart(option: EChartsOption, widthPx: number, heightPx: number): Promise<void> {
    const layoutWidth = Math.min(widthPx, this.width / PX_TO_PT);
    let width = layoutWidth * PX_TO_PT;
    let height = heightPx * PX_TO_PT;
    const maxHeight = this.bottom - this.doc.page.margins.top;
    if (height > maxHeight) {
      width *= maxHeight / height;
      height = maxHeight;
    }
    const svg = (await this.charts.svg(option, Math.round(layoutWidth), heightPx))
      .replace(/^<svg width="[^"]*" height="[^"]*"/, `<svg width="${width / PX_TO_PT}" height="${height / PX_TO_PT}"`);
    this.ensure(height + 6);
    const y = this.doc.y + 2;
    SVGtoPDF(this.doc, svg, this.left + (this.width - width) / 2, y, {
      width,
      height,
      fontCallback: (_family, bold) => (bold ? this.fonts.bold : this.fonts.regular),
      warningCallback: () => {},
    });
    this.doc.y = y + height + 8;
  }

  block(block: ReportBlock): void | Promise<void> {
    switch (block.kind) {
      case 'heading': return this.heading(block.level, block.text, block.status);
      case 'paragraph': return this.paragraph(block.text, block.tone);
      case 'facts': return this.facts(block.items);
      case 'table': return this.table(block.caption, block.table);
      case 'list': return this.list(block.items);
      case 'chart': return this.chart(block.chart.option, block.chart.width, block.chart.height);
      case 'pageBreak':
        if (!this.atTop) this.doc.addPage();
        return;
      default: {
        const never: never = block;
        throw new Error(`report PDF: unknown block ${JSON.stringify(never)}`);
      }
    }
  }

  /** Running header (from page 2) and footer with page numbers, drawn once every page exists. */
  pageFurniture(report: ReportDocument): void {
    const range = this.doc.bufferedPageRange();
    for (let i = range.start; i < range.start + range.count; i++) {
      this.doc.switchToPage(i);
      const { margins } = this.doc.page;
      const saved = margins.bottom;
      // Writing inside the bottom margin would otherwise make pdfkit start a new page.
      margins.bottom = 0;
      this.font(false, FONT.small);
      this.doc.fillColor('#666666');
      if (i > range.start) {
        this.doc.text(this.text(`${report.title} · ${report.subtitle}`), this.left, margins.top - 24, { width: this.width, lineBreak: false });
      }
      const footerY = this.doc.page.height - saved + 18;
      this.doc.text(this.text(report.footer), this.left, footerY, { width: this.width - 90, lineBreak: false });
      this.doc.text(`Page ${i - range.start + 1} of ${range.count}`, this.left + this.width - 90, footerY, { width: 90, align: 'right', lineBreak: false });
      margins.bottom = saved;
    }
  }
}

/** Rough height, pt, of a level-3 heading's run of blocks when that run holds a chart; else 0. */
function sectionEstimate(blocks: ReportBlock[], start: number): number {
  let height = 30;
  let chart = false;
  for (let i = start + 1; i < blocks.length; i++) {
    const b = blocks[i];
    // A heading directly followed by another (a group title, then its first net) keeps with both.
    if (b.kind === 'heading' && i === start + 1 && b.level === 3) {
      const next = sectionEstimate(blocks, i);
      return next ? height + next : 0;
    }
    if (b.kind === 'heading' || b.kind === 'pageBreak' || b.kind === 'table') break;
    if (b.kind === 'facts') height += 14 * b.items.length;
    else if (b.kind === 'list') height += 14 * b.items.length;
    else if (b.kind === 'paragraph') height += 14 * Math.ceil(b.text.length / 95) + 6;
    else if (b.kind === 'chart') {
      chart = true;
      height += b.chart.height * PX_TO_PT + 10;
    }
  }
  return chart ? height : 0;
}

/** Renders the document to PDF bytes. */
export async function renderReportPdf(report: ReportDocument, options: PdfRenderOptions = {}): Promise<Buffer> {
  const doc = new PDFDocument({
    size: PAGE.size,
    margins: PAGE.margin,
    bufferPages: true,
    info: { Title: `${report.title}: ${report.subtitle}`, Creator: 'Slackline' },
  });
  const chunks: Buffer[] = [];
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('data', (chunk: Buffer) => chunks.push(chunk));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const writer = new PdfWriter(doc, choosePdfFonts(options.fontDir), options.charts ?? new ChartDrawings());
  for (const [i, block] of report.blocks.entries()) {
    // A net's heading, facts and waveform should share a page: reserve room for the run of blocks up
    // to the next heading when it holds a chart (rough height estimate, capped at one page).
    if (block.kind === 'heading' && block.level === 3) writer.ensure(Math.min(sectionEstimate(report.blocks, i), writer.bottom - PAGE.margin.top - 40));
    await writer.block(block);
  }
  writer.pageFurniture(report);
  doc.end();
  return done;
}
