/**
 * The board summary and per-bus result pages of the service API (core/contract/api.ts getBoardSummary,
 * getBusResults; docs/workbench.md, "Board scale"), through dispatch as every host calls them: the
 * pages of every bus hold each net of the board exactly once, a bus's pages put together equal that
 * bus in the whole-board results, the summary's counts are the whole board's, and after an edit the
 * outdated nets are the ones getOutdatedResults names. Board: bench/generate-board.ts (invented,
 * 150 nets on the demo's linear models), solved in this thread without length windows.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { generateBoard } from '../../../bench/generate-board.js';
import { createProject, openWorkbench, type Workbench } from '../../../main/services/compose.js';
import { dispatchApiCall } from '../../../main/services/api/dispatch.js';
import { BUS_PAGE_MAX, type BoardSummary, type BusResultsPage, type OutdatedResults } from '../../../core/contract/api.js';
import type { BoardResult, NetResult } from '../../../core/budget/results.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-pages-'));
let bench: Workbench;

async function call<T>(method: string, ...args: unknown[]): Promise<T> {
  const outcome = await dispatchApiCall(bench.api, method, args);
  if (!outcome.ok) throw new Error(`${method}: ${outcome.error.message}`);
  return outcome.value as T;
}

/** Every page of a bus, `limit` nets at a time. */
async function allPages(bus: string, limit: number): Promise<BusResultsPage[]> {
  const pages: BusResultsPage[] = [];
  for (let offset = 0; ; offset += limit) {
    const page = (await call<BusResultsPage | null>('getBusResults', bus, { offset, limit }))!;
    pages.push(page);
    if (offset + limit >= page.total) return pages;
  }
}

let board: BoardResult;

beforeAll(async () => {
  const path = join(dir, 'board.slackline');
  createProject(path, generateBoard(150, 3) /* the demo's linear models (the generator's default) */, { author: 'tester' });
  bench = await openWorkbench(path, { solve: { workers: 0, solve: { lengthWindow: false } } });
  expect(await call('getBoardSummary')).toBeNull(); // never solved: nothing to summarise
  const job = await bench.api.startSolve({});
  expect((await bench.api.waitForJob(job.id)).state).toBe('done');
  board = (await call<BoardResult | null>('getResults'))!;
}, 300_000);

afterAll(async () => {
  await bench?.close();
  rmSync(dir, { recursive: true, force: true });
});

describe('getBusResults pages', () => {
  it('hold every net of the board exactly once across all pages of all buses (pages of 7 nets)', async () => {
    const seen: string[] = [];
    for (const bus of board.buses) for (const page of await allPages(bus.bus, 7)) seen.push(...page.bus.nets.map((n) => n.net));
    // common practice, no source: a partition of the board's nets (no net lost, none twice)
    expect(seen).toHaveLength(150);
    expect(new Set(seen).size).toBe(150);
    expect(new Set(seen)).toEqual(new Set(board.buses.flatMap((b) => b.nets.map((n) => n.net))));
  });

  it('put together, equal that bus in the whole-board results (same fields, same nets in the same order)', async () => {
    for (const bus of board.buses) {
      const pages = await allPages(bus.bus, 5);
      const nets: NetResult[] = pages.flatMap((p) => p.bus.nets);
      const { nets: _pageNets, ...fields } = pages[0].bus;
      const { nets: _wholeNets, ...wholeFields } = bus;
      expect(fields).toEqual(wholeFields); // the bus-level numbers (status, worst margins, worst net, note)
      expect(nets).toEqual(bus.nets);
      for (const page of pages) {
        expect(page.total).toBe(bus.nets.length);
        expect(page.fresh).toBe(true);
        expect(page.solvedAt).toBe(board.solvedAt);
        expect(page.fingerprint).toBe(board.fingerprint);
        expect(page.changedNets).toEqual([]);
      }
    }
  });

  it('default to the whole bus in one page (up to the page limit); a page past the end is empty', async () => {
    const bus = board.buses[0];
    const page = (await call<BusResultsPage>('getBusResults', bus.bus))!;
    expect(page.bus.nets).toEqual(bus.nets);
    const past = (await call<BusResultsPage>('getBusResults', bus.bus, { offset: bus.nets.length + 3 }))!;
    expect(past.bus.nets).toEqual([]);
    expect(past.total).toBe(bus.nets.length);
  });

  it('refuse a page larger than the limit, a negative offset, and a bus the project does not have, naming it', async () => {
    const big = await dispatchApiCall(bench.api, 'getBusResults', [board.buses[0].bus, { limit: BUS_PAGE_MAX + 1 }]);
    expect(big.ok).toBe(false);
    if (!big.ok) expect(big.error.kind).toBe('payload');
    const negative = await dispatchApiCall(bench.api, 'getBusResults', [board.buses[0].bus, { offset: -1 }]);
    expect(negative.ok).toBe(false);
    const unknown = await dispatchApiCall(bench.api, 'getBusResults', ['NO_SUCH_BUS']);
    expect(unknown.ok).toBe(false);
    if (!unknown.ok) expect(unknown.error).toMatchObject({ kind: 'input', where: 'bus NO_SUCH_BUS' });
  });
});

