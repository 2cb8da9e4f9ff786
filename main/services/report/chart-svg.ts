/**
 * Draws a chart option to a standalone SVG string with ECharts' server-side renderer (no DOM), for the
 * PDF and HTML reports. The output is made self-contained and static: the hover-only <style> block
 * and the library's metadata attributes are dropped, and element ids get a per-chart prefix so several
 * charts can sit in one HTML page without their clip paths colliding.
 */
import * as echarts from 'echarts';
import type { EChartsOption } from 'echarts';

let chartCounter = 0;

export function renderChartSvg(option: EChartsOption, width: number, height: number): string {
  const chart = echarts.init(null, null, { renderer: 'svg', ssr: true, width, height });
  try {
    // Animation off (already set by the builders) so the first frame is the final picture.
    chart.setOption({ ...option, animation: false });
    const svg = chart.renderToSVGString();
    const prefix = `slc${++chartCounter}-`;
    return svg
      .replace(/<style\b[^>]*>[\s\S]*?<\/style>/g, '')
      .replace(/\s(?:ecmeta_[a-z_]+|pointer-events)="[^"]*"/g, '')
      .replace(/\bzr\d+-/g, prefix);
  } finally {
    chart.dispose();
  }
}

/** The same SVG for inline use in HTML5, where the namespace attributes are implied. */
export function inlineSvg(svg: string): string {
  return svg.replace(/\sxmlns(?::xlink)?="[^"]*"/g, '').replace(/\sxml:space="preserve"/g, '').replace(/\sxlink:href=/g, ' href=');
}

/**
 * Chart drawings of one report export, each drawn once per size and shared by its formats (the PDF
 * and HTML writers both draw every chart; drawing is most of a large report's time). The id prefix
 * stays unique per drawing, so an HTML page that holds each chart once has no colliding ids.
 */
export class ChartSvgs {
  private readonly drawn = new Map<EChartsOption, Map<string, string>>();

  svg(option: EChartsOption, width: number, height: number): string {
    let sizes = this.drawn.get(option);
    if (!sizes) this.drawn.set(option, (sizes = new Map()));
    const size = `${width}x${height}`;
    let svg = sizes.get(size);
    if (svg === undefined) sizes.set(size, (svg = renderChartSvg(option, width, height)));
    return svg;
  }
}
