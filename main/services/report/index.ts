/** Report renderers (PDF, HTML, CSV) and the export entry point used by the CLI, IPC and HTTP hosts. */
export { exportReport, parseReportFormats, fileSlug, REPORT_FORMATS } from './export.js';
export type { ExportReportOptions, ReportFormat, WaveformSource } from './export.js';
export { renderReportPdf } from './pdf.js';
export type { PdfRenderOptions } from './pdf.js';
export { renderReportHtml, escapeHtml } from './html.js';
export { renderMarginCsv } from './csv.js';
export { renderChartSvg, inlineSvg } from './chart-svg.js';
export { choosePdfFonts, toWinAnsi, DEJAVU_DIR } from './fonts.js';
