/**
 * IBIS models of project parts (docs/ibis.md §9): the stored files parsed once per content hash, a
 * part's model and the pin whose package it sits behind, and the rule that maps a project corner onto
 * an IBIS column. Pure: the files' text is in the project (ProjectData.ibisFiles), read by the host.
 */
import { InputError } from '../errors.js';
import { sha256Hex } from '../hash/sha256.js';
import type { IbisCorner } from '../circuit/types.js';
import { parseIbis } from '../ibis/parse.js';
import { pinPackage, type PinPackage } from '../ibis/package.js';
import { ibisCurvesAt, type ModelCurves } from '../ibis/curves.js';
import { summariseIbis, type IbisSummary } from '../ibis/summary.js';
import type { IbisComponent, IbisFile, IbisModel } from '../ibis/types.js';
import type { Corner, IbisFileRecord, PartModel, ProjectData } from '../project/model.js';

/**
 * Parsed files by SHA-256 of their text: a file is parsed once per process however many nets use it.
 * The text is kept beside the result and compared on a hit (cheap next to parsing), so a record whose
 * stored hash does not belong to its text can never be served another file's parse.
 */
const parsedByHash = new Map<string, { text: string; parsed: IbisFile }>();
/** Bound on the memo (files are a few MB at most; a long session importing many keeps the newest). */
const MEMO_LIMIT = 64;

/** The parsed content of a stored IBIS file (memoised by its hash); parser errors name file, line, keyword. */
export function parsedIbisFile(record: IbisFileRecord): IbisFile {
  const known = parsedByHash.get(record.sha256);
  if (known && known.text === record.text) return known.parsed;
  const parsed = parseIbis(record.text, record.name);
  if (parsedByHash.size >= MEMO_LIMIT) parsedByHash.delete(parsedByHash.keys().next().value as string);
  parsedByHash.set(record.sha256, { text: record.text, parsed });
  return parsed;
}

/**
 * A stored IBIS file as a client sees it (docs/ibis.md §9, "Stored in the project"): name, SHA-256,
 * length of the text in characters and what `slackline ibis` lists of it, without the text itself.
 * `summary` is null, with the parser's message in `problem`, for a stored text that no longer parses.
 */
export interface IbisFileInfo {
  name: string;
  sha256: string;
  characters: number;
  summary: IbisSummary | null;
  problem: string | null;
}

/** Summaries by SHA-256 (the end-point check integrates every waveform fixture: worth keeping). */
const summaryByHash = new Map<string, { text: string; summary: IbisSummary }>();

/** A stored file's client listing: summarised once per content hash (same memo rule as parsedIbisFile). */
export function ibisFileInfo(record: IbisFileRecord): IbisFileInfo {
  const base = { name: record.name, sha256: record.sha256, characters: record.text.length };
  const known = summaryByHash.get(record.sha256);
  if (known && known.text === record.text) return { ...base, summary: known.summary, problem: null };
  try {
    const summary = summariseIbis(parsedIbisFile(record));
    if (summaryByHash.size >= MEMO_LIMIT) summaryByHash.delete(summaryByHash.keys().next().value as string);
    summaryByHash.set(record.sha256, { text: record.text, summary });
    return { ...base, summary, problem: null };
  } catch (error) {
    if (error instanceof InputError) return { ...base, summary: null, problem: error.message };
    throw error;
  }
}

/** A stored-file record for a text: its name, SHA-256 and the text itself. Parses it to check it first. */
export function ibisFileRecord(name: string, text: string): IbisFileRecord {
  const record = { name, sha256: sha256Hex(text), text };
  parsedIbisFile(record);
  return record;
}

/**
 * The IBIS column of a project corner (docs/ibis.md §9, "Corners"): a corner that times setup with
 * Tco max, or is named "slow", uses the min column (the standard's weak, slow data); one that times
 * hold with Tco min, or is named "fast", the max column; any other corner typ.
 */
export function ibisColumnOf(corner: Corner): IbisCorner {
  const name = corner.name.trim().toLowerCase();
  if (corner.tco === 'max' || name === 'slow') return 'min';
  if (corner.tco === 'min' || name === 'fast') return 'max';
  return 'typ';
}

export interface PartIbis {
  file: IbisFileRecord;
  parsed: IbisFile;
  model: IbisModel;
  /**
   * The [Pin] row the part sits behind: the one the part names, else the first that uses the model
   * (directly or through a [Model Selector]); null when none does.
   */
  pin: { component: IbisComponent; pin: string } | null;
}

