/**
 * Authoring edits on a project file (docs/design-file.md §9): create, rename and delete buses, nets
 * and parts, structural net edits, a suggested termination and a bus template, each one transaction
 * with a change-log line; refusals name the referrers; undo and redo 25 deep survive closing and
 * reopening the file (migration 007). Expected projects are the previous ones, compared exactly.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { readDesign } from '../../../core/design/index.js';
import {
  applyBusTemplate, applyTermination, createBus, createNet, deleteBus, deleteNet, deletePart, insertNetElement,
  removeNetElement, renameBus, renameNet, renamePart,
} from '../../../core/design/edits.js';

const dir = mkdtempSync(join(tmpdir(), 'slackline-authoring-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const board = () => readDesign('two-bus.design.yaml', readFileSync(join(import.meta.dirname, 'two-bus.design.yaml'), 'utf8'));

function fresh(name: string): ProjectStore {
  return ProjectStore.create(join(dir, `${name}.slackline`), board(), { author: 'tester' });
}

describe('authoring edits', () => {
  it('renames follow every reference; deletes of referenced things name the referrers', () => {
    const store = fresh('rename');
    try {
      store.authorEdit('rename-bus', (p) => renameBus(p, 'LANE0', 'BYTE0'));
      store.authorEdit('rename-net', (p) => renameNet(p, 'DQS0', 'STROBE0'));
      store.authorEdit('rename-part', (p) => renamePart(p, 'MEM-IO', 'DRAM-IO'));
      const p = store.load();
      expect(p.buses[0]).toMatchObject({ name: 'BYTE0', referenceNet: 'STROBE0' });
      expect(p.nets.filter((n) => n.bus === 'BYTE0')).toHaveLength(9);
      expect(p.nets.find((n) => n.name === 'DQ3')!.receivers[0].part).toBe('DRAM-IO');
      expect(() => store.authorEdit('delete-bus', (q) => deleteBus(q, 'BYTE0'))).toThrow(/bus BYTE0: still has nets STROBE0, DQ0, DQ1/);
      expect(() => store.authorEdit('delete-net', (q) => deleteNet(q, 'STROBE0'))).toThrow(/net STROBE0: is the clock or strobe of bus BYTE0/);
      expect(() => store.authorEdit('delete-part', (q) => deletePart(q, 'DRAM-IO'))).toThrow(/part DRAM-IO: is used by nets STROBE0, DQ0/);
      expect(store.changeLog(3).map((c) => c.action)).toEqual(['rename-part', 'rename-net', 'rename-bus']);
    } finally {
      store.close();
    }
  });

  it('a refused edit changes nothing and records nothing', () => {
    const store = fresh('refused');
    try {
      const before = store.load();
      // A segment on a layer the stackup lacks fails the whole-project validation after the edit.
      expect(() => store.authorEdit('insert-element', (p) => insertNetElement(p, 'DQ0', 1, { kind: 'segment', a: 'n1', b: 'x', layer: 'L9', width: 1e-4, length: 1e-3 })))
        .toThrow(/layer "L9" is not a copper layer/);
      expect(store.load()).toEqual(before);
      expect(store.undoHistory().undo).toEqual([]);
    } finally {
      store.close();
    }
  });

  it('structural edits, a suggested termination and a bus template', () => {
    const store = fresh('structure');
    try {
      store.authorEdit('insert-element', (p) => insertNetElement(p, 'A0', 0, { kind: 'capacitor', a: 'drv', b: 'gnd', farads: 1e-12 }));
      expect(store.load().nets.find((n) => n.name === 'A0')!.elements[0]).toEqual({ kind: 'capacitor', a: 'drv', b: 'gnd', farads: 1e-12 });
      store.authorEdit('remove-element', (p) => removeNetElement(p, 'A0', 0));
      // Removing the only element that reaches the receiver's node is refused (U2 would sit on nothing).
      expect(() => store.authorEdit('remove-element', (p) => removeNetElement(p, 'DQ0', 3))).toThrow(/leaves U2 on no element/);

      store.authorEdit('apply-termination', (p) => applyTermination(p, 'DQ0', { kind: 'series', ohms: 33 }));
      const dq0 = store.load().nets.find((n) => n.name === 'DQ0')!;
      expect(dq0.driver.node).toBe('drv_pin');
      expect(dq0.elements[0]).toEqual({ kind: 'resistor', a: 'drv_pin', b: 'drv', ohms: 33 });
      store.authorEdit('apply-termination', (p) => applyTermination(p, 'A3', { kind: 'parallel-end', ohms: 47, node: 'rx', vtt: 0.75 }));
      const a3 = store.load().nets.find((n) => n.name === 'A3')!;
      expect(a3.rails).toEqual({ vtt: 0.75, vtt_end: 0.75 });
      expect(a3.elements.at(-1)).toEqual({ kind: 'resistor', a: 'rx', b: 'vtt_end', ohms: 47 });

      store.authorEdit('create-bus', (p) => createBus(p, { name: 'SPARE', kind: 'common-clock', description: '', referenceNet: null, timing: { kind: 'common-clock', cycleTime: 10e-9, clockSkew: 0, jitter: 0 }, allowances: [] }));
      const template = 'driver: {part: CTRL-CA, designator: U1}\npath:\n  - trace: {layer: TOP, length: 20mm}\n  - receiver: {part: MEM-CA, designator: U5}\n';
      store.authorEdit('create-net', (p) => createNet(p, { ...p.nets.find((n) => n.name === 'A1')!, name: 'S0', bus: 'SPARE' }));
      store.authorEdit('apply-template', (p) => applyBusTemplate(p, 'SPARE', template));
      const s0 = store.load().nets.find((n) => n.name === 'S0')!;
      expect(s0.elements).toEqual([{ kind: 'segment', a: 'drv', b: 'n1', layer: 'TOP', width: 6 * 25.4e-6, length: 20e-3 }]);
      expect(s0.receivers).toEqual([{ part: 'MEM-CA', node: 'n1', designator: 'U5' }]);
      // Column 20: two spaces, "- ", "trace: ", "{", "layer: " take 19 characters before L7 (hand count).
      expect(() => applyBusTemplate(store.load(), 'SPARE', 'driver: {part: CTRL-CA, designator: U1}\npath:\n  - trace: {layer: L7, length: 2mm}\n'))
        .toThrow(/template of bus SPARE:3:20: path\[0\]\.trace\.layer: layer "L7" is not in the stackup/);
    } finally {
      store.close();
    }
  });

  it('undo and redo 25 edits deep, across closing and reopening the file', () => {
    const path = join(dir, 'undo.slackline');
    const first = ProjectStore.create(path, board(), { author: 'tester' });
    const states = [first.load()];
    for (let i = 0; i < 25; i += 1) {
      first.authorEdit('rename-net', (p) => renameNet(p, i === 0 ? 'DQ0' : `D${i - 1}`, `D${i}`));
      states.push(first.load());
    }
    first.close();

    const reopened = ProjectStore.open(path, { author: 'tester' });
    try {
      expect(reopened.undoHistory().undo).toHaveLength(25);
      for (let i = 25; i > 0; i -= 1) {
        expect(reopened.undo()).toBe(`undid rename-net: renamed net ${i === 1 ? 'DQ0' : `D${i - 2}`} to D${i - 1}`);
        expect(reopened.load()).toEqual(states[i - 1]);
      }
      expect(() => reopened.undo()).toThrow(/there is nothing to undo/);
      for (let i = 1; i <= 3; i += 1) {
        reopened.redo();
        expect(reopened.load()).toEqual(states[i]);
      }
      // A new edit after undoing clears what could be redone.
      reopened.authorEdit('rename-bus', (p) => renameBus(p, 'ADDR', 'CA'));
      expect(reopened.undoHistory().redo).toEqual([]);
      expect(reopened.changeLog(2).map((c) => c.action)).toEqual(['rename-bus', 'redo']);
    } finally {
      reopened.close();
    }
  });

  it('a file from before migration 007 gains the undo stack when opened, then undoes', () => {
    const path = join(dir, 'v6.slackline');
    ProjectStore.create(path, board(), { author: 'tester' }).close();
    // Turn it into a version 6 file: without the table and the record of migration 007.
    const raw = new Database(path);
    // Later migrations' tables and columns go too (008 IBIS files, 009 corner pairing, 010 slew derating,
    // 011 field solutions, 012 waivers, 014 the input revision and its triggers), so that 007 onwards apply again.
    const triggers = raw.prepare("SELECT name FROM sqlite_schema WHERE type = 'trigger' AND name LIKE '%\\_revision\\_%' ESCAPE '\\'").all() as { name: string }[];
    raw.exec(triggers.map((t) => `DROP TRIGGER ${t.name};`).join(' ') + ' DROP TABLE input_revision;');
    raw.exec([
      'DROP TABLE part_ibis; DROP TABLE ibis_file; DROP TABLE undo_entry; DROP TABLE field_solution; DROP TABLE waiver;',
      'ALTER TABLE bus DROP COLUMN corner_pairing; ALTER TABLE part_receiver DROP COLUMN slew_derating;',
      'DELETE FROM schema_migration WHERE version >= 7; PRAGMA user_version = 6;',
    ].join(' '));
    raw.close();
    const store = ProjectStore.open(path, { author: 'tester' });
    try {
      expect(store.migratedFrom).toBe(6);
      const before = store.load();
      store.authorEdit('delete-net', (p) => deleteNet(p, 'DQ7'));
      expect(store.load().nets).toHaveLength(before.nets.length - 1);
      store.undo();
      expect(store.load()).toEqual(before);
    } finally {
      store.close();
    }
  });
});
