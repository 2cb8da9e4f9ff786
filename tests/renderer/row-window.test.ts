/**
 * The margin table's row window (renderer/src/lib/row-window.ts; docs/workbench.md, "Board scale"):
 * which rows are in the DOM for a scroll position, and where to scroll to bring a row into view.
 * Expected values are hand calculations from the row height, shown beside each check.
 */
import { describe, expect, it } from 'vitest';
import { OVERSCAN_ROWS, rowWindow, scrollToRow } from '../../renderer/src/lib/row-window.js';

describe('rowWindow', () => {
  it('renders the rows in view plus the overscan, with spacers for the rest (5,000 rows of 40 px, 400 px box)', () => {
    // scrolled to 4,000 px: first row in view 4000 / 40 = 100; 400 / 40 + 1 = 11 rows in view; 8 either side
    const w = rowWindow(4000, 400, 40, 5000, 8);
    expect(w).toEqual({ start: 92, end: 119, before: 92 * 40, after: (5000 - 119) * 40 });
    // hand calculation: the spacers and the rendered rows add up to the whole table's height
    expect(w.before + (w.end - w.start) * 40 + w.after).toBe(5000 * 40);
  });

  it('keeps the number of rendered rows bounded wherever the table is scrolled (independent of the row count)', () => {
    for (const total of [50, 5000, 200_000]) {
      for (const top of [0, 1234, 40 * total]) {
        const w = rowWindow(top, 600, 48, total);
        // at most ceil(600 / 48) + 1 = 14 rows in view, plus the overscan on both sides
        expect(w.end - w.start).toBeLessThanOrEqual(14 + 2 * OVERSCAN_ROWS);
        expect(w.start).toBeGreaterThanOrEqual(0);
        expect(w.end).toBeLessThanOrEqual(total);
        expect(w.end).toBeGreaterThan(w.start);
      }
    }
  });

  it('starts at the top, ends at the last row when scrolled past the end, and is empty without rows', () => {
    expect(rowWindow(0, 400, 40, 5000, 8)).toMatchObject({ start: 0, end: 19, before: 0 }); // 0 + 11 + 8
    expect(rowWindow(1e9, 400, 40, 30, 8)).toMatchObject({ end: 30, after: 0 });
    expect(rowWindow(0, 400, 40, 0)).toEqual({ start: 0, end: 0, before: 0, after: 0 });
    // a short table renders whole: 5 rows in a 400 px box
    expect(rowWindow(0, 400, 40, 5)).toEqual({ start: 0, end: 5, before: 0, after: 0 });
  });

  it('survives a row height not measured yet (0) or a negative scroll (elastic scrolling) without NaN', () => {
    const w = rowWindow(-50, 400, 0, 100, 2);
    expect(Number.isFinite(w.before) && Number.isFinite(w.after)).toBe(true);
    expect(w.start).toBe(0);
  });
});

describe('scrollToRow', () => {
  // 40 px rows, a 400 px box of which a 30 px sticky header covers the top
  it('leaves the scroll where it is when the row is in view', () => {
    expect(scrollToRow(5, 0, 400, 40, 30)).toBe(0); // row 5 at 200..240 px, visible band 0..370
  });
  it('scrolls up to a row above the view, putting it just under the header', () => {
    expect(scrollToRow(10, 2000, 400, 40, 30)).toBe(400); // row 10 starts at 10 * 40 = 400
  });
  it('scrolls down just far enough for a row below the view (End: the last of 5,000 rows)', () => {
    // row 4999 ends at 5000 * 40 = 200,000 px; 200,000 - 400 + 30 = 199,630
    expect(scrollToRow(4999, 0, 400, 40, 30)).toBe(199_630);
  });
});