/** Names of the [Model Selector]s of a file that offer `model`. */
function selectorsOffering(parsed: IbisFile, model: string): Set<string> {
  return new Set(parsed.selectors.filter((s) => s.options.some((o) => o.model === model)).map((s) => s.name));
}

/** The first pin of the file whose model is `model` or a selector offering it. */
function pinOfModel(parsed: IbisFile, model: string): PartIbis['pin'] {
  const selectors = selectorsOffering(parsed, model);
  for (const component of parsed.components) {
    const row = component.pins.find((p) => p.model === model || selectors.has(p.model));
    if (row) return { component, pin: row.pin };
  }
  return null;
}

/** The [Pin] row a part names, checked to use the part's model (directly or through a selector). */
function namedPin(parsed: IbisFile, file: string, model: string, pin: string, where: string): NonNullable<PartIbis['pin']> {
  const selectors = selectorsOffering(parsed, model);
  for (const component of parsed.components) {
    const row = component.pins.find((p) => p.pin === pin);
    if (!row) continue;
    if (row.model !== model && !selectors.has(row.model)) {
      throw new InputError(`${where}.pin`, `pin "${pin}" of ${file} uses model "${row.model}", which is not "${model}" nor a selector offering it`);
    }
    return { component, pin };
  }
  const usable = pinsForModel(parsed, model);
  throw new InputError(`${where}.pin`, `no pin "${pin}" in the [Pin] lists of ${file} (pins using ${model}: ${usable.join(', ') || 'none'})`);
}

/** Every [Pin] of the file that uses `model` directly or through a selector, in file order. */
export function pinsForModel(parsed: IbisFile, model: string): string[] {
  const selectors = selectorsOffering(parsed, model);
  return parsed.components.flatMap((c) => c.pins.filter((p) => p.model === model || selectors.has(p.model)).map((p) => p.pin));
}

/** The part's IBIS model, or null when the part has none; throws InputError naming the part's field. */
export function partIbis(part: PartModel, files: readonly IbisFileRecord[] | undefined): PartIbis | null {
  if (!part.ibis) return null;
  const where = `part ${part.name} ibis`;
  const file = (files ?? []).find((f) => f.name === part.ibis!.file);
  if (!file) throw new InputError(`${where}.file`, `IBIS file "${part.ibis.file}" is not in the project (import it first)`);
  let parsed: IbisFile;
  try {
    parsed = parsedIbisFile(file);
  } catch (error) {
    if (error instanceof InputError) throw new InputError(`${where}.file`, error.message);
    throw error;
  }
  const model = parsed.models.find((m) => m.name === part.ibis!.model);
  if (!model) {
    throw new InputError(`${where}.model`, `unknown model name "${part.ibis.model}" in ${file.name} (models: ${parsed.models.map((m) => m.name).join(', ')})`);
  }
  const pin = part.ibis.pin ? namedPin(parsed, file.name, model.name, part.ibis.pin, where) : pinOfModel(parsed, model.name);
  return { file, parsed, model, pin };
}

/** Package R/L/C of the part's pin at an IBIS column, or null when no [Pin] row uses the model. */
export function partPackage(ibis: PartIbis, column: IbisCorner): PinPackage | null {
  return ibis.pin ? pinPackage(ibis.pin.component, ibis.pin.pin, column) : null;
}

/**
 * The V-I and V-T curves of a part's IBIS model at a project corner's column, for a curve view
 * (docs/ibis.md §9); null when the part has no IBIS model.
 */
export function partIbisCurves(part: PartModel, files: readonly IbisFileRecord[] | undefined, corner: Corner): ModelCurves | null {
  const ibis = partIbis(part, files);
  return ibis ? ibisCurvesAt(ibis.model, ibisColumnOf(corner)) : null;
}

/** Every part's IBIS reference resolved (throws the first unresolved one): for hosts checking a project. */
export function checkProjectIbis(data: ProjectData): void {
  for (const part of data.parts) partIbis(part, data.ibisFiles);
}

/** IBIS models in use, one row per part with a model: for reports (name, file, the pin it names, hash). */
export function ibisModelsUsed(data: ProjectData): { part: string; file: string; model: string; pin: string | null; sha256: string | null }[] {
  return data.parts.filter((p) => p.ibis).map((p) => ({
    part: p.name,
    file: p.ibis!.file,
    model: p.ibis!.model,
    pin: p.ibis!.pin ?? null,
    sha256: (data.ibisFiles ?? []).find((f) => f.name === p.ibis!.file)?.sha256 ?? null,
  }));
}
