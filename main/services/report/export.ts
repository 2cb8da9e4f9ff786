/**
 * Writes the margin report of a solved project in the requested formats and returns the paths.
 * Every file is written to a temporary name beside its target and renamed into place, so an
 * interrupted export never leaves a half-written report where an old one was.
 */
import { mkdir, rename, writeFile, rm } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import { InputError } from '../../../core/errors.js';
import { layerProperties } from '../../../core/stackup/index.js';
import { buildReport, busesInScope } from '../../../core/report/build.js';
import { marginCsvRecords, type PreviousMargins } from '../../../core/report/csv.js';
import type { LayerProperties, NetWaveforms } from '../../../core/contract/api.js';
import type { BoardResult, NetResult } from '../../../core/budget/results.js';
import type { ProjectData } from '../../../core/project/model.js';
import type { ReportDocument } from '../../../core/report/document.js';
import { renderReportPdf } from './pdf.js';
import { renderReportHtml } from './html.js';
import { ChartDrawings, type ChartRequest } from './chart-drawings.js';
import { renderMarginCsv } from './csv.js';

export type ReportFormat = 'pdf' | 'html' | 'csv';
export const REPORT_FORMATS: readonly ReportFormat[] = ['pdf', 'html', 'csv'];

/**
 * Where the failing and tight nets' receiver waveforms come from: a map by net name, or a function
 * the caller wires to the solver (called only for nets that are not passing). null = no plot.
 */
export type WaveformSource =
  | Record<string, NetWaveforms>
  | ((net: NetResult) => Promise<NetWaveforms | null> | NetWaveforms | null);

export interface ExportReportOptions {
  outDir: string;
  formats: ReportFormat[];
  /** Report only this bus (InputError when the results have no such bus). */
  bus?: string;
  waveforms?: WaveformSource;
  /** Report date; default now. */
  generatedAt?: Date;
  /** Routing-layer properties if the caller has them; default computed from the project's stackup. */
  layers?: LayerProperties[];
  /** Folder with the DejaVu fonts for the PDF (default the Debian location). */
  fontDir?: string;
  /** The whole-board solve before `result` (per-net worst margins) for "Δ vs previous solve"; none: empty column. */
  previous?: PreviousMargins | null;
}

/** Parses "pdf,html" into formats; InputError naming the bad entry. */
export function parseReportFormats(text: string, where = '--format'): ReportFormat[] {
  const formats = text.split(',').map((f) => f.trim().toLowerCase()).filter(Boolean);
  if (!formats.length) throw new InputError(where, `no format given (choose from ${REPORT_FORMATS.join(', ')})`);
  for (const f of formats) {
    if (!(REPORT_FORMATS as readonly string[]).includes(f)) {
      throw new InputError(where, `unknown report format "${f}" (choose from ${REPORT_FORMATS.join(', ')})`);
    }
  }
  return [...new Set(formats)] as ReportFormat[];
}

/** A file-name-safe version of a name: "Heron Ridge / B2" -> "heron-ridge-b2". */
export function fileSlug(text: string): string {
  return text.normalize('NFKD').replace(/[^\w.-]+/g, '-').replace(/^-+|-+$/g, '').toLowerCase() || 'project';
}

async function collectWaveforms(result: BoardResult, bus: string | undefined, source: WaveformSource | undefined): Promise<Record<string, NetWaveforms>> {
  if (!source) return {};
  if (typeof source !== 'function') return source;
  const out: Record<string, NetWaveforms> = {};
  for (const b of busesInScope(result, bus)) {
    for (const net of b.nets) {
      if (net.status === 'pass') continue;
      const w = await source(net);
      if (w) out[net.net] = w;
    }
  }
  return out;
}

async function writeAtomically(path: string, data: string | Buffer): Promise<void> {
  const temp = `${path}.${process.pid}.partial`;
  try {
    await writeFile(temp, data);
    await rename(temp, path);
  } catch (error) {
    await rm(temp, { force: true });
    throw error;
  }
}

/** Every chart of the document at the size both writers draw it, in document order. */
function chartRequests(document: ReportDocument): ChartRequest[] {
  return document.blocks.flatMap((b) => (b.kind === 'chart' ? [{ option: b.chart.option, width: b.chart.width, height: b.chart.height }] : []));
}

/**
 * Exports the report; returns the absolute paths written, in the order of `formats`.
 * File names: <project>-<revision>[-<bus>]-margin-report.pdf|.html and ...-margins.csv.
 */
export async function exportReport(project: ProjectData, result: BoardResult, options: ExportReportOptions): Promise<string[]> {
  const formats = parseReportFormats(options.formats.join(','), 'formats');
  // Validates the bus name before any file is touched.
  busesInScope(result, options.bus);
  let layers: LayerProperties[] | { error: string };
  try {
    layers = options.layers ?? layerProperties(project.stackup);
  } catch (error) {
    layers = { error: error instanceof Error ? error.message : String(error) };
  }
  // Waveforms are drawn only in the PDF and HTML; a CSV-only export skips simulating them.
  const drawn = formats.some((f) => f !== 'csv');
  const waveforms = drawn ? await collectWaveforms(result, options.bus, options.waveforms) : {};
  const generatedAt = (options.generatedAt ?? new Date()).toISOString();
  const previous = options.previous ?? null;
  const document = buildReport({ project, result, layers, generatedAt, bus: options.bus, waveforms, previous });

  const outDir = resolve(options.outDir);
  await mkdir(outDir, { recursive: true });
  const stem = [project.info.name, project.info.boardRevision, options.bus].filter(Boolean).map((s) => fileSlug(String(s))).join('-');
  const written: string[] = [];
  const charts = new ChartDrawings(); // each chart drawn once for the PDF and the HTML
  if (drawn) charts.drawAhead(chartRequests(document));
  try {
    for (const format of formats) {
      let path: string;
      let data: string | Buffer;
      switch (format) {
        case 'pdf':
          path = join(outDir, `${stem}-margin-report.pdf`);
          data = await renderReportPdf(document, { fontDir: options.fontDir, charts });
          break;
        case 'html':
          path = join(outDir, `${stem}-margin-report.html`);
          data = await renderReportHtml(document, charts);
          break;
        case 'csv':
          path = join(outDir, `${stem}-margins.csv`);
          data = renderMarginCsv(marginCsvRecords(result, options.bus, { previous, waivers: project.waivers ?? [] }));
          break;
        default: {
          const never: never = format;
          throw new InputError('formats', `unknown report format "${String(never)}"`);
        }
      }
      await writeAtomically(path, data);
      written.push(path);
    }
  } finally {
    await charts.close();
  }
  return written;
}
