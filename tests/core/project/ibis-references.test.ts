/**
 * validateProject checks IBIS references by name (docs/ibis.md §9): a part's ibis.file must be a
 * stored file, and file names are unique. Project: the invented demo on its linear models.
 */
import { describe, expect, it } from 'vitest';
import { validateProject } from '../../../core/project/validate.js';
import { buildLinearDemoProject as buildDemoProject } from '../../../fixtures/demo/demo-project.js';

const record = { name: 'a.ibs', sha256: '0'.repeat(64), text: '[IBIS Ver] 5.0' };

describe('IBIS references in a project', () => {
  it('accepts a part naming a stored file and refuses one naming a missing file', () => {
    const p = buildDemoProject();
    p.parts[0].ibis = { file: 'a.ibs', model: 'm' };
    p.ibisFiles = [record];
    expect(() => validateProject(p)).not.toThrow();
    p.ibisFiles = [];
    expect(() => validateProject(p)).toThrow(`part ${p.parts[0].name} ibis.file: IBIS file "a.ibs" is not in the project`);
  });

  it('refuses two stored files of one name', () => {
    const p = buildDemoProject();
    p.ibisFiles = [record, { ...record }];
    expect(() => validateProject(p)).toThrow('IBIS file "a.ibs": the name is used twice');
  });
});
