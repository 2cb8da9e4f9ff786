/**
 * Draws a chart option to a standalone SVG string with ECharts' server-side renderer (no DOM), for the
 * PDF and HTML reports. The output is made self-contained and static: the hover-only <style> block
 * and the library's metadata attributes are dropped, and element ids get a per-chart prefix so several
 * charts can sit in one HTML page without their clip paths colliding.
 */
import { createRequire } from 'node:module';
import type { EChartsOption } from 'echarts';

type ECharts = typeof import('echarts');
let library: ECharts | null = null;

/**
 * The chart library, loaded on first use: its one-file build (the package's `require` entry,
 * dist/echarts.js), which loads in about a fifth of the time of its ES module tree of several hundred
 * files (docs/design.md §8.6), and not at all on a thread whose charts a worker draws.
 */
function echartsLibrary(): ECharts {
  return (library ??= createRequire(import.meta.url)('echarts') as ECharts);
}

/** The drawing without its per-chart id prefix (ids as the renderer numbers them, zrN-...). */
export function drawChartSvg(option: EChartsOption, width: number, height: number): string {
  const chart = echartsLibrary().init(null, null, { renderer: 'svg', ssr: true, width, height });
  try {
    // Animation off (already set by the builders) so the first frame is the final picture.
    chart.setOption({ ...option, animation: false });
    return chart.renderToSVGString()
      .replace(/<style\b[^>]*>[\s\S]*?<\/style>/g, '')
      .replace(/\s(?:ecmeta_[a-z_]+|pointer-events)="[^"]*"/g, '');
  } finally {
    chart.dispose();
  }
}

let chartCounter = 0;

/** Gives a drawing's element ids a prefix no other drawing of this process has. */
export function withUniqueIds(svg: string): string {
  const prefix = `slc${++chartCounter}-`;
  return svg.replace(/\bzr\d+-/g, prefix);
}

export function renderChartSvg(option: EChartsOption, width: number, height: number): string {
  return withUniqueIds(drawChartSvg(option, width, height));
}

/** The same SVG for inline use in HTML5, where the namespace attributes are implied. */
export function inlineSvg(svg: string): string {
  return svg.replace(/\sxmlns(?::xlink)?="[^"]*"/g, '').replace(/\sxml:space="preserve"/g, '').replace(/\sxlink:href=/g, ' href=');
}
