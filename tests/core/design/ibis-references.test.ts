/**
 * IBIS references in design files (docs/design-file.md, docs/ibis.md §9): ibisFiles [{name, path}]
 * with paths relative to the design file (the host supplies their text), parts[].ibis {file, model};
 * round trip, and the problems named with line and field. IBIS text: the invented fixtures/ibis files.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { checkDesign, designIbisPaths, projectToDesignText, readDesign } from '../../../core/design/index.js';
import { buildLinearDemoProject as buildDemoProject } from '../../../fixtures/demo/demo-project.js';
import { sha256Hex } from '../../../core/hash/sha256.js';
import type { ProjectData } from '../../../core/project/model.js';

const WREN = readFileSync(new URL('../../../fixtures/ibis/wren_mc7.ibs', import.meta.url), 'utf8');

function withIbis(): ProjectData {
  const p = buildDemoProject();
  const driverPart = p.parts.find((x) => x.driver !== null)!;
  driverPart.ibis = { file: 'wren_mc7.ibs', model: 'dq_drv40' };
  p.ibisFiles = [{ name: 'wren_mc7.ibs', sha256: sha256Hex(WREN), text: WREN }];
  return p;
}

describe('design files with IBIS references', () => {
  it('round-trips a project whose part uses an IBIS model', () => {
    const project = withIbis();
    const text = projectToDesignText(project);
    expect(text).toMatch(/ibisFiles:\n\s+- \{name: wren_mc7\.ibs, path: wren_mc7\.ibs\}/);
    expect(text).toMatch(/ibis: \{file: wren_mc7\.ibs, model: dq_drv40\}/);
    expect(designIbisPaths('board.yaml', text)).toEqual(['wren_mc7.ibs']);
    expect(readDesign('board.yaml', text, new Map([['wren_mc7.ibs', WREN]]))).toEqual(project);
  });

  it('round-trips the [Pin] a part names (docs/ibis.md §9)', () => {
    const project = withIbis();
    const part = project.parts.find((x) => x.ibis)!;
    part.ibis = { file: 'wren_mc7.ibs', model: 'dq_drv40', pin: 'A2' };
    const text = projectToDesignText(project);
    expect(text).toMatch(/ibis: \{file: wren_mc7\.ibs, model: dq_drv40, pin: A2\}/);
    expect(readDesign('board.yaml', text, new Map([['wren_mc7.ibs', WREN]]))).toEqual(project);
  });

  it('names the ibisFiles path that was not read and the part that names an unlisted file', () => {
    const project = withIbis();
    const text = projectToDesignText(project).replace('path: wren_mc7.ibs', 'path: models/missing.ibs');
    const r = checkDesign('board.yaml', text);
    expect(r.project).toBeNull();
    expect(r.problems.some((m) => /^board\.yaml:\d+:\d+: ibisFiles\[0\]\.path: "models\/missing\.ibs" was not read/.test(m))).toBe(true);

    const unlisted = projectToDesignText(project).replace('ibis: {file: wren_mc7.ibs', 'ibis: {file: other.ibs');
    const u = checkDesign('board.yaml', unlisted, new Map([['wren_mc7.ibs', WREN]]));
    expect(u.problems.some((m) => /parts\[\d+\]\.ibis\.file: IBIS file "other\.ibs" is not listed under ibisFiles/.test(m))).toBe(true);
  });

  it('a design without IBIS files gives a project without ibisFiles (backward compatible)', () => {
    const plain = buildDemoProject();
    const back = readDesign('plain.yaml', projectToDesignText(plain));
    expect(back.ibisFiles).toBeUndefined();
    expect(back.parts.every((x) => x.ibis === undefined)).toBe(true);
  });
});
