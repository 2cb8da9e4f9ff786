/**
 * The window of a long table's rows that is in the DOM (docs/workbench.md, "Board scale"): only the
 * rows the scroll box shows, plus a few either side, are rendered; spacer rows of the height of the
 * rows left out keep the scroll bar's length and position. Plain functions, no Vue.
 */

export interface RowWindow {
  /** First rendered row (index into the sorted, filtered rows) and one past the last. */
  start: number;
  end: number;
  /** Heights of the spacer rows above and below the rendered ones, px. */
  before: number;
  after: number;
}

/** Rows rendered beyond each edge of the scroll box, so a quick scroll does not show blank space (common practice, no source). */
export const OVERSCAN_ROWS = 8;

/**
 * Rows [start, end) to render for a scroll box `viewport` px high scrolled to `scrollTop`, with rows
 * of `rowHeight` px (the measured height of a rendered row) and `total` rows in all.
 */
export function rowWindow(scrollTop: number, viewport: number, rowHeight: number, total: number, overscan = OVERSCAN_ROWS): RowWindow {
  if (total <= 0) return { start: 0, end: 0, before: 0, after: 0 };
  const height = rowHeight > 0 && Number.isFinite(rowHeight) ? rowHeight : 1;
  const top = Math.max(0, Number.isFinite(scrollTop) ? scrollTop : 0);
  const first = Math.min(total - 1, Math.floor(top / height));
  const shown = Math.ceil(Math.max(0, viewport) / height) + 1;
  const start = Math.max(0, first - overscan);
  const end = Math.min(total, first + shown + overscan);
  return { start, end, before: start * height, after: (total - end) * height };
}

/**
 * The scrollTop that brings row `index` fully into a scroll box (top `scrollTop`, `viewport` px high,
 * `header` px of it covered by the sticky header), moving as little as possible; unchanged when it is in view.
 */
export function scrollToRow(index: number, scrollTop: number, viewport: number, rowHeight: number, header = 0): number {
  const top = index * rowHeight;
  const bottom = top + rowHeight;
  if (top < scrollTop) return top;
  if (bottom > scrollTop + viewport - header) return bottom - viewport + header;
  return scrollTop;
}
