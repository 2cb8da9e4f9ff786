/** Reading JSON input files for the CLI: errors name the file, and for bad syntax its line and column. */
import { readFileSync } from 'node:fs';
import { InputError } from '../../core/errors.js';

/**
 * Offset of the first JSON syntax error in `text` (RFC 8259 grammar), or the text length when the
 * document ends early. Node 20's JSON.parse does not always report a position, so we find it ourselves.
 */
function firstJsonErrorOffset(text: string): number {
  let i = 0;
  const ws = (): void => {
    while (i < text.length && ' \t\n\r'.includes(text[i])) i++;
  };
  const fail = (): never => {
    throw i;
  };
  const literal = (word: string): void => {
    if (text.startsWith(word, i)) i += word.length;
    else fail();
  };
  const string = (): void => {
    i++; // opening quote
    while (i < text.length && text[i] !== '"') {
      if (text[i] === '\\') i++;
      else if (text.charCodeAt(i) < 0x20) fail();
      i++;
    }
    if (i >= text.length) fail();
    i++;
  };
  const number = (): void => {
    const m = /^-?(?:0|[1-9]\d*)(?:\.\d+)?(?:[eE][-+]?\d+)?/.exec(text.slice(i));
    if (!m) fail();
    i += (m as RegExpExecArray)[0].length;
  };
  const value = (): void => {
    ws();
    const c = text[i];
    if (c === '{') {
      i++;
      ws();
      if (text[i] === '}') { i++; return; }
      for (;;) {
        ws();
        if (text[i] !== '"') fail();
        string();
        ws();
        if (text[i] !== ':') fail();
        i++;
        value();
        ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === '}') { i++; return; }
        fail();
      }
    } else if (c === '[') {
      i++;
      ws();
      if (text[i] === ']') { i++; return; }
      for (;;) {
        value();
        ws();
        if (text[i] === ',') { i++; continue; }
        if (text[i] === ']') { i++; return; }
        fail();
      }
    } else if (c === '"') string();
    else if (c === 't') literal('true');
    else if (c === 'f') literal('false');
    else if (c === 'n') literal('null');
    else number();
  };
  try {
    value();
    ws();
    if (i < text.length) fail();
  } catch (offset) {
    if (typeof offset === 'number') return offset;
    throw offset;
  }
  return text.length;
}

/**
 * Deepest nesting of arrays and objects accepted. Input files (net files, stackups) nest a few levels;
 * the recursive error locator above and the checks after parsing recurse once per level, so a limit far
 * above real files and far below the call stack keeps both safe (common practice, no source).
 */
export const MAX_JSON_DEPTH = 200;

/** Offset of the bracket that first exceeds MAX_JSON_DEPTH, or -1. One linear scan, no recursion. */
function tooDeepAt(text: string): number {
  let depth = 0;
  let inString = false;
  for (let i = 0; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (inString) {
      if (c === 0x5c) i++; // backslash: skip the escaped character
      else if (c === 0x22) inString = false;
    } else if (c === 0x22) inString = true;
    else if (c === 0x5b || c === 0x7b) {
      depth++;
      if (depth > MAX_JSON_DEPTH) return i;
    } else if (c === 0x5d || c === 0x7d) depth--;
  }
  return -1;
}

/** Parses JSON text; a syntax error names the file, line and column. */
export function parseJsonText(text: string, file: string): unknown {
  const deep = tooDeepAt(text);
  if (deep >= 0) {
    const before = text.slice(0, deep);
    const line = before.split('\n').length;
    throw new InputError(
      `${file} line ${line} column ${before.length - before.lastIndexOf('\n')}`,
      `nested more than ${MAX_JSON_DEPTH} levels deep (arrays and objects); no Slackline input nests that deep`,
    );
  }
  try {
    return JSON.parse(text);
  } catch (error) {
    const message = error instanceof Error ? error.message.split('\n')[0] : String(error);
    const before = text.slice(0, firstJsonErrorOffset(text));
    const line = before.split('\n').length;
    const column = before.length - before.lastIndexOf('\n');
    throw new InputError(`${file} line ${line} column ${column}`, `not valid JSON (${message})`);
  }
}

/** Reads and parses a JSON file; a missing or unreadable file or bad syntax is an InputError naming it. */
export function readJsonFile(file: string): unknown {
  let text: string;
  try {
    text = readFileSync(file, 'utf8');
  } catch (error) {
    const code = error instanceof Error && 'code' in error ? String((error as { code: unknown }).code) : '';
    throw new InputError(file, code === 'ENOENT' ? 'file not found' : `cannot be read (${code || String(error)})`);
  }
  return parseJsonText(text, file);
}
