/**
 * Round trip through design files (docs/design-file.md §7 "Round trip"): design -> project -> design
 * -> project gives the same project and the same `slackline check --json` (solvedAt aside), on the
 * demo board and on the two-bus test board after its length import. Equality is exact: the writer
 * prints each value with the digits that read back to the same double (no tolerance needed).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../main/cli/index.js';
import { openProjectServices } from '../../../main/services/compose.js';
import { demoDesignPath } from '../../../main/services/project/demo.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-roundtrip-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const here = (name: string) => join(import.meta.dirname, name);

async function cli(args: string[]): Promise<{ status: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const status = await main(args, { out: (t) => void (out += t), err: (t) => void (err += `${t}\n`) });
  return { status, out, err };
}

function load(path: string) {
  const services = openProjectServices(path);
  try {
    return services.store.load();
  } finally {
    void services.close();
  }
}

async function checkJson(path: string): Promise<unknown> {
  const { status, out } = await cli(['check', path, '--json']);
  expect([0, 1]).toContain(status); // 1 = some net fails, still a complete answer (main/cli/index.ts)
  const board = JSON.parse(out) as Record<string, unknown>;
  delete board.solvedAt;
  return board;
}

async function roundTrip(stem: string, design: string, lengths?: string) {
  const first = join(dir, `${stem}-1.slackline`);
  const second = join(dir, `${stem}-2.slackline`);
  const written = join(dir, `${stem}-written.design.yaml`);
  expect((await cli(['new', first, '--from', design])).status).toBe(0);
  if (lengths) expect((await cli(['import', first, lengths])).status).toBe(0);
  expect((await cli(['design', first, '--out', written])).status).toBe(0);
  expect((await cli(['new', second, '--from', written])).status).toBe(0);
  const again = join(dir, `${stem}-again.design.yaml`);
  expect((await cli(['design', second, '--out', again])).status).toBe(0);
  return { first, second, written, again };
}

describe('design -> project -> design -> project', () => {
  it('the demo board: same project, same design text, same check --json', async () => {
    const { first, second, written, again } = await roundTrip('demo', demoDesignPath());
    expect(load(second)).toEqual(load(first));
    expect(readFileSync(again, 'utf8')).toBe(readFileSync(written, 'utf8'));
    const [a, b] = [await checkJson(first), await checkJson(second)];
    expect(b).toEqual(a);
    // Not vacuous: every one of the demo's 119 nets has a result in both (fixtures/demo/README.md).
    const nets = (a as { buses: { nets: unknown[] }[] }).buses.flatMap((bus) => bus.nets);
    expect(nets).toHaveLength(119);
  }, 180_000);

  it('the two-bus test board after its length import: same project, same check --json', async () => {
    const { first, second } = await roundTrip('two-bus', here('two-bus.design.yaml'), here('two-bus-lengths.csv'));
    const project = load(second);
    expect(project).toEqual(load(first));
    // The imported lengths travelled through the written design file (two-bus-lengths.csv line 5).
    const dq0 = project.nets.find((n) => n.name === 'DQ0')!;
    expect(dq0.elements.filter((e) => e.kind === 'segment').map((e) => (e as { length: number }).length)).toEqual([3e-3, 40.5e-3]);
    expect(await checkJson(second)).toEqual(await checkJson(first));
  }, 120_000);
});
