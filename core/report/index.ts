/** The margin report's data model (pure): the document the PDF and HTML renderers draw, and the CSV rows. */
export { buildReport, busesInScope, busStatusText, SKEW_NETS_PER_CHART } from './build.js';
export type { ReportInput } from './build.js';
export type { ReportDocument, ReportBlock, ReportTable, ReportColumn, ReportRow, ReportChart } from './document.js';
export { marginCsvRecords, MARGIN_CSV_COLUMNS } from './csv.js';
export type { MarginCsvRecord, MarginCsvColumn } from './csv.js';
export { psCell, formatMarginPs, lengthCell, lengthPair, voltsCell, statusWord, dateTimeText } from './format.js';
export { pickWaveform, edgeCrossings, plotCorner } from './waveform-input.js';
export type { WaveformPick } from './waveform-input.js';
export { MODELLED, NEGLECTED, CAUTION } from './scope-text.js';
