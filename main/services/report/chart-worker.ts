/**
 * Worker thread of chart-drawings.ts: draws the charts it is given, in order, and posts each drawing
 * (or the message of the error that stopped it) as soon as it is done, then ends.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { drawChartSvg } from './chart-svg.js';
import { unpackOption } from '../../../core/charts/transfer.js';
import type { ChartWorkerMessage, PackedChart } from './chart-drawings.js';

const { charts } = workerData as { charts: PackedChart[] };
charts.forEach((chart, index) => {
  let message: ChartWorkerMessage;
  try {
    message = { index, svg: drawChartSvg(unpackOption(chart.option), chart.width, chart.height) };
  } catch (error) {
    message = { index, error: error instanceof Error ? error.message : String(error) };
  }
  parentPort!.postMessage(message);
});
