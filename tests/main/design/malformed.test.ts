/**
 * Malformed design files: each one is refused by `slackline new --from` with the exact place
 * (file:line:column), the field path and what was expected, and no project file is written.
 * The expected place is found in the test's own text by plain string search for the offending
 * token (independent of the YAML library); the rules checked are those of docs/design-file.md §7
 * (common practice, no source).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { main } from '../../../main/cli/index.js';

const BASE = `version: 1
project: {name: Mini, guardBand: 20ps}
stackup:
  layers:
    - {name: TOP, kind: copper, role: signal, thickness: 0.035mm, defaultWidth: 0.15mm}
    - {name: PP, kind: dielectric, thickness: 0.1mm, dk: 4}
    - {name: GND, kind: copper, role: plane, thickness: 0.035mm}
parts:
  - name: DRV
    driver: {vol: 0V, voh: 1.8V, routHigh: 30ohm, routLow: 30ohm, riseTime: 300ps, fallTime: 300ps, tcoMin: 1ns, tcoMax: 3ns, refLoad: {ohms: 50ohm, vtt: 0.9V}, vmeas: 0.9V}
  - name: RCV
    receiver: {cin: 2pF, vil: 0.63V, vih: 1.17V, vmaxAbs: 2.1V, vminAbs: -0.3V, tsetup: 1ns, thold: 0.5ns}
buses:
  - name: B1
    kind: common-clock
    referenceNet: CLK
    timing: {cycleTime: 10ns}
    template:
      driver: {part: DRV, designator: U1}
      path:
        - {name: rs, series: 22ohm}
        - trace: {layer: TOP, length: 50mm}
        - receiver: {part: RCV, designator: U2}
    nets:
      - {name: CLK, role: clock}
      - {name: D0}
      - {name: D1}
      - name: D2
        driver: {part: DRV, node: a, designator: U1}
        receivers: [{part: RCV, node: c, designator: U2}]
        elements:
          - {kind: segment, a: a, b: b, layer: TOP, length: 20mm}
          - {kind: segment, a: b, b: c, layer: TOP, length: 20mm}
`;

/** 1-based line:column of `token`, searched after the end of the first `after` (plain text search). */
function placeOf(text: string, token: string, after = ''): string {
  const start = after ? text.indexOf(after) : 0;
  expect(start, `"${after}" must occur in the case text`).toBeGreaterThanOrEqual(0);
  const at = text.indexOf(token, start + after.length);
  expect(at, `"${token}" must occur in the case text`).toBeGreaterThanOrEqual(0);
  const before = text.slice(0, at).split('\n');
  return `${before.length}:${before[before.length - 1].length + 1}`;
}

function edit(from: string, to: string): string {
  expect(BASE.includes(from), `base holds "${from}"`).toBe(true);
  return BASE.replace(from, to);
}

interface Case {
  name: string;
  text: string;
  /** The offending token (and optionally the text it follows) whose place the message must name. */
  token: string;
  after?: string;
  /** Exact place "line:column" when there is no token (a missing field points at its parent). */
  place?: string;
  path: string;
  says: string;
}

