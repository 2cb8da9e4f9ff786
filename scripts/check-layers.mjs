#!/usr/bin/env node
// Enforces the layering of docs/design.md §7: dependency arrows point down only.
//   core/      pure: no Node built-in, Electron, database driver, Vue/Pinia, no main/ renderer/ fixtures/
//              scripts/ tests/ bench/; its folders import only folders on lower rows of CORE_ORDER;
//              nothing in core imports core/contract except contract itself.
//   renderer/  no Node, Electron or main/; only Pinia stores (renderer/src/stores) use the API client.
//   main/      no renderer/ (it serves renderer's build output); only main/electron imports Electron.
//   core, main, renderer (production code) never import fixtures/ or tests/; bench/ never imports tests/.
//   No require() and no import() of a template literal in core/, main/, renderer/ (the lint cannot see
//   where either points).
//   No source comment cites the old external design guide, an issue number or a work order: comments
//   cite docs/<file>.md §N or state the reason.
// Usage: `node scripts/check-layers.mjs` checks this repository; `checkLayers({ root, files })` is the
// same check as a function, for the lint's own tests.
import { builtinModules } from 'node:module';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve, dirname, sep } from 'node:path';
import { fileURLToPath } from 'node:url';

/**
 * The order of core/'s folders, lowest first. A folder may import its own files and folders on lower
 * rows; folders on one row are independent of each other. A file directly in core/ (core/errors.ts)
 * counts as the folder of its base name. docs/design.md §7 explains each row.
 */
export const CORE_ORDER = [
  ['errors', 'hash'], // base utilities
  ['units'],
  ['fieldsolve'],
  ['project'],
  ['stackup'],
  ['lengths', 'design'],
  ['circuit'],
  ['ibis'],
  ['netbuild'],
  ['solver'],
  ['measure'],
  ['budget'],
  ['engine'],
  ['charts'],
  ['report'],
  ['contract'],
];

const CORE_LEVEL = new Map(CORE_ORDER.flatMap((row, level) => row.map((name) => [name, level])));
const NODE_BUILTINS = new Set(builtinModules.map((name) => name.replace(/^node:/, '')));
const SOURCE_FILE = /\.(ts|mts|cts|vue|js|mjs|cjs)$/;
/** Notes, generators and SQL: read for the comment-citation check only (their whole text counts as comment). */
const NOTE_FILE = /\.(md|py|sql)$/;
const SCANNED_TOPS = ['core', 'main', 'renderer', 'scripts', 'tests', 'bench', 'fixtures', 'migrations'];
const PRODUCTION_TOPS = new Set(['core', 'main', 'renderer']);
// Split so that this file does not itself match the reference check below.
const OLD_GUIDE = 'DESIGN' + '.md';
const OUTSIDE_NOTES = ['ECOSYSTEM', 'STYLE'].map((name) => name + '.md');
const REFERENCE_RULES = [
  { re: new RegExp(OLD_GUIDE.replace('.', '\\.')), what: `"${OLD_GUIDE}" (cite docs/design.md §N)` },
  { re: new RegExp(`\\b(?:${OUTSIDE_NOTES.map((n) => n.replace('.', '\\.')).join('|')})`), what: 'a document outside the repository (cite docs/)' },
  { re: /\bissues?\s*#?\d+/i, what: 'an issue number (cite a docs/ section or state the reason)' },
  // A hash and digits alone are ambiguous (colours); caught where they read as a reference: "see", "per"... then the number.
  { re: /\b(?:see|per|in|from|of|after|fixes|closes|for)\s+#\d{1,5}\b/i, what: 'an issue number "#N" (cite a docs/ section or state the reason)' },
  // The word as a document (after "the", "per"..., or followed by a colon), not the adjective before "rise".
  { re: /\bbriefs?\s*(?::|quality\b)|\b(?:the|per|from|in|see)\s+briefs?\b(?!\s+(?:rise|dip|pulse|spike|glitch|excursion|moment|time))/i,
    what: 'a "brief" (cite a docs/ section or state the reason)' },
];

/** Static `import ... from 'x'`, `export ... from 'x'`, `import 'x'`, `import('x')`. */
const IMPORT_RE =
  /(?<![\w$.])(?:import|export)\s[^'"`;]*?\bfrom\s*['"]([^'"]+)['"]|(?<![\w$.])import\s*\(\s*['"]([^'"]+)['"]\s*\)|(?<![\w$.])import\s*['"]([^'"]+)['"]/g;
const TEMPLATE_IMPORT_RE = /(?<![\w$.])import\s*\(\s*`/g;
const REQUIRE_RE = /(?<![\w$.])require\s*\(/g;

function* walk(dir) {
  let names;
  try { names = readdirSync(dir); } catch { return; }
  for (const name of names) {
    if (name === 'node_modules' || name.startsWith('.')) continue;
    const path = join(dir, name);
    if (statSync(path).isDirectory()) yield* walk(path);
    else if (SOURCE_FILE.test(name) || NOTE_FILE.test(name)) yield path;
  }
}

/** Keeps only the <script> blocks of a .vue file, blanking the rest but keeping every newline. */
function vueScripts(text) {
  let out = '';
  let at = 0;
  for (const m of text.matchAll(/(<script\b[^>]*>)([\s\S]*?)<\/script>/g)) {
    const bodyStart = m.index + m[1].length;
    out += blank(text.slice(at, bodyStart)) + m[2];
    at = bodyStart + m[2].length;
  }
  return out + blank(text.slice(at));
}

const blank = (s) => s.replace(/[^\n]/g, ' ');

/**
 * Splits source text into code (comments and string contents blanked, quotes kept) and comments
 * (everything else blanked), both keeping every character offset so a match's line number is exact;
 * an import specifier is read back from the original text at the match's position.
 */
function splitSource(text) {
  const code = text.split('');
  const comments = blank(text).split('');
  let i = 0;
  let lastSignificant = '';
  const regexMayStart = () => lastSignificant === '' || /[(,=:[!&|?{};+\-*%<>~^]/.test(lastSignificant);
  while (i < text.length) {
    const c = text[i];
    const next = text[i + 1];
    if (c === '/' && next === '/') {
      const end = text.indexOf('\n', i) === -1 ? text.length : text.indexOf('\n', i);
      for (let k = i; k < end; k++) { comments[k] = text[k]; code[k] = ' '; }
      i = end;
    } else if (c === '/' && next === '*') {
      const close = text.indexOf('*/', i + 2);
      const end = close === -1 ? text.length : close + 2;
      for (let k = i; k < end; k++) {
        if (text[k] !== '\n') { comments[k] = text[k]; code[k] = ' '; }
      }
      i = end;
    } else if (c === "'" || c === '"' || c === '`') {
      let k = i + 1;
      while (k < text.length && text[k] !== c) {
        if (text[k] === '\\') k++;
        else if (c !== '`' && text[k] === '\n') break;
        k++;
      }
      for (let j = i + 1; j < k && j < text.length; j++) if (text[j] !== '\n') code[j] = ' ';
      lastSignificant = c;
      i = k + 1;
    } else if (c === '/' && regexMayStart()) {
      let k = i + 1;
      let inClass = false;
      while (k < text.length && text[k] !== '\n') {
        if (text[k] === '\\') k++;
        else if (text[k] === '[') inClass = true;
        else if (text[k] === ']') inClass = false;
        else if (text[k] === '/' && !inClass) break;
        k++;
      }
      lastSignificant = '/';
      i = k + 1;
    } else {
      if (!/\s/.test(c)) lastSignificant = /[\w$]/.test(c) ? 'a' : c;
      i++;
    }
  }
  return { code: code.join(''), comments: comments.join('') };
}

