/**
 * A new user's first board, end to end, from an empty folder with only docs/ to read: the complete
 * example of docs/design-file.md §8 (a source-synchronous byte lane of 9 nets and a common-clock
 * fly-by bus; invented, not the demo) is written as a design file, built into a project, given its
 * length report (the CSV of the same section), checked and reported. Expectations are the example's
 * own numbers (hand count of its nets and rows) and the CLI's documented exit statuses.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../main/cli/index.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-new-user-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

const guide = readFileSync(new URL('../../../docs/design-file.md', import.meta.url), 'utf8');
const section8 = guide.slice(guide.indexOf('## §8'));
const block = (lang: string) => {
  const start = section8.indexOf('```' + lang + '\n');
  expect(start).toBeGreaterThan(0);
  return section8.slice(start + lang.length + 4, section8.indexOf('```', start + 3));
};

async function cli(args: string[]): Promise<{ status: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const status = await main(args, { out: (t) => void (out += t), err: (t) => void (err += `${t}\n`) });
  return { status, out, err };
}

describe('a new board from the design-file guide', () => {
  it('the guide\'s example is the test board file (kept equal)', () => {
    expect(block('yaml')).toBe(readFileSync(join(import.meta.dirname, 'two-bus.design.yaml'), 'utf8'));
    expect(block('csv')).toBe(readFileSync(join(import.meta.dirname, 'two-bus-lengths.csv'), 'utf8'));
  });

  it('design file -> new -> import lengths -> check -> report', async () => {
    expect(readdirSync(dir)).toEqual([]);
    writeFileSync(join(dir, 'board.design.yaml'), block('yaml'));
    writeFileSync(join(dir, 'lengths.csv'), block('csv'));
    const project = join(dir, 'board.slackline');

    const created = await cli(['new', project, '--from', join(dir, 'board.design.yaml'), '--json']);
    expect(created.err).toBe('');
    // 9 nets in LANE0 (DQS0, DQ0-DQ7) and 5 in ADDR (CK, A0-A3): counted in the example.
    expect(JSON.parse(created.out)).toMatchObject({ name: 'Two-bus test board', buses: 2, nets: 14 });

    // Before the import the template's unrouted traces have no length, so the board is not solved.
    const early = await cli(['check', project]);
    expect(early.status).toBe(2);
    expect(early.err).toMatch(/length/);

    const imported = await cli(['import', project, join(dir, 'lengths.csv'), '--json']);
    expect(imported.status).toBe(0);
    const preview = JSON.parse(imported.out) as { counts: Record<string, number>; applied: boolean };
    // 23 rows: DQS0 TOP 3mm and DQ5 TOP 4mm equal what the design says (matched), 21 fill unrouted traces.
    expect(preview.counts).toMatchObject({ matched: 2, changed: 21 });
    expect(preview.applied).toBe(true);

    const checked = await cli(['check', project, '--json']);
    expect([0, 1]).toContain(checked.status);
    const board = JSON.parse(checked.out) as { buses: { bus: string; nets: { net: string }[] }[] };
    expect(board.buses.map((b) => [b.bus, b.nets.length])).toEqual([['LANE0', 9], ['ADDR', 5]]);

    const reportDir = join(dir, 'review');
    const reported = await cli(['report', project, '--out', reportDir, '--json']);
    expect(reported.status).toBe(0);
    const files = (JSON.parse(reported.out) as { files: string[] }).files;
    expect(files.map((f) => f.split('.').pop()).sort()).toEqual(['csv', 'html', 'pdf']);
    for (const f of files) expect(existsSync(f) && statSync(f).size > 1000).toBe(true);
  }, 120_000);
});