const CASES: Case[] = [
  { name: 'unknown top-level key', text: `${BASE}colour: red\n`, token: 'colour', path: 'colour', says: 'unknown key "colour"' },
  { name: 'missing version', text: BASE.replace('version: 1\n', ''), token: 'project', place: '1:1', path: '(top level)', says: 'the field "version" is missing' },
  { name: 'wrong version', text: edit('version: 1', 'version: 2'), token: '2', path: 'version', says: 'must be 1' },
  { name: 'thickness without unit', text: edit('thickness: 0.1mm', 'thickness: 0.1'), token: '0.1', after: 'name: PP', path: 'stackup.layers[1].thickness', says: 'has no unit' },
  { name: 'unknown unit', text: edit('thickness: 0.1mm', 'thickness: 0.1furlong'), token: '0.1furlong', path: 'stackup.layers[1].thickness', says: 'unknown length unit "furlong"' },
  { name: 'Dk below 1', text: edit('dk: 4', 'dk: 0.5'), token: '0.5', path: 'stackup.layers[1].dk', says: 'out of range' },
  { name: 'duplicate layer name', text: edit('name: GND', 'name: TOP'), token: 'TOP', after: 'name: PP', path: 'stackup.layers[2].name', says: 'layer "TOP" is defined twice' },
  { name: 'copper layer without role', text: edit('role: plane, ', ''), token: '{name: GND', path: 'stackup.layers[2]', says: 'needs role' },
  { name: 'unknown layer kind', text: edit('kind: dielectric', 'kind: metal'), token: 'metal', path: 'stackup.layers[1].kind', says: 'must be one of "copper", "dielectric", "mask"' },
  { name: 'VOH below VOL', text: edit('voh: 1.8V', 'voh: -1V'), token: '-1V', path: 'parts[0].driver.voh', says: 'must be above vol' },
  { name: 'unknown I/O standard', text: edit('  - name: RCV\n', '  - name: RCV\n    ioStandard: XYZ15\n'), token: 'XYZ15', path: 'parts[1].ioStandard', says: 'unknown I/O standard "XYZ15"' },
  { name: 'part with no model', text: edit('buses:\n', '  - name: EMPTY\nbuses:\n'), token: 'name: EMPTY', path: 'parts[2]', says: 'needs a driver, a receiver or both' },
  { name: 'negative rise time', text: edit('riseTime: 300ps', 'riseTime: -300ps'), token: '-300ps', path: 'parts[0].driver.riseTime', says: 'out of range' },
  { name: 'VIL above VIH', text: edit('vil: 0.63V', 'vil: 1.5V'), token: '1.17V', path: 'parts[1].receiver.vih', says: 'must be above vil' },
  { name: 'unknown bus kind', text: edit('kind: common-clock', 'kind: sideways'), token: 'sideways', path: 'buses[0].kind', says: 'must be one of "common-clock", "source-synchronous"' },
  { name: 'clock net not in the bus', text: edit('referenceNet: CLK', 'referenceNet: CLK9'), token: 'CLK9', path: 'buses[0].referenceNet', says: 'net "CLK9" is not a net of bus B1' },
  { name: 'timing field of the other bus kind', text: edit('timing: {cycleTime: 10ns}', 'timing: {cycleTime: 10ns, tValidBefore: 1ns}'), token: 'tValidBefore', path: 'buses[0].timing.tValidBefore', says: 'does not apply to a common-clock bus' },
  { name: 'missing cycle time', text: edit('timing: {cycleTime: 10ns}', 'timing: {jitter: 50ps}'), token: '{jitter', path: 'buses[0].timing.cycleTime', says: 'is missing' },
  { name: 'template layer not in the stackup', text: edit('layer: TOP, length: 50mm', 'layer: L9, length: 50mm'), token: 'L9', path: 'buses[0].template.path[1].trace.layer', says: 'layer "L9" is not in the stackup' },
  { name: 'template receiver part undefined', text: edit('receiver: {part: RCV,', 'receiver: {part: RCVX,'), token: 'RCVX', path: 'buses[0].template.path[2].receiver.part', says: 'part "RCVX" is not defined under parts' },
  { name: 'step with two kinds', text: edit('{name: rs, series: 22ohm}', '{name: rs, series: 22ohm, via: 1pF}'), token: '{name: rs', path: 'buses[0].template.path[0]', says: 'this one has series and via' },
  { name: 'unknown step key', text: edit('{name: rs, series: 22ohm}', '{name: rs, resistor: 22ohm}'), token: 'resistor', path: 'buses[0].template.path[0].resistor', says: 'unknown key "resistor"' },
  { name: 'override beyond the template traces', text: edit('{name: D0}', '{name: D0, segments: [{length: 1mm}, {length: 2mm}]}'), token: '{length: 2mm}', path: 'buses[0].nets[1].segments[1]', says: 'the template has 1 trace' },
  { name: 'override length without unit', text: edit('{name: D0}', '{name: D0, segments: [{length: 12}]}'), token: '12', after: 'name: D0', path: 'buses[0].nets[1].segments[0].length', says: '12 has no unit' },
  { name: 'duplicate net name', text: edit('{name: D1}', '{name: D0}'), token: 'D0', after: '{name: D0}\n', path: 'buses[0].nets[2].name', says: 'net "D0" is defined twice' },
  { name: 'override of an unnamed step', text: edit('{name: D1}', '{name: D1, steps: {rx: null}}'), token: 'rx', path: 'buses[0].nets[2].steps.rx', says: 'the template has no step named "rx"' },
  { name: 'unconnected element', text: edit('{kind: segment, a: b, b: c,', '{kind: segment, a: x, b: c,'), token: '{kind: segment, a: x', path: 'buses[0].nets[3].elements[1]', says: 'not connected to the driver node "a"' },
  { name: 'field of another element kind', text: edit('layer: TOP, length: 20mm}\n          - {kind: segment, a: b', 'layer: TOP, length: 20mm, ohms: 5ohm}\n          - {kind: segment, a: b'), token: 'ohms', after: 'name: D2', path: 'buses[0].nets[3].elements[0].ohms', says: 'does not apply to a segment' },
  { name: 'segment on a dielectric layer', text: edit('{kind: segment, a: a, b: b, layer: TOP', '{kind: segment, a: a, b: b, layer: PP'), token: 'PP', after: 'name: D2', path: 'buses[0].nets[3].elements[0].layer', says: 'is a dielectric layer' },
  { name: 'termination to an undefined rail', text: edit('        - receiver: {part: RCV, designator: U2}\n', '        - receiver: {part: RCV, designator: U2}\n        - {terminate: {ohms: 50ohm, to: vtt}}\n'), token: 'vtt}', path: 'buses[0].template.path[3].terminate.to', says: '"vtt" is neither gnd nor a rail' },
  { name: 'trace on a layer without default width', text: edit('layer: TOP, length: 50mm', 'layer: GND, length: 50mm'), token: '{layer: GND', path: 'buses[0].template.path[1].trace', says: 'layer "GND" has no defaultWidth' },
  { name: 'unclosed flow map (YAML syntax)', text: edit('{name: D1}', '{name: D1'), token: '', place: '', path: '', says: '' },
  { name: 'duplicate key (YAML)', text: edit('project: {name: Mini,', 'project: {name: Mini, name: Other,'), token: 'name: Other', place: '', path: '', says: 'Map keys must be unique' },
];