const lineAt = (text, index) => {
  let line = 1;
  for (let k = 0; k < index; k++) if (text.charCodeAt(k) === 10) line++;
  return line;
};

const isNodeBuiltin = (spec) => spec.startsWith('node:') || NODE_BUILTINS.has(spec) || NODE_BUILTINS.has(spec.split('/')[0]);
const isElectron = (spec) => spec === 'electron' || spec.startsWith('electron/');
const isVue = (spec) => spec === 'vue' || spec.startsWith('vue/') || spec === 'pinia' || spec.startsWith('@vue/');
const isDatabaseDriver = (spec) => spec === 'better-sqlite3';

/** The core folder a path inside core/ belongs to (core/errors.ts counts as "errors"). */
function coreFolderOf(relPath) {
  const parts = relPath.split('/');
  return parts.length === 2 ? parts[1].replace(/\.[^.]+$/, '') : parts[1];
}

/**
 * What is wrong with `spec` imported from `from` (both repository-relative with '/' separators;
 * `target` is the resolved repository-relative path of a relative specifier, or null for a package).
 */
function importProblem(from, spec, target) {
  const top = from.split('/')[0];
  const targetTop = target?.split('/')[0] ?? null;
  const inside = (dir) => target !== null && (target === dir || target.startsWith(dir + '/'));
  if (target !== null && target.startsWith('..')) return 'a file outside the repository';
  if (PRODUCTION_TOPS.has(top) && (targetTop === 'fixtures' || targetTop === 'tests')) {
    return `${targetTop}/ (production code must not depend on test data or test code)`;
  }
  if (top === 'bench' && targetTop === 'tests') return 'tests/ (a benchmark must not depend on test code)';
  if (top === 'core') {
    if (isNodeBuiltin(spec)) return 'a Node module';
    if (isElectron(spec)) return 'Electron';
    if (isDatabaseDriver(spec)) return 'a database driver';
    if (isVue(spec)) return 'Vue or Pinia (core/ is host-independent)';
    if (targetTop !== null && targetTop !== 'core') return `${targetTop}/`;
    if (targetTop === 'core') {
      const mine = coreFolderOf(from);
      const theirs = coreFolderOf(target);
      if (mine === theirs) return null;
      if (theirs === 'contract') return 'core/contract/ (only contract itself imports the contract)';
      const myLevel = CORE_LEVEL.get(mine);
      const theirLevel = CORE_LEVEL.get(theirs);
      if (myLevel === undefined) return `core/${theirs}/ from core/${mine}/, which is not in CORE_ORDER (add it to the table)`;
      if (theirLevel === undefined) return `core/${theirs}/, which is not in CORE_ORDER (add it to the table)`;
      if (theirLevel >= myLevel) {
        return `core/${theirs}/ (core/${mine}/ may import only folders below it in CORE_ORDER)`;
      }
    }
    return null;
  }
  if (top === 'renderer') {
    if (from === 'renderer/vite.config.ts') return null; // build config, runs in Node
    if (isNodeBuiltin(spec)) return 'a Node module';
    if (isElectron(spec)) return 'Electron';
    if (isDatabaseDriver(spec)) return 'a database driver';
    if (targetTop === 'main') return 'main/';
    // Components, views, .vue files, lib/ and the entry alike: only the stores (and the client itself) use it.
    const mayCallApi = from.startsWith('renderer/src/stores/') || from.startsWith('renderer/src/api/');
    if (!mayCallApi && inside('renderer/src/api')) {
      return 'the API client renderer/src/api/ (only Pinia stores in renderer/src/stores/ call it)';
    }
    return null;
  }
  if (top === 'main') {
    if (targetTop === 'renderer') return 'renderer/ (serve its build output instead)';
    if (isElectron(spec) && !from.startsWith('main/electron/')) return 'Electron (only main/electron/ may)';
    return null;
  }
  return null;
}

