/**
 * Chart drawings of one report export, each drawn once per size and shared by its formats (the PDF
 * and HTML writers both draw every chart). Drawing is the largest part of a large report's time, so
 * when the export knows its charts up front (drawAhead) and there are enough of them, a worker thread
 * draws them in document order while the calling thread lays out the pages (docs/design.md §8.6). A
 * chart not drawn ahead, or one the worker could not draw, is drawn on the calling thread, so the
 * result never depends on where it was drawn.
 */
import type { Worker } from 'node:worker_threads';
import type { EChartsOption } from 'echarts';
import { startWorker } from '../worker-exec-argv.js';
import { packOption } from '../../../core/charts/transfer.js';
import { renderChartSvg, withUniqueIds } from './chart-svg.js';

/** One chart to draw, px. */
export interface ChartRequest {
  option: EChartsOption;
  width: number;
  height: number;
}

/** A chart as the worker is given it: the option packed for copying (core/charts/transfer.ts). */
export interface PackedChart {
  option: unknown;
  width: number;
  height: number;
}

/** What the chart worker posts per chart, by its index in the list it was given. */
export type ChartWorkerMessage = { index: number; svg: string } | { index: number; error: string };

/**
 * Fewer charts than this are drawn on the calling thread: a worker takes 0.1-0.3 s to start, and on
 * the demo's 15 charts it already saves nothing measurable (docs/design.md §8.6).
 */
export const OFF_THREAD_CHARTS = 12;

interface Pending {
  request: ChartRequest;
  resolve(svg: string): void;
  reject(error: unknown): void;
}

export class ChartDrawings {
  private readonly drawn = new Map<EChartsOption, Map<string, Promise<string>>>();
  private worker: Worker | null = null;
  private closed = false;
  private readonly counts = { offThread: 0, here: 0 };

  constructor(private readonly options: { entry?: URL; offThreadFrom?: number } = {}) {}

  /**
   * Starts drawing `charts` on a worker thread, in this order, when there are at least
   * `offThreadFrom` of them (default OFF_THREAD_CHARTS); otherwise each is drawn when first asked for.
   */
  drawAhead(charts: readonly ChartRequest[]): void {
    if (this.worker || this.closed || charts.length < (this.options.offThreadFrom ?? OFF_THREAD_CHARTS)) return;
    const pending: (Pending | null)[] = [];
    const sent: PackedChart[] = [];
    for (const request of charts) {
      if (this.lookup(request)) continue; // already drawn or on its way
      const option = packOption(request.option);
      if (option === null) continue; // holds a callback no other thread knows: drawn here when asked for
      let entry!: Pending;
      const promise = new Promise<string>((resolve, reject) => (entry = { request, resolve, reject }));
      promise.catch(() => {}); // a drawing nobody asks for must not surface as an unhandled rejection
      this.store(request, promise);
      pending.push(entry);
      sent.push({ option, width: request.width, height: request.height });
    }
    if (!sent.length) return;
    // Whatever the worker leaves undrawn (it could not start, or stopped) is drawn here.
    const drawRestHere = () => {
      pending.forEach((entry, i) => {
        if (!entry) return;
        pending[i] = null;
        if (this.closed) entry.reject(new Error('the report export stopped before this chart was drawn'));
        else this.settleHere(entry);
      });
    };
    let worker: Worker;
    try {
      worker = startWorker(this.options.entry ?? new URL('./chart-worker.mjs', import.meta.url), { workerData: { charts: sent } });
    } catch {
      // No worker could be started: every chart is drawn here.
      drawRestHere();
      return;
    }
    this.worker = worker;
    worker.on('message', (m: ChartWorkerMessage) => {
      const entry = pending[m.index];
      if (!entry) return;
      pending[m.index] = null;
      // A chart the worker failed on is drawn here, so its error is the one the calling thread gives.
      if ('svg' in m) {
        this.counts.offThread++;
        entry.resolve(withUniqueIds(m.svg));
      } else {
        this.settleHere(entry);
      }
    });
    worker.once('error', drawRestHere);
    worker.once('exit', () => {
      if (this.worker === worker) this.worker = null;
      drawRestHere();
    });
  }

  /** The chart's SVG at this size, px: the worker's drawing when it drew it ahead, else drawn now. */
  svg(option: EChartsOption, width: number, height: number): Promise<string> {
    const request = { option, width, height };
    let promise = this.lookup(request);
    if (!promise) {
      try {
        promise = Promise.resolve(this.drawHere(request));
      } catch (error) {
        promise = Promise.reject(error);
      }
      this.store(request, promise);
    }
    return promise;
  }

  /** Stops the worker if it is still drawing (an export that failed part-way); safe to call twice. */
  async close(): Promise<void> {
    this.closed = true;
    const worker = this.worker;
    this.worker = null;
    if (worker) await worker.terminate();
  }

  /** How many charts were drawn on the worker thread and how many on the calling thread, so far. */
  where(): { offThread: number; here: number } {
    return { ...this.counts };
  }

  /** Draws a chart on this thread. */
  private drawHere(r: ChartRequest): string {
    this.counts.here++;
    return renderChartSvg(r.option, r.width, r.height);
  }

  private settleHere(entry: Pending): void {
    try {
      entry.resolve(this.drawHere(entry.request));
    } catch (error) {
      entry.reject(error);
    }
  }

  private lookup(r: ChartRequest): Promise<string> | undefined {
    return this.drawn.get(r.option)?.get(`${r.width}x${r.height}`);
  }

  private store(r: ChartRequest, promise: Promise<string>): void {
    let sizes = this.drawn.get(r.option);
    if (!sizes) this.drawn.set(r.option, (sizes = new Map()));
    sizes.set(`${r.width}x${r.height}`, promise);
  }
}
