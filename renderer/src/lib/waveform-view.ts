/**
 * Turns a net's simulated waveforms into the chart input of one receiver at one corner (or all
 * corners), with thresholds, rails, limits and the measured crossings. The chart option itself comes
 * from core/charts (shared with the report); this adds the workbench's interactive touches.
 */
import type { EChartsOption } from 'echarts';
import type { NetWaveforms } from '../../../core/contract/api.js';
import type { Corner, NetDefinition, PartModel } from '../../../core/project/model.js';
import { waveformChartOption, type WaveformChartInput, type WaveformCrossing, type WaveformTrace } from '../../../core/charts/index.js';
import { edgeCrossings } from '../../../core/report/waveform-input.js';

export interface WaveformSelection {
  receiver: string;
  /** A corner name, or '*' for every corner. */
  corner: string;
}

export function waveformInput(
  net: NetDefinition,
  waves: NetWaveforms,
  parts: PartModel[],
  corners: Corner[],
  pick: WaveformSelection,
): WaveformChartInput | null {
  const threshold = waves.thresholds.find((th) => th.receiver === pick.receiver) ?? waves.thresholds[0];
  if (!threshold) return null;
  const key = waveformKey(net, waves, threshold.receiver);
  const runs = waves.corners.filter((run) => (pick.corner === '*' || run.corner === pick.corner) && run.v[key]);
  if (!runs.length) return null;
  const traces: WaveformTrace[] = [];
  const crossings: WaveformCrossing[] = [];
  for (const run of runs) {
    const v = run.v[key];
    traces.push({ edge: run.edge, label: `${run.edge} (${run.corner})`, t: run.t, v });
    crossings.push(...edgeCrossings(run.edge, run.t, v, threshold.vil, threshold.vih));
  }
  const driver = parts.find((p) => p.name === net.driver.part)?.driver ?? null;
  const corner = corners.find((c) => c.name === pick.corner);
  const railScale = corner?.rail ?? 1;
  return {
    title: `${net.name} at receiver ${threshold.receiver}`,
    subtitle: `${pick.corner === '*' ? 'all corners' : `${pick.corner} corner`}; circles: threshold crossings used for flight time`,
    traces,
    levels: {
      vil: threshold.vil,
      vih: threshold.vih,
      vmaxAbs: threshold.vmaxAbs,
      vminAbs: threshold.vminAbs,
      ...(driver ? { railLow: driver.vol * railScale, railHigh: driver.voh * railScale } : {}),
    },
    crossings,
  };
}

/**
 * The waveform map is keyed by topology node; thresholds name the receiver by designator (U13).
 * Accepts either, so the view does not depend on which of the two a solver version uses.
 */
export function waveformKey(net: NetDefinition, waves: NetWaveforms, receiver: string): string {
  if (waves.corners.some((run) => run.v[receiver])) return receiver;
  return net.receivers.find((r) => r.designator === receiver)?.node ?? receiver;
}

/** The shared option plus what helps on screen: tooltip with units, LTTB sampling when zoomed. */
export function interactiveWaveformOption(input: WaveformChartInput): EChartsOption {
  const option = waveformChartOption(input) as Record<string, unknown>;
  const series = (option.series as Record<string, unknown>[]).map((s) =>
    s.type === 'line' ? { ...s, sampling: 'lttb', showSymbol: false } : s,
  );
  return {
    ...option,
    series,
    animation: false,
    tooltip: {
      trigger: 'axis',
      valueFormatter: (value: unknown) => (typeof value === 'number' ? `${value.toFixed(3)} V` : String(value)),
      axisPointer: { label: { formatter: ({ value }: { value: number }) => `${Number(value).toFixed(3)} ns` } },
    },
  } as EChartsOption;
}
