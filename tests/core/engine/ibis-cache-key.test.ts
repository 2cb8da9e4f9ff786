/**
 * A net's results-cache inputs carry the SHA-256 of the IBIS files its parts use (docs/ibis.md §9),
 * so replacing a file's content under the same name re-solves the net; nets without IBIS parts keep
 * the inputs they had (no cache invalidated for them). Project: the invented demo on its linear models.
 */
import { describe, expect, it } from 'vitest';
import { netSimulationInputs } from '../../../core/engine/board.js';
import { hashOf } from '../../../core/hash/index.js';
import { buildLinearDemoProject as buildDemoProject } from '../../../fixtures/demo/demo-project.js';

describe('IBIS files in a net\'s cache key', () => {
  it('changes when the file content changes, and is untouched without IBIS parts', () => {
    const plain = buildDemoProject();
    const net = plain.nets[0];
    const before = netSimulationInputs(plain, net);
    expect(Object.keys(before as object).sort()).toEqual(['net', 'parts', 'shared']);

    const withIbis = buildDemoProject();
    const part = withIbis.parts.find((p) => p.name === net.driver.part)!;
    part.ibis = { file: 'x.ibs', model: 'm' };
    const key = (sha: string) => {
      withIbis.ibisFiles = [{ name: 'x.ibs', sha256: sha, text: 'not parsed here' }];
      return hashOf(netSimulationInputs(withIbis, net));
    };
    expect(key('a'.repeat(64))).not.toBe(key('b'.repeat(64)));
  });
});
