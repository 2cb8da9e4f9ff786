/**
 * Reads design-file text (YAML) into plain data plus a way to find where any field path sits in the
 * text, so every later check can name file, line and column (docs/design-file.md §7). Pure: the
 * caller reads the file.
 */
import { isMap, isPair, isScalar, isSeq, LineCounter, parseDocument, type Node } from 'yaml';

/** A field path such as ['buses', 2, 'nets', 5, 'segments', 1, 'length']. */
export type FieldPath = readonly (string | number)[];

/** One problem found in a design file. */
export interface DesignIssue {
  path: FieldPath;
  message: string;
  /** Point at the key rather than the value (unknown keys). */
  atKey?: boolean;
}

export interface Place {
  line: number;
  column: number;
}

export interface LocatedDesign {
  file: string;
  /** The document as plain data (maps -> objects, sequences -> arrays). */
  value: unknown;
  /** YAML syntax errors, already placed. */
  syntaxErrors: string[];
  /** The same syntax errors as line, column and message (for a list on screen). */
  syntaxPlaces: (Place & { message: string })[];
  /** Where a field path sits; the nearest existing ancestor when the field is missing. */
  locate(path: FieldPath, atKey?: boolean): Place;
}

/** "buses[2].nets[5].segments[1].length"; the root is "(file)". */
export function formatPath(path: FieldPath): string {
  let out = '';
  for (const part of path) out += typeof part === 'number' ? `[${part}]` : out === '' ? part : `.${part}`;
  return out === '' ? '(top level)' : out;
}

/** "board.yaml:12:7: buses[2].nets[5].segments[1].length: must be ..." */
export function formatIssue(design: LocatedDesign, issue: DesignIssue): string {
  const { line, column } = design.locate(issue.path, issue.atKey);
  return `${design.file}:${line}:${column}: ${formatPath(issue.path)}: ${issue.message}`;
}

export function readDesignText(file: string, text: string): LocatedDesign {
  const lineCounter = new LineCounter();
  const doc = parseDocument(text, { lineCounter, prettyErrors: false, uniqueKeys: true, strict: true });
  const place = (offset: number): Place => {
    const p = lineCounter.linePos(offset);
    return { line: p.line, column: p.col };
  };
  const syntaxPlaces = doc.errors.map((e) => ({
    ...place(e.pos[0]),
    // The library's message repeats the position and an excerpt after a colon on a new line; keep the first line.
    message: e.message.split('\n')[0].replace(/ at line \d+, column \d+:?$/, ''),
  }));
  const syntaxErrors = syntaxPlaces.map((e) => `${file}:${e.line}:${e.column}: ${e.message}`);

  const locate = (path: FieldPath, atKey = false): Place => {
    let node: unknown = doc.contents;
    let best = (node as Node | null)?.range?.[0] ?? 0;
    for (let i = 0; i < path.length; i += 1) {
      const part = path[i];
      const last = i === path.length - 1;
      if (isMap(node)) {
        const pair = node.items.find((p) => isPair(p) && isScalar(p.key) && String(p.key.value) === String(part));
        if (!pair) break;
        const keyStart = (pair.key as Node).range?.[0];
        if (last && atKey && keyStart !== undefined) return place(keyStart);
        const valueStart = (pair.value as Node | null)?.range?.[0];
        best = valueStart ?? keyStart ?? best;
        node = pair.value;
      } else if (isSeq(node) && typeof part === 'number') {
        const item = node.items[part] as Node | undefined;
        if (!item) break;
        best = item.range?.[0] ?? best;
        node = item;
      } else {
        break;
      }
    }
    return place(best);
  };

  let value: unknown = null;
  if (doc.errors.length === 0) {
    try {
      value = doc.toJS({ maxAliasCount: 100 });
    } catch (error) {
      syntaxPlaces.push({ line: 1, column: 1, message: (error as Error).message });
      syntaxErrors.push(`${file}:1:1: ${(error as Error).message}`);
    }
  }
  return { file, value, syntaxErrors, syntaxPlaces, locate };
}
