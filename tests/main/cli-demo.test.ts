/**
 * The README's main job: `slackline demo --out DIR` creates the demo board, checks it and writes the
 * report in all three formats. Expected statuses come from the demo's own list of deliberate faults
 * (fixtures/demo/demo-project.ts; invented data, no external source).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, readFileSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../main/cli/index.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-demo-cli-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('slackline demo', () => {
  it('creates the project, checks every bus and writes the PDF, HTML and CSV report', async () => {
    let out = '';
    let err = '';
    const status = await main(['demo', '--out', dir, '--json'], { out: (t) => void (out += t), err: (t) => void (err += `${t}\n`) });
    expect(status).toBe(0);
    const answer = JSON.parse(out) as { path: string; status: Record<string, string>; files: string[] };
    expect(existsSync(answer.path)).toBe(true);
    // DQ45 (BYTE5), DQ58 (BYTE7), A13 (ADDR_CMD) and LB_D7 (LOCAL) are broken on purpose; DQ12 (BYTE1) is tight.
    expect(answer.status).toMatchObject({ BYTE0: 'pass', BYTE1: 'tight', BYTE5: 'fail', BYTE7: 'fail', ADDR_CMD: 'fail', LOCAL: 'fail' });
    expect(answer.files.map((f) => f.split('.').pop()).sort()).toEqual(['csv', 'html', 'pdf']);
    for (const file of answer.files) expect(statSync(file).size).toBeGreaterThan(1000);
    expect(readFileSync(answer.files.find((f) => f.endsWith('.pdf'))!).subarray(0, 5).toString()).toBe('%PDF-');
    expect(err).toMatch(/solving: 100 %/); // progress is shown for the long solve
  });
});