const dir = mkdtempSync(join(tmpdir(), 'slackline-malformed-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

async function runNew(text: string, stem: string): Promise<{ status: number; err: string; project: string }> {
  const design = join(dir, `${stem}.yaml`);
  const project = join(dir, `${stem}.slackline`);
  writeFileSync(design, text);
  const err: string[] = [];
  const status = await main(['new', project, '--from', design], { out: () => {}, err: (t) => err.push(t) });
  return { status, err: err.join('\n'), project };
}

describe('malformed design files (slackline new --from)', () => {
  it('has at least 25 cases', () => {
    expect(CASES.length).toBeGreaterThanOrEqual(25); // the acceptance count, common practice, no source
  });

  it('accepts the unmodified base file (so every refusal below comes from its one edit)', async () => {
    const { status, err, project } = await runNew(BASE, 'base');
    expect(err).toBe('');
    expect(status).toBe(0);
    expect(existsSync(project)).toBe(true);
  });

  CASES.forEach((c, i) => {
    it(`refuses: ${c.name}`, async () => {
      const stem = `case-${i}`;
      const { status, err, project } = await runNew(c.text, stem);
      expect(status).toBe(2); // exit status 2 = bad input (main/cli/index.ts)
      expect(existsSync(project)).toBe(false);
      expect(existsSync(`${project}-wal`)).toBe(false);
      expect(err).toContain('nothing was written');
      if (c.name.startsWith('unclosed')) {
        // YAML syntax: the parser's place, on the broken line (line of "{name: D1" in the text).
        const line = c.text.split('\n').findIndex((l) => l.includes('{name: D1')) + 1;
        expect(err).toMatch(new RegExp(`${stem}\\.yaml:(${line}|${line + 1}):\\d+: `));
        return;
      }
      const place = c.place || placeOf(c.text, c.token, c.after);
      const prefix = `${stem}.yaml:${place}: `;
      if (c.path === '') {
        expect(err).toContain(prefix);
        expect(err).toContain(c.says);
        return;
      }
      expect(err).toContain(`${prefix}${c.path}: `);
      const line = err.split('\n').find((l) => l.includes(`${prefix}${c.path}: `))!;
      expect(line).toContain(c.says);
    });
  });

  it('lists every problem, not just the first', async () => {
    const text = BASE.replace('thickness: 0.1mm', 'thickness: 0.1').replace('voh: 1.8V', 'voh: -1V').replace('referenceNet: CLK', 'referenceNet: NOPE');
    const { status, err, project } = await runNew(text, 'three');
    expect(status).toBe(2);
    expect(existsSync(project)).toBe(false);
    expect(err).toContain('3 problems, nothing was written');
    // File order: the stackup (line 6), the part (line 10), the bus (line 16).
    const lines = err.split('\n').filter((l) => /three\.yaml:\d+:/.test(l));
    expect(lines.map((l) => /yaml:(\d+):/.exec(l)![1])).toEqual(['6', '10', '16']);
  });
});