/**
 * Checks the given files (absolute paths, default: every source file under the scanned folders of
 * `root`) and returns the problems, each `{ file, line, message }` with `file` relative to `root`.
 * `references: false` leaves out the check of comments' citations.
 */
export function checkLayers({ root, files, references = true } = {}) {
  const rootDir = resolve(root);
  const list = files ?? SCANNED_TOPS.flatMap((top) => [...walk(join(rootDir, top))]);
  const problems = [];
  for (const file of list) {
    const rel = relative(rootDir, file).split(sep).join('/');
    const top = rel.split('/')[0];
    const raw = readFileSync(file, 'utf8');
    const text = file.endsWith('.vue') ? vueScripts(raw) : raw;
    const note = NOTE_FILE.test(file);
    const { code, comments } = note ? { code: '', comments: text } : splitSource(text);
    const report = (index, message) => problems.push({ file: rel, line: lineAt(text, index), message });

    for (const m of code.matchAll(IMPORT_RE)) {
      // The specifier was blanked with the string contents; read it back from the original text.
      const original = text.slice(m.index, m.index + m[0].length).match(/['"]([^'"]+)['"]\s*\)?$/);
      const spec = original?.[1];
      if (!spec) continue;
      const target = spec.startsWith('.')
        ? relative(rootDir, resolve(dirname(file), spec)).split(sep).join('/')
        : null;
      const broken = importProblem(rel, spec, target);
      if (broken) report(m.index, `${top}/ must not import ${broken} ("${spec}")`);
    }
    if (PRODUCTION_TOPS.has(top)) {
      for (const m of code.matchAll(REQUIRE_RE)) report(m.index, `${top}/ must not use require() (use import)`);
      for (const m of code.matchAll(TEMPLATE_IMPORT_RE)) {
        report(m.index, `${top}/ must not import() a template literal (the lint cannot check its target; import each module by name)`);
      }
    }
    const citedLines = new Set(); // one problem per line, the first rule that matches
    for (const rule of references ? REFERENCE_RULES : []) {
      const re = new RegExp(rule.re.source, rule.re.flags.includes('g') ? rule.re.flags : rule.re.flags + 'g');
      for (const m of comments.matchAll(re)) {
        const line = lineAt(text, m.index);
        if (citedLines.has(line)) continue;
        citedLines.add(line);
        report(m.index, `a comment must not cite ${rule.what}`);
      }
    }
  }
  return problems;
}

const formatProblem = (p) => `${p.file}:${p.line}: ${p.message}`;

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const root = resolve(dirname(fileURLToPath(import.meta.url)), '..');
  const problems = checkLayers({ root });
  if (problems.length) {
    console.error(`Layering check failed (docs/design.md §7):\n${problems.map(formatProblem).join('\n')}`);
    process.exit(1);
  }
  console.log('Layering check: core/, renderer/ and main/ import only downward; core/ folders follow CORE_ORDER.');
}
