/**
 * Length-report import, 10,000 rows: time to preview (parse, validate, compare) and to apply (the
 * same plus writing every changed segment in one transaction), against a reference measured in the
 * same run: a bare better-sqlite3 INSERT of the same rows in one transaction (WAL, synchronous=FULL).
 * Target (docs/design.md §1.2): "well under a second" for 10,000 rows.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ProjectStore } from '../main/services/project/project-store.js';
import { rawInsertReference } from './raw-insert-reference.js';
import { tokeniseLengthCsv } from '../main/services/project/length-csv.js';
import { readLengthReport } from '../core/lengths/length-report.js';
import { lengthReportCsv, syntheticProject } from '../fixtures/lengths/synthetic.js';

const NETS = 500;
const SEGMENTS_PER_NET = 20; // 500 x 20 = 10,000 rows
const REPEATS = 5;

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)];
}

function timed<T>(fn: () => T): [T, number] {
  const start = performance.now();
  const value = fn();
  return [value, performance.now() - start];
}

export interface ImportBenchResult {
  rows: number;
  previewMs: number;
  applyMs: number;
  referenceMs: number;
  parseMs: number;
}

export async function run(): Promise<ImportBenchResult> {
  const dir = mkdtempSync(join(tmpdir(), 'slackline-bench-import-'));
  try {
    const data = syntheticProject(NETS, SEGMENTS_PER_NET);
    const path = join(dir, 'bench.slackline');
    ProjectStore.create(path, data, { author: 'bench' }).close();
    // Two reports with different lengths, alternated so every apply changes all rows.
    const reports = [lengthReportCsv(data, 1.1), lengthReportCsv(data, 1.2)];
    const rows = readLengthReport('r.csv', tokeniseLengthCsv('r.csv', reports[0]).records).rows;

    const store = ProjectStore.open(path, { author: 'bench' });
    const preview: number[] = [];
    const apply: number[] = [];
    const parse: number[] = [];
    const reference: number[] = [];
    try {
      for (let i = 0; i < REPEATS; i += 1) {
        const csv = reports[i % 2];
        parse.push(timed(() => readLengthReport('r.csv', tokeniseLengthCsv('r.csv', csv).records))[1]);
        const [p, previewMs] = timed(() => store.previewImport('r.csv', csv));
        if (p.counts.changed !== rows.length) throw new Error(`bench: expected ${rows.length} changed rows, preview found ${p.counts.changed}`);
        preview.push(previewMs);
        const [a, applyMs] = timed(() => store.applyImport('r.csv', csv));
        if (!a.applied) throw new Error(`bench: import not applied: ${a.errors.slice(0, 3).join('; ')}`);
        apply.push(applyMs);
        reference.push(rawInsertReference(join(dir, `reference-${i}.sqlite`), rows));
      }
      if (store.integrityCheck() !== 'ok') throw new Error('bench: integrity check failed after the imports');
    } finally {
      store.close();
    }
    const result: ImportBenchResult = {
      rows: rows.length,
      previewMs: median(preview),
      applyMs: median(apply),
      referenceMs: median(reference),
      parseMs: median(parse),
    };
    const ms = (v: number) => `${v.toFixed(1)} ms`;
    console.log(`import: ${result.rows} rows, median of ${REPEATS} runs`);
    console.log(`  parse + validate (CSV -> SI rows)      ${ms(result.parseMs)}`);
    console.log(`  preview (parse, load project, compare) ${ms(result.previewMs)}`);
    console.log(`  apply (preview + write, 1 transaction) ${ms(result.applyMs)}`);
    console.log(`  reference: bare INSERT of the same rows ${ms(result.referenceMs)}  (apply = ${(result.applyMs / result.referenceMs).toFixed(1)} x reference)`);
    console.log(`  target: well under 1000 ms for 10,000 rows -> apply ${result.applyMs < 1000 ? 'meets' : 'MISSES'} it`);
    return result;
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}