describe('getBoardSummary', () => {
  it('gives each bus of the whole board in order with its counts, worst margins and reason, in a message far smaller than the board', async () => {
    const summary = (await call<BoardSummary>('getBoardSummary'))!;
    expect(summary.fresh).toBe(true);
    expect(summary.solvedAt).toBe(board.solvedAt);
    expect(summary.nets).toBe(150);
    expect(summary.changedNets).toBe(0);
    expect(summary.buses.map((b) => b.bus)).toEqual(board.buses.map((b) => b.bus));
    for (const [i, bus] of board.buses.entries()) {
      const s = summary.buses[i];
      // counts over the bus's nets, as the overview counted them from the whole board (common practice, no source)
      expect(s).toMatchObject({
        status: bus.status, nets: bus.nets.length, worstSetup: bus.worstSetup, worstHold: bus.worstHold, worstNet: bus.worstNet,
        failing: bus.nets.filter((n) => n.status === 'fail').length, tight: bus.nets.filter((n) => n.status === 'tight').length,
        waived: 0, staleWaivers: 0, changedNets: 0,
      });
      if (bus.status === 'pass') expect(s.reason).toBeNull();
      else expect(s.reason).toMatch(new RegExp(`^(${bus.nets.map((n) => n.net).join('|')}): .+`));
    }
    // The board fails by design (the demo's failing nets repeat in every slice): some bus says why.
    expect(summary.buses.some((b) => b.status === 'fail' && b.reason)).toBe(true);
    expect(JSON.stringify(summary).length).toBeLessThan(JSON.stringify(board).length / 10);
  });

  it('after a one-net edit, marks that net outdated: the same nets getOutdatedResults names, on its bus only', async () => {
    const data = (await bench.api.getProject()).data;
    const net = data.nets.find((n) => n.role === 'data')!;
    const index = net.elements.findIndex((e) => e.kind === 'segment');
    const segment = net.elements[index];
    if (segment.kind !== 'segment') throw new Error('no segment');
    await bench.api.updateNetElement(net.name, index, { ...segment, length: segment.length + 5e-3 });
    const outdated = (await call<OutdatedResults>('getOutdatedResults'))!;
    const summary = (await call<BoardSummary>('getBoardSummary'))!;
    expect(summary.fresh).toBe(false);
    expect(summary.solvedAt).toBe(board.solvedAt);
    expect(summary.changedNets).toBe(outdated.changedNets.length);
    expect(outdated.changedNets).toContain(net.name);
    const byBus = new Map(outdated.board.buses.map((b) => [b.bus, b.nets.filter((n) => outdated.changedNets.includes(n.net)).length]));
    for (const bus of summary.buses) expect(bus.changedNets).toBe(byBus.get(bus.bus));
    const page = (await call<BusResultsPage>('getBusResults', net.bus))!;
    expect(page.fresh).toBe(false);
    expect(new Set(page.changedNets)).toEqual(new Set(outdated.changedNets.filter((n) => page.bus.nets.some((r) => r.net === n))));
  });
});
