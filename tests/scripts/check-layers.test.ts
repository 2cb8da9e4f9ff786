// The layering lint (scripts/check-layers.mjs, docs/design.md §7) checked on small trees written to a
// temp folder: one violating file per rule, each asserting the exact file:line reported, and a clean
// tree that passes. The rules themselves are the project's own (docs/design.md §7); no outside source.
import { mkdtempSync, mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { checkLayers, CORE_ORDER } from '../../scripts/check-layers.mjs';

let roots: string[] = [];
afterEach(() => {
  for (const root of roots) rmSync(root, { recursive: true, force: true });
  roots = [];
});

/** Writes `files` (repository-relative path -> text) under a fresh temp root and returns the root. */
function tree(files: Record<string, string>): string {
  const root = mkdtempSync(join(tmpdir(), 'slackline-layers-'));
  roots.push(root);
  for (const [path, text] of Object.entries(files)) {
    mkdirSync(dirname(join(root, path)), { recursive: true });
    writeFileSync(join(root, path), text);
  }
  return root;
}

/** The problems of a tree as `file:line` strings, sorted, so a test states exactly what is reported. */
function reported(files: Record<string, string>): string[] {
  return checkLayers({ root: tree(files) }).map((p) => `${p.file}:${p.line}`).sort();
}

function messages(files: Record<string, string>): string[] {
  return checkLayers({ root: tree(files) }).map((p) => `${p.file}:${p.line}: ${p.message}`);
}

// Every violating file below puts its offending statement on line 3 after two harmless lines, so a
// line count that is off by one in either direction fails.
const header = '// a module\nexport const before = 1;\n';

describe('check-layers: core/ stays pure', () => {
  it.each([
    ['node: scheme', "import { readFileSync } from 'node:fs';"],
    ['bare built-in on the old hand list', "import { join } from 'path';"],
    ['perf_hooks (missing from the old hand list)', "import { performance } from 'perf_hooks';"],
    ['dns (missing from the old hand list)', "import dns from 'dns';"],
    ['a built-in subpath', "import { readFile } from 'fs/promises';"],
    ['Electron', "import { app } from 'electron';"],
    ['the database driver', "import Database from 'better-sqlite3';"],
    ['vue', "import { ref } from 'vue';"],
    ['pinia', "import { defineStore } from 'pinia';"],
  ])('flags %s', (_name, statement) => {
    expect(reported({ 'core/units/a.ts': header + statement + '\n' })).toEqual(['core/units/a.ts:3']);
  });

  it.each(['main', 'renderer', 'fixtures', 'scripts', 'tests', 'bench'])('flags an import of %s/', (top) => {
    const problems = messages({ 'core/units/a.ts': header + `import { x } from '../../${top}/x.js';\n` });
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatch(new RegExp(`^core/units/a\\.ts:3: core/ must not import ${top}/`));
  });
});

describe('check-layers: the order of core/ folders', () => {
  it('lets a folder import its own files and lower rows', () => {
    expect(reported({
      'core/engine/a.ts': "import { b } from './b.js';\nimport { s } from '../solver/s.js';\nimport { e } from '../errors.js';\n",
      'core/errors.ts': 'export const e = 1;\n',
    })).toEqual([]);
  });

  it('flags an import of a higher row', () => {
    expect(messages({ 'core/stackup/a.ts': header + "import { run } from '../engine/run.js';\n" })).toEqual([
      'core/stackup/a.ts:3: core/ must not import core/engine/ (core/stackup/ may import only folders below it in CORE_ORDER) ("../engine/run.js")',
    ]);
  });

  it('flags an import between two folders of one row', () => {
    const row = CORE_ORDER.find((r) => r.length > 1 && !r.includes('errors'));
    expect(row).toBeDefined();
    const [first, second] = row!;
    expect(reported({ [`core/${first}/a.ts`]: header + `import { x } from '../${second}/x.js';\n` })).toEqual([`core/${first}/a.ts:3`]);
  });

  it('flags a base utility importing a domain folder (core/errors.ts counts as "errors")', () => {
    expect(reported({ 'core/errors.ts': header + "import { q } from './units/q.js';\n" })).toEqual(['core/errors.ts:3']);
  });

  it('flags any import of core/contract from outside it, even from the top row', () => {
    expect(messages({ 'core/report/a.ts': header + "import type { Api } from '../contract/api.js';\n" })).toEqual([
      'core/report/a.ts:3: core/ must not import core/contract/ (only contract itself imports the contract) ("../contract/api.js")',
    ]);
  });

  it('lets contract import everything below it', () => {
    expect(reported({ 'core/contract/api.ts': "import type { B } from '../budget/b.js';\nexport * from '../engine/e.js';\n" })).toEqual([]);
  });

  it('flags a folder missing from the table', () => {
    expect(messages({ 'core/mystery/a.ts': header + "import { q } from '../units/q.js';\n" })).toEqual([
      'core/mystery/a.ts:3: core/ must not import core/units/ from core/mystery/, which is not in CORE_ORDER (add it to the table) ("../units/q.js")',
    ]);
  });

  it('has every folder in one row only', () => {
    const all = CORE_ORDER.flat();
    expect(new Set(all).size).toBe(all.length);
  });
});

describe('check-layers: main/ and renderer/', () => {
  it('flags Electron in main/services, main/cli and main/web but not in main/electron', () => {
    const statement = header + "import { ipcMain } from 'electron';\n";
    expect(reported({
      'main/services/a.ts': statement,
      'main/cli/b.ts': statement,
      'main/web/c.ts': statement,
      'main/electron/ok.ts': statement,
    })).toEqual(['main/cli/b.ts:3', 'main/services/a.ts:3', 'main/web/c.ts:3']);
  });

  it('flags main/ importing renderer/', () => {
    expect(reported({ 'main/web/a.ts': header + "import x from '../../renderer/src/main.js';\n" })).toEqual(['main/web/a.ts:3']);
  });

  it('flags renderer/ importing main/ or a Node module', () => {
    expect(reported({
      'renderer/src/lib/a.ts': header + "import { x } from '../../../main/services/x.js';\n",
      'renderer/src/lib/b.ts': header + "import { setTimeout } from 'timers/promises';\n",
    })).toEqual(['renderer/src/lib/a.ts:3', 'renderer/src/lib/b.ts:3']);
  });

  it('flags a component, a view, any .vue file or lib/ using the API client; a store and the client itself may', () => {
    const api = "import { api } from '../api/client.js';\n";
    expect(reported({
      'renderer/src/components/Panel.ts': header + api,
      'renderer/src/views/Page.ts': header + api,
      'renderer/src/lib/helper.ts': header + api,
      'renderer/src/App.vue': `<template>\n  <div>don't</div>\n</template>\n<script setup lang="ts">\nimport { api } from './api/client.js';\n</script>\n`,
      'renderer/src/stores/project.ts': header + api,
      'renderer/src/api/retry.ts': header + "import { api } from './client.js';\n",
    })).toEqual(['renderer/src/App.vue:5', 'renderer/src/components/Panel.ts:3', 'renderer/src/lib/helper.ts:3', 'renderer/src/views/Page.ts:3']);
  });
});

describe('check-layers: test data, test code and module loading', () => {
  it('flags production code importing fixtures/ or tests/', () => {
    expect(reported({
      'main/services/a.ts': header + "import { demo } from '../../fixtures/demo/demo.js';\n",
      'renderer/src/lib/b.ts': header + "import { h } from '../../../tests/helper.js';\n",
    })).toEqual(['main/services/a.ts:3', 'renderer/src/lib/b.ts:3']);
  });

  it('flags bench/ importing tests/ but lets tests/ import fixtures/', () => {
    expect(reported({
      'bench/a.bench.ts': header + "import { spice } from '../tests/ngspice/spice.js';\n",
      'tests/core/a.test.ts': header + "import { demo } from '../../fixtures/demo/demo.js';\n",
    })).toEqual(['bench/a.bench.ts:3']);
  });

  it('flags require() in core/, main/ and renderer/, not in scripts/', () => {
    const statement = header + "const fs = require('fs');\n";
    expect(reported({
      'core/units/a.ts': statement,
      'main/services/b.ts': statement,
      'renderer/src/lib/c.ts': statement,
      'scripts/d.cjs': statement,
    })).toEqual(['core/units/a.ts:3', 'main/services/b.ts:3', 'renderer/src/lib/c.ts:3']);
  });

  it('flags import() of a template literal; a literal import() is checked like a static one', () => {
    expect(messages({
      'main/cli/a.ts': header + 'const m = await import(`./commands/${name}.js`);\n',
      'core/units/b.ts': header + "const m = await import('node:fs');\n",
    }).sort()).toEqual([
      'core/units/b.ts:3: core/ must not import a Node module ("node:fs")',
      'main/cli/a.ts:3: main/ must not import() a template literal (the lint cannot check its target; import each module by name)',
    ]);
  });

  it('reports the first line of a statement that spans lines', () => {
    expect(reported({ 'core/units/a.ts': header + "import {\n  readFileSync,\n} from 'node:fs';\n" })).toEqual(['core/units/a.ts:3']);
  });

  it('reports a violation on the first line of a file as line 1', () => {
    expect(reported({ 'core/units/a.ts': "import 'node:fs';\n" })).toEqual(['core/units/a.ts:1']);
  });

  it('ignores imports and require() inside comments and strings', () => {
    expect(reported({
      'core/units/a.ts': [
        "// import { readFileSync } from 'node:fs';",
        "/* const fs = require('fs'); */",
        "export const hint = \"use require('x') in a script, not here\";",
        "export const re = /import 'y'/;",
      ].join('\n') + '\n',
    })).toEqual([]);
  });
});

describe('check-layers: comments cite the repository docs', () => {
  const guide = 'DESIGN' + '.md';
  it.each([
    ['the old guide', `// see ${guide} §5\n`],
    ['an issue number', '// added for issue 12\n'],
    ['an issue with #', '/* see issue #7 */\n'],
    ['a brief', '// as the brief says\n'],
    ['a brief as a label', '// Brief: units always shown\n'],
    ['an issue as #N', '// a regression, see #42\n'],
    ['a note outside the repository', `// see ${'ECOSYSTEM' + '.md'}\n`],
  ])('flags a comment citing %s', (_name, comment) => {
    expect(reported({ 'tests/core/a.test.ts': header + comment })).toEqual(['tests/core/a.test.ts:3']);
  });

  it('reads notes, generators and migrations whole (md, py, sql) and leaves HTML entities alone', () => {
    expect(reported({
      'fixtures/nets/README.md': `# Nets\n\nFormat v1 (${'issue'} 3).\n`,
      'tests/core/reference/gen.py': `# rows\nx = 1\n# as the ${'brief'} asks\n`,
      'migrations/001-create.sql': `-- a table\n\n-- see ${guide} §8\n`,
      'main/services/a.ts': header + "// escapes ' as &#39; and colours like #555\n",
    })).toEqual(['fixtures/nets/README.md:3', 'migrations/001-create.sql:3', 'tests/core/reference/gen.py:3']);
  });

  it('leaves the adjective "brief" alone', () => {
    expect(reported({ 'tests/core/a.test.ts': header + '// the echo opens with a brief rise\n' })).toEqual([]);
  });

  it('leaves strings alone and can be switched off', () => {
    const files = { 'core/units/a.ts': header + `export const s = '${guide}, issue 3, the brief';\n// issue 4\n` };
    expect(reported(files)).toEqual(['core/units/a.ts:4']);
    expect(checkLayers({ root: tree(files), references: false })).toEqual([]);
  });
});

describe('check-layers: a clean tree', () => {
  it('passes', () => {
    expect(checkLayers({ root: tree({
      'core/units/q.ts': "// Quantities (docs/design.md §8).\nexport const q = 1;\n",
      'core/stackup/s.ts': "import { q } from '../units/q.js';\nimport { z } from 'zod';\nexport const s = q;\n",
      'core/contract/api.ts': "import type { S } from '../stackup/s.js';\n",
      'main/services/a.ts': "import { readFileSync } from 'node:fs';\nimport { s } from '../../core/stackup/s.js';\n",
      'main/electron/w.ts': "import { BrowserWindow } from 'electron';\n",
      'renderer/src/stores/p.ts': "import { defineStore } from 'pinia';\nimport { api } from '../api/client.js';\n",
      'renderer/src/components/C.vue': "<script setup lang=\"ts\">\nimport { useProject } from '../stores/p.js';\n</script>\n",
      'renderer/vite.config.ts': "import { fileURLToPath } from 'node:url';\n",
      'tests/core/s.test.ts': "import { s } from '../../core/stackup/s.js';\nimport { d } from '../../fixtures/d.js';\n",
      'bench/s.bench.ts': "import { s } from '../core/stackup/s.js';\n",
    }) })).toEqual([]);
  });
});
