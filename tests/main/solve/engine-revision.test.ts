/**
 * Guards ENGINE_REVISION (core/engine/jobs.ts): cached results are keyed by it, so a change to core/
 * that alters results must bump it, or users would be served results of the old code as fresh.
 * The test solves a fixed fixture board (fixtures/report/heron-ridge, invented) and compares a
 * fingerprint of the results with the one recorded for the current revision in engine-revision.json.
 * Results changed and the revision did not: fails. Revision bumped: record the new fingerprint (the
 * failure message prints it). Source: common practice (golden-result test), no source.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { ENGINE_REVISION } from '../../../core/engine/jobs.js';
import type { ProjectData } from '../../../core/project/model.js';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { SolveService } from '../../../main/services/solve/solve-service.js';

const recorded = JSON.parse(readFileSync(new URL('./engine-revision.json', import.meta.url), 'utf8')) as { revision: number; fingerprint: string };
const fixture = JSON.parse(readFileSync(new URL('../../../fixtures/report/heron-ridge.project.json', import.meta.url), 'utf8')) as ProjectData;
const dir = mkdtempSync(join(tmpdir(), 'slackline-revision-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

/**
 * Every number rounded to 10 significant digits (far below any reported precision, far above the
 * last-bit differences a different CPU could give), run-specific fields dropped.
 */
function fingerprint(value: unknown): string {
  const text = JSON.stringify(value, (key, v) => {
    if (key === 'solvedAt' || key === 'inputHash' || key === 'toolVersion' || key === 'fingerprint') return undefined;
    return typeof v === 'number' && Number.isFinite(v) ? Number(v.toPrecision(10)) : v;
  });
  return createHash('sha256').update(text).digest('hex').slice(0, 16);
}

describe('engine revision', () => {
  it('changes whenever the results of core change', async () => {
    const store = ProjectStore.create(join(dir, 'board.slackline'), fixture);
    const service = new SolveService(store, { workers: 0 });
    try {
      const board = await service.solveBoardSync();
      const now = fingerprint(board);
      const advice = `results fingerprint ${now} at ENGINE_REVISION ${ENGINE_REVISION}; recorded ${recorded.fingerprint} at revision ${recorded.revision}. ` +
        (recorded.revision === ENGINE_REVISION
          ? 'Core results changed: bump ENGINE_REVISION in core/engine/jobs.ts, then record the new fingerprint in tests/main/solve/engine-revision.json.'
          : 'ENGINE_REVISION was bumped: record the new revision and fingerprint in tests/main/solve/engine-revision.json.');
      expect({ revision: ENGINE_REVISION, fingerprint: now }, advice).toEqual(recorded);
    } finally {
      await service.close();
      store.close();
    }
  });
});
