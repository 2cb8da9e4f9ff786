/**
 * Authoring through the service API every host serves (SlacklineApi: editProject, undo, redo,
 * getEditHistory, applySuggestedTermination; docs/design-file.md §9): argument schemas refuse a
 * malformed edit, edits are undone and redone across a reopen of the workbench, and the check's
 * termination suggestion for the demo's deliberately unterminated LB_D7 (fixtures/demo/README.md:
 * series resistor left out) is applied where the check placed it.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createDemo, openWorkbench } from '../../../main/services/compose.js';
import { parseArguments, PayloadError } from '../../../main/services/api/schemas.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-api-authoring-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('authoring through SlacklineApi', () => {
  it('refuses a malformed edit before it reaches the service', () => {
    expect(() => parseArguments('editProject', [{ op: 'renameBus', from: 'A' }])).toThrow(PayloadError);
    expect(() => parseArguments('editProject', [{ op: 'explode' }])).toThrow(PayloadError);
    expect(parseArguments('editProject', [{ op: 'deleteNet', name: 'DQ0' }])).toEqual([{ op: 'deleteNet', name: 'DQ0' }]);
  });

  it('create a bus, add a net from a template, insert a termination, undo, redo, reopen', async () => {
    const path = createDemo(join(dir, 'a'));
    let bench = await openWorkbench(path);
    try {
      const { api } = bench;
      await api.editProject({
        op: 'createBus',
        bus: { name: 'SPARE', kind: 'common-clock', description: 'added in the test', referenceNet: null, timing: { kind: 'common-clock', cycleTime: 10e-9, clockSkew: 0, jitter: 0 }, allowances: [] },
      });
      const demo = (await api.getProject()).data;
      const like = demo.nets.find((n) => n.name === 'LB_D0')!;
      await api.editProject({ op: 'createNet', net: { ...like, name: 'SP0', bus: 'SPARE' } });
      await api.editProject({
        op: 'applyBusTemplate', bus: 'SPARE',
        template: 'driver: {part: MC-LB, designator: U1}\npath:\n  - {name: rs, series: 22ohm}\n  - trace: {layer: L1_TOP, length: 40mm}\n  - receiver: {part: EXP-LB, designator: U20}\n',
      });
      const summary = await api.editProject({ op: 'insertNetElement', net: 'SP0', index: 2, element: { kind: 'resistor', a: 'n2', b: 'gnd', ohms: 100 } });
      expect(summary.data.nets.find((n) => n.name === 'SP0')!.elements.map((e) => e.kind)).toEqual(['resistor', 'segment', 'resistor']);
      const undone = await api.undo();
      expect(undone.data.nets.find((n) => n.name === 'SP0')!.elements.map((e) => e.kind)).toEqual(['resistor', 'segment']);
      await api.redo();
      expect((await api.getEditHistory()).undo.map((e) => e.action)).toEqual(['insert-net-element', 'apply-bus-template', 'create-net', 'create-bus']);
      await expect(api.editProject({ op: 'deleteBus', name: 'SPARE' })).rejects.toThrow(/still has nets SP0/);
    } finally {
      await bench.close();
    }
    bench = await openWorkbench(path);
    try {
      const { api } = bench;
      expect((await api.getEditHistory()).undo).toHaveLength(4);
      for (let i = 0; i < 4; i += 1) await api.undo();
      const back = (await api.getProject()).data;
      expect(back.buses.some((b) => b.name === 'SPARE')).toBe(false);
      expect(back.nets.some((n) => n.name === 'SP0')).toBe(false);
    } finally {
      await bench.close();
    }
  }, 60_000);

  it('applies the suggested termination of LB_D7 in one action', async () => {
    const path = createDemo(join(dir, 'b'));
    const bench = await openWorkbench(path);
    try {
      const { api } = bench;
      const result = await api.solveNet('LB_D7');
      expect(result.suggestion).not.toBeNull();
      const before = (await api.getProject()).data.nets.find((n) => n.name === 'LB_D7')!;
      const after = (await api.applySuggestedTermination('LB_D7')).data.nets.find((n) => n.name === 'LB_D7')!;
      const s = result.suggestion!;
      if (s.kind === 'series') {
        expect(after.elements[0]).toEqual({ kind: 'resistor', a: `${before.driver.node}_pin`, b: before.driver.node, ohms: s.ohms });
        expect(after.driver.node).toBe(`${before.driver.node}_pin`);
      } else {
        expect(after.elements.at(-1)).toMatchObject({ kind: 'resistor', ohms: s.ohms });
      }
      expect(after.elements).toHaveLength(before.elements.length + 1);
      expect((await api.getEditHistory()).undo[0].action).toBe('apply-termination');
    } finally {
      await bench.close();
    }
  }, 60_000);
});
