/**
 * The report as one self-contained HTML file: inline CSS, charts as inline SVG, no scripts, and no
 * reference to anything outside the file (a reviewer can open the archived copy offline years later).
 */
import type { ReportBlock, ReportDocument, ReportTable } from '../../../core/report/document.js';
import { STATUS_COLOR } from '../../../core/charts/style.js';
import { inlineSvg } from './chart-svg.js';
import { ChartDrawings } from './chart-drawings.js';

export function escapeHtml(text: string): string {
  return text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

const CSS = `
* { box-sizing: border-box; }
body { font-family: "DejaVu Sans", "Segoe UI", Helvetica, Arial, sans-serif; color: #1d1d1f; margin: 0; background: #f3f3f1; font-size: 14px; line-height: 1.45; }
main { max-width: 980px; margin: 0 auto; background: #fff; padding: 32px 40px 48px; }
h1 { font-size: 26px; margin: 0 0 16px; }
h2 { font-size: 20px; margin: 32px 0 10px; padding-bottom: 4px; border-bottom: 2px solid #d8d8d4; }
h3 { font-size: 16px; margin: 22px 0 8px; }
.heading-pass { color: ${STATUS_COLOR.pass}; } .heading-tight { color: ${STATUS_COLOR.tight}; } .heading-fail { color: ${STATUS_COLOR.fail}; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: 3px 16px; margin: 8px 0 14px; }
dl.facts dt { color: #555; } dl.facts dd { margin: 0; overflow-wrap: anywhere; }
p.note { color: #444; background: #f5f5f0; border-left: 4px solid #999; padding: 6px 10px; }
p.caution { background: #fbeeec; border-left: 4px solid ${STATUS_COLOR.fail}; padding: 6px 10px; }
figure { margin: 12px 0 18px; } figure svg { max-width: 100%; height: auto; display: block; }
table { border-collapse: collapse; width: 100%; margin: 4px 0 18px; font-size: 12.5px; }
caption { text-align: left; font-weight: bold; padding: 4px 0; }
th { background: #e9e9e4; text-align: left; padding: 4px 6px; border-bottom: 1px solid #999; vertical-align: bottom; }
td { padding: 3px 6px; border-bottom: 1px solid #e2e2de; vertical-align: top; }
td.right, th.right { text-align: right; font-variant-numeric: tabular-nums; } td.center, th.center { text-align: center; }
tr.total td { font-weight: bold; border-top: 1.5px solid #555; }
td.cell-pass { color: ${STATUS_COLOR.pass}; font-weight: bold; } td.cell-tight { color: ${STATUS_COLOR.tight}; font-weight: bold; } td.cell-fail { color: ${STATUS_COLOR.fail}; font-weight: bold; }
p.empty { font-style: italic; color: #555; }
footer { margin-top: 32px; color: #666; font-size: 12px; border-top: 1px solid #ddd; padding-top: 8px; }
@media print {
  body { background: #fff; } main { max-width: none; padding: 0; }
  thead { display: table-header-group; } tr, figure { break-inside: avoid; }
  .page-break { break-before: page; }
}
`;


function tableHtml(caption: string, t: ReportTable): string {
  if (!t.rows.length) return `<p class="empty"><strong>${escapeHtml(caption)}:</strong> ${escapeHtml(t.emptyText)}</p>`;
  const head = t.columns.map((c) => `<th class="${c.align}">${escapeHtml(c.title)}</th>`).join('');
  const body = t.rows
    .map((row) => {
      const cells = row.cells
        .map((cell, i) => {
          const classes: string[] = [t.columns[i]?.align ?? 'left'];
          if (row.status && i === t.statusColumn) classes.push(`cell-${row.status}`);
          return `<td class="${classes.join(' ')}">${escapeHtml(cell)}</td>`;
        })
        .join('');
      return `<tr${row.total ? ' class="total"' : ''}>${cells}</tr>`;
    })
    .join('\n');
  return `<table><caption>${escapeHtml(caption)}</caption><thead><tr>${head}</tr></thead><tbody>\n${body}\n</tbody></table>`;
}

async function blockHtml(block: ReportBlock, charts: ChartDrawings): Promise<string> {
  switch (block.kind) {
    case 'heading': {
      const tag = `h${block.level}`;
      return `<${tag}${block.status ? ` class="heading-${block.status}"` : ''}>${escapeHtml(block.text)}</${tag}>`;
    }
    case 'paragraph':
      return `<p${block.tone && block.tone !== 'normal' ? ` class="${block.tone}"` : ''}>${escapeHtml(block.text)}</p>`;
    case 'facts':
      return `<dl class="facts">${block.items.map((f) => `<dt>${escapeHtml(f.label)}</dt><dd>${escapeHtml(f.value)}</dd>`).join('')}</dl>`;
    case 'table':
      return tableHtml(block.caption, block.table);
    case 'list':
      return `<ul>${block.items.map((i) => `<li>${escapeHtml(i)}</li>`).join('')}</ul>`;
    case 'chart': {
      const svg = inlineSvg(await charts.svg(block.chart.option, block.chart.width, block.chart.height));
      return `<figure role="img" aria-label="${escapeHtml(block.chart.alt)}">${svg}</figure>`;
    }
    case 'pageBreak':
      return '<div class="page-break"></div>';
    default: {
      const never: never = block;
      throw new Error(`report HTML: unknown block ${JSON.stringify(never)}`);
    }
  }
}

/** `charts`: drawings shared with the export's other formats (default drawn for this page alone). */
export async function renderReportHtml(doc: ReportDocument, charts: ChartDrawings = new ChartDrawings()): Promise<string> {
  const blocks: string[] = [];
  for (const block of doc.blocks) blocks.push(await blockHtml(block, charts));
  return [
    '<!DOCTYPE html>',
    '<html lang="en">',
    '<head>',
    '<meta charset="utf-8">',
    '<meta name="viewport" content="width=device-width, initial-scale=1">',
    // Forbids every fetch: the file must show the same offline as on the day it was archived.
    `<meta http-equiv="Content-Security-Policy" content="default-src 'none'; style-src 'unsafe-inline'; img-src data:">`,
    `<title>${escapeHtml(`${doc.title}: ${doc.subtitle}`)}</title>`,
    `<style>${CSS}</style>`,
    '</head>',
    '<body><main>',
    ...blocks,
    `<footer>${escapeHtml(doc.footer)}</footer>`,
    '</main></body>',
    '</html>',
    '',
  ].join('\n');
}
