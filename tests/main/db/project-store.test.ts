import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { ProjectStore } from '../../../main/services/project/project-store.js';
import { latestVersion } from '../../../main/services/db/migrations.js';
import { buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { IO_STANDARDS } from '../../../core/project/io-standards.js';
import { InputError } from '../../../core/errors.js';
import type { NetElement, PartModel } from '../../../core/project/model.js';
import { makeTempDir } from './temp-files.js';

describe('ProjectStore on real files', () => {
  let temp: ReturnType<typeof makeTempDir>;
  const open: ProjectStore[] = [];
  const track = (store: ProjectStore) => (open.push(store), store);

  beforeEach(() => {
    temp = makeTempDir();
  });
  afterEach(() => {
    for (const store of open.splice(0)) {
      if (store.isOpen) {
        // Every writing test ends with a sound file (SQLite's own check, common practice, no source).
        expect(store.integrityCheck()).toBe('ok');
        store.close();
      }
    }
    temp.remove();
  });

  it('keeps everything after create, close and reopen', () => {
    const path = temp.file('board.slackline');
    ProjectStore.create(path, buildDemoProject(), { author: 'tester' }).close();
    const store = track(ProjectStore.open(path));
    // Deep equality with the data written: every field, order and SI value round-trips exactly
    // (SQLite REAL is an IEEE double like a JS number — sqlite.org/datatype3.html).
    expect(store.load()).toStrictEqual(buildDemoProject());
    expect(store.changeLog(10)).toMatchObject([{ author: 'tester', action: 'create-project' }]);
  });

  it('opens with WAL, synchronous=FULL and foreign keys on', () => {
    const store = track(ProjectStore.create(temp.file('p.slackline'), buildDemoProject()));
    // Settings required by docs/design.md §8 (synchronous FULL = 2 per sqlite.org/pragma.html).
    expect(store.settings()).toMatchObject({ foreignKeys: 1, journalMode: 'wal', synchronous: 2, schemaVersion: latestVersion() });
  });

  it('refuses to create over an existing project', () => {
    const path = temp.file('p.slackline');
    ProjectStore.create(path, buildDemoProject()).close();
    expect(() => ProjectStore.create(path, buildDemoProject())).toThrow(/already exists/);
    const store = track(ProjectStore.open(path));
    expect(store.load().nets).toHaveLength(buildDemoProject().nets.length);
  });

  it('refuses an invalid project before creating a file', () => {
    const data = buildDemoProject();
    data.nets[3].elements[0] = { ...(data.nets[3].elements[0] as Extract<NetElement, { kind: 'segment' }>), layer: 'L9_NONE' };
    expect(() => ProjectStore.create(temp.file('bad.slackline'), data)).toThrow(
      'element 1 (segment) of net DQ2: layer "L9_NONE" is not a copper layer of the stackup',
    );
  });

  it('writes every edit, survives reopen and records it in the change log', () => {
    const path = temp.file('p.slackline');
    // Tracked so that afterEach closes it even when a step below throws before the explicit close.
    const store = track(ProjectStore.create(path, buildDemoProject(), { author: 'ana' }));
    const expected = buildDemoProject();

    store.updateInfo({ boardRevision: 'C', guardBand: 30e-12 });
    expected.info = { ...expected.info, boardRevision: 'C', guardBand: 30e-12 };

    const stackup = structuredClone(expected.stackup);
    stackup.layers[2].dk = 3.6;
    store.replaceStackup(stackup);
    expected.stackup = stackup;

    const part: PartModel = { ...structuredClone(expected.parts[0]), name: 'MC-DQ-STRONG', description: 'stronger variant' };
    part.driver!.routHigh = 28;
    store.upsertPart(part);
    expected.parts.push(part);

    const bus = structuredClone(expected.buses[0]);
    bus.allowances.push({ name: 'board skew', value: 5e-12, appliesTo: 'setup', note: 'added in a test' });
    store.updateBus(bus);
    expected.buses[0] = bus;

    const element: NetElement = { kind: 'segment', a: 'v1', b: 'v2', layer: 'L6_SIG', width: 0.11e-3, length: 41e-3 };
    store.updateNetElement('DQ0', 2, element);
    expected.nets[1].elements[2] = element;

    const corners = [...expected.corners, { ...expected.corners[0], name: 'slow-hot', edgeRate: 1.4 }];
    store.updateCorners(corners);
    expected.corners = corners;
    store.close();

    const reopened = track(ProjectStore.open(path, { author: 'ben' }));
    expect(reopened.load()).toStrictEqual(expected);
    const log = reopened.changeLog(10);
    expect(log.map((e) => e.action)).toEqual([
      'update-corners', 'update-net-element', 'update-bus', 'upsert-part', 'replace-stackup', 'update-info', 'create-project',
    ]);
    expect(log.every((e) => e.author === 'ana')).toBe(true);
    expect(log[1].detail).toContain('net DQ0 element 3');
    expect(reopened.changeLog(2)).toHaveLength(2);
  });

  it('refuses an edit that breaks the project, changing nothing', () => {
    const store = track(ProjectStore.create(temp.file('p.slackline'), buildDemoProject()));
    const before = store.load();
    const logBefore = store.changeLog(100);

    const stackup = structuredClone(before.stackup);
    stackup.layers = stackup.layers.filter((l) => l.name !== 'L3_SIG');
    expect(() => store.replaceStackup(stackup)).toThrow(/layer "L3_SIG" is not a copper layer/);

    const receiverOnly: PartModel = { ...structuredClone(before.parts[0]), driver: null };
    expect(() => store.upsertPart(receiverOnly)).toThrow(/driver U1.*part "MC-DQ" has no driver model/);

    expect(() => store.updateNetElement('DQ0', 99, { kind: 'via', a: 'v1', farads: 1e-12 })).toThrow(
      'net DQ0 element 100: no such element (the net has 5)',
    );
    expect(() => store.updateNetElement('NOPE', 0, { kind: 'via', a: 'v1', farads: 1e-12 })).toThrow('net NOPE: is not in the project');
    expect(() => store.updateNetElement('DQ0', 1, { kind: 'via', a: 'v1', farads: Number.NaN })).toThrow(InputError);
    expect(() => store.updateInfo({ settleBand: -1 })).toThrow(/project settle band/);
    expect(() => store.updateCorners([])).toThrow(/at least one corner/);

    expect(store.load()).toStrictEqual(before);
    expect(store.changeLog(100)).toStrictEqual(logBefore);
  });

  it('keeps results under their input hash and replaces them on a second put', () => {
    const path = temp.file('p.slackline');
    const store = track(ProjectStore.create(path, buildDemoProject())); // closed by afterEach if a step throws
    expect(store.getCached('abc')).toBeNull();
    store.putCached('abc', '{"margin":1e-11}');
    store.putCached('abc', '{"margin":2e-11}');
    store.putCached('def', '[1,2]');
    const changes = store.changeLog(100).length;
    store.close();
    const reopened = track(ProjectStore.open(path));
    expect(reopened.getCached('abc')).toBe('{"margin":2e-11}');
    expect(reopened.getCached('def')).toBe('[1,2]');
    // Caching results is not a project edit: nothing in the change log.
    expect(reopened.changeLog(100)).toHaveLength(changes);
    // The table refuses text that is not JSON (CHECK json_valid).
    expect(() => reopened.putCached('bad', '{oops')).toThrow(/CHECK constraint failed/);
    expect(reopened.pruneCache(5)).toBe(0);
    expect(reopened.pruneCache(0)).toBe(2);
    expect(reopened.getCached('abc')).toBeNull();
  });

  it('stores the I/O standard presets with their cited sources', () => {
    const store = track(ProjectStore.create(temp.file('p.slackline'), buildDemoProject()));
    const stored = store.ioStandards();
    expect(stored.map((p) => p.name).sort()).toEqual(IO_STANDARDS.map((p) => p.name).sort());
    for (const preset of stored) {
      expect(preset).toStrictEqual(IO_STANDARDS.find((p) => p.name === preset.name));
      expect(preset.source).toMatch(/JEDEC/);
    }
  });
});
