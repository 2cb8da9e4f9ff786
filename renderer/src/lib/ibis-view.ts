/**
 * Words and numbers the IBIS screens show (docs/workbench.md "Parts: IBIS buffer models"): the
 * parser's located refusal split into file, line, keyword and reason, typ/min/max triples with units,
 * and the choices of a part's model. Everything shown comes from the services' summary of each file
 * (core/ibis/summary.ts, the one `slackline ibis` prints); nothing is recomputed here.
 */
import type { IbisFileInfo } from '../../../core/contract/api.js';
import type { Triple } from '../../../core/ibis/types.js';
import { formatIn } from '../../../core/units/quantity.js';

/** A refusal of the IBIS parser: "<file> line <n> [<keyword>]: <reason>" (docs/ibis.md §1), or null when it is not one. */
export interface LocatedIbisError {
  file: string;
  line: number;
  keyword: string;
  reason: string;
}

const LOCATED = /^(.+) line (\d+) \[([^\]]+)\]$/;

/** Splits the place the services named (ApiError.where) and the message into file, line, keyword and reason. */
export function locatedIbisError(where: string | null, message: string): LocatedIbisError | null {
  const match = where ? LOCATED.exec(where) : null;
  if (!where || !match) return null;
  const reason = message.startsWith(`${where}: `) ? message.slice(where.length + 2) : message;
  return { file: match[1], line: Number(match[2]), keyword: match[3], reason };
}

/** "1.20 / 1.14 / 1.26 V" (typ / min / max; NA where the file gives none, docs/ibis.md §3). */
export function tripleText(t: Triple | null, unit: 'pF' | 'V', decimals: number): string {
  if (!t) return '—';
  const one = (x: number | null) => (x === null ? 'NA' : formatIn(x, unit, decimals, false));
  return `${one(t.typ)} / ${one(t.min)} / ${one(t.max)} ${unit}`;
}

/** Size of a stored text for people, e.g. "52,778 characters". */
export function sizeText(characters: number): string {
  return `${characters.toLocaleString('en-US')} character${characters === 1 ? '' : 's'}`;
}

/** One choice of the model picker: a model of a stored file, with its type. */
export interface ModelChoice {
  key: string;
  file: string;
  model: string;
  modelType: string;
}

/** Every model of every stored file that parses, in file order (the picker's options). */
export function modelChoices(files: readonly IbisFileInfo[]): ModelChoice[] {
  return files.flatMap((f) => (f.summary?.models ?? []).map((m) => ({ key: choiceKey(f.name, m.name), file: f.name, model: m.name, modelType: m.modelType })));
}

/** The picker's value for a (file, model) pair; '' stands for no model (the linear driver and receiver). */
export function choiceKey(file: string, model: string): string {
  return JSON.stringify([file, model]);
}

/** The (file, model) a picker value stands for, or null for ''. */
export function choiceOf(key: string): { file: string; model: string } | null {
  if (!key) return null;
  const [file, model] = JSON.parse(key) as [string, string];
  return { file, model };
}

/** One pin a part may sit behind: a [Pin] row that uses the model directly or through a [Model Selector]. */
export interface PinChoice {
  pin: string;
  signal: string;
  component: string;
  /** "per-pin R/L/C" when the row gives its own package values, else "the component's [Package]". */
  packageFrom: string;
}

/** The [Pin] rows of a stored file that use `model` (docs/ibis.md §9: the part's package comes from one of them). */
export function pinChoices(files: readonly IbisFileInfo[], file: string, model: string): PinChoice[] {
  const summary = files.find((f) => f.name === file)?.summary;
  if (!summary) return [];
  const selectors = new Set(summary.selectors.filter((s) => s.models.includes(model)).map((s) => s.name));
  return summary.components.flatMap((c) => c.pins
    .filter((p) => p.model === model || selectors.has(p.model))
    .map((p) => ({
      pin: p.pin, signal: p.signal, component: c.name,
      packageFrom: p.rPin !== null && p.lPin !== null && p.cPin !== null ? 'per-pin R/L/C' : "the component's [Package]",
    })));
}
