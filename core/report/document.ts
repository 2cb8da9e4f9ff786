/**
 * The report as a renderer-neutral document: a title and a flat list of blocks whose text is already
 * formatted for people (units shown, sensible precision). The PDF and HTML renderers draw exactly
 * these strings, so both formats say the same thing.
 */
import type { EChartsOption } from 'echarts';
import type { Status } from '../budget/results.js';

export interface ReportColumn {
  title: string;
  align: 'left' | 'right' | 'center';
  /** Relative width among the table's columns. */
  weight: number;
}

export interface ReportRow {
  cells: string[];
  /** Colours the row's status cell (the column named by ReportTable.statusColumn). */
  status?: Status;
  /** A summary row (budget total), drawn emphasised. */
  total?: boolean;
}

export interface ReportTable {
  columns: ReportColumn[];
  rows: ReportRow[];
  /** Shown instead of an empty table. */
  emptyText: string;
  statusColumn?: number;
}

export interface ReportChart {
  /** Plain-text description for readers without the picture (HTML alt text). */
  alt: string;
  option: EChartsOption;
  /** Drawing size, px (1 px = 0.75 pt on the PDF page). */
  width: number;
  height: number;
}

export type ReportBlock =
  | { kind: 'heading'; level: 1 | 2 | 3; text: string; status?: Status }
  | { kind: 'paragraph'; text: string; tone?: 'normal' | 'note' | 'caution' }
  | { kind: 'facts'; items: { label: string; value: string }[] }
  | { kind: 'table'; caption: string; table: ReportTable }
  | { kind: 'list'; items: string[] }
  | { kind: 'chart'; chart: ReportChart }
  | { kind: 'pageBreak' };

export interface ReportDocument {
  title: string;
  /** Project and board revision, for running headers and the HTML title. */
  subtitle: string;
  /** Short line for every page's footer (fingerprint and date). */
  footer: string;
  blocks: ReportBlock[];
}
