/** Pure ECharts option builders shared by the workbench and the reports. */
export { waveformChartOption, traceStyles, activeWindow } from './waveform.js';
export type { WaveformChartInput, WaveformTrace, WaveformLevels, WaveformCrossing, Edge, TraceStyle } from './waveform.js';
export { skewChartOption, skewChartHeight, referenceWindow, isReferenceNet } from './skew.js';
export { decimateMinMax } from './decimate.js';
export { baseChartOption, canvasTooltip, chartPalette, valueAxis, STATUS_COLOR, TRACE_COLOR, LEVEL_COLOR, CHART_FONT_FAMILY, CHART_FONT_SIZE } from './style.js';
export type { ChartTheme, ChartPalette } from './style.js';
export { ibisViChartOption, ibisVtChartOption, viAtPad, fixtureText, VI_TABLES } from './ibis-curves.js';
