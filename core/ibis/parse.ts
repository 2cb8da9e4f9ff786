/**
 * Parser for IBIS text (ANSI/EIA-656, versions 3.2 to 7.x; docs/ibis.md §1-§3). It reads the keywords
 * a board-level timing simulation needs, reports every other keyword as skipped with its line, and
 * throws an InputError naming the file, line and keyword for anything malformed. Pure: text in, typed
 * model out.
 */
import { InputError } from '../errors.js';
import { ibisNumber, ibisRatio, isNa } from './numbers.js';
import {
  type IbisComponent, type IbisFile, type IbisModel, type ModelSelector, type ModelType, type RampData, type SkippedKeyword,
  type Triple, type ViTable, type VtTable, MODEL_TYPES,
} from './types.js';

/** Keywords whose text is free-form header information (kept out of the model, not "skipped"). */
const HEADER_TEXT = new Set(['file name', 'file rev', 'date', 'source', 'notes', 'disclaimer', 'copyright', 'ibis ver', 'comment char', 'end']);

/** Keywords of a [Model] that hold a V-I table. */
const VI_KEYWORDS = { pullup: 'pullup', pulldown: 'pulldown', 'gnd clamp': 'gndClamp', 'power clamp': 'powerClamp' } as const;

/** Keywords of a [Model] that hold one typ/min/max triple on their own line. */
const TRIPLE_KEYWORDS = {
  'voltage range': 'voltageRange',
  'pullup reference': 'pullupReference',
  'pulldown reference': 'pulldownReference',
  'power clamp reference': 'powerClampReference',
  'gnd clamp reference': 'gndClampReference',
  'temperature range': 'temperatureRange',
} as const;

/** Model types that drive (need [Pulldown] or [Pullup] and an edge description). */
const PULLS_DOWN = new Set<ModelType>(['Output', 'I/O', '3-state', 'Open_drain', 'I/O_open_drain', 'Open_sink', 'I/O_open_sink', 'Output_ECL', 'I/O_ECL', '3-state_ECL']);
const PULLS_UP = new Set<ModelType>(['Output', 'I/O', '3-state', 'Open_source', 'I/O_open_source', 'Output_ECL', 'I/O_ECL', '3-state_ECL']);

/** A keyword's canonical form: case-insensitive, "_" and " " the same (the standard's rule). */
function canonical(keyword: string): string {
  return keyword.trim().toLowerCase().replace(/[_\s]+/g, ' ');
}

interface Row {
  line: number;
  tokens: string[];
}

type Section =
  | { kind: 'none' }
  | { kind: 'ignore' }
  | { kind: 'package'; component: IbisComponent; line: number; values: Map<string, Triple> }
  | { kind: 'pin'; component: IbisComponent }
  | { kind: 'selector'; selector: ModelSelector }
  | { kind: 'model'; model: Draft }
  | { kind: 'vi'; model: Draft; field: (typeof VI_KEYWORDS)[keyof typeof VI_KEYWORDS]; keyword: string; line: number; rows: Row[] }
  | { kind: 'vt'; model: Draft; edge: 'rising' | 'falling'; keyword: string; line: number; params: Map<string, { value: number; line: number }>; rows: Row[] }
  | { kind: 'ramp'; model: Draft; line: number; rows: Row[] };

type Draft = Omit<IbisModel, 'modelType'> & { modelType: ModelType | null };

/** Parses IBIS text. `source` names it in messages ("part.ibs line 42 [Pulldown]: ..."). Throws InputError. */
export function parseIbis(text: string, source: string): IbisFile {
  const lines = text.split(/\r?\n/);
  let comment = '|';
  let version: string | null = null;
  let fileName: string | null = null;
  const components: IbisComponent[] = [];
  const models: Draft[] = [];
  const selectors: ModelSelector[] = [];
  const skipped: SkippedKeyword[] = [];
  let component: IbisComponent | null = null;
  let section: Section = { kind: 'none' };
  let currentModel: Draft | null = null;
  let keyword = '(before the first keyword)';
  const fail = (line: number, reason: string, kw = keyword): never => {
    throw new InputError(`${source} line ${line} [${kw}]`, reason);
  };
  const number = (token: string, line: number, what: string): number => {
    const v = ibisNumber(token);
    if (v === null) fail(line, `${what}: "${token}" is not a number`);
    return v as number;
  };
  const triple = (tokens: string[], line: number, what: string): Triple => {
    if (tokens.length !== 3) fail(line, `${what}: expected three values (typ min max), got ${tokens.length}`);
    if (isNa(tokens[0])) fail(line, `${what}: the typ value is NA (typ is required)`);
    const opt = (t: string) => (isNa(t) ? null : number(t, line, what));
    return { typ: number(tokens[0], line, what), min: opt(tokens[1]), max: opt(tokens[2]) };
  };
  const modelOf = (line: number): Draft => currentModel ?? fail(line, 'only allowed inside a [Model]');

  /** Ends the section in progress: tables are validated and stored here. */
  const close = (): void => {
    const s = section;
    if (s.kind === 'vi') s.model[s.field] = viTable(s.rows, s.line, s.keyword);
    else if (s.kind === 'vt') s.model[s.edge].push(vtTable(s, source));
    else if (s.kind === 'ramp') s.model.ramp = ramp(s.rows, s.line);
    else if (s.kind === 'package') {
      const need = (name: string) => s.values.get(name) ?? fail(s.line, `${name} is missing`, 'Package');
      s.component.package = { line: s.line, rPkg: need('r_pkg'), lPkg: need('l_pkg'), cPkg: need('c_pkg') };
    }
    section = { kind: 'none' };
  };

  const viTable = (rows: Row[], line: number, kw: string): ViTable => {
    const cols = table(rows, line, kw, 'voltage');
    return { line, v: cols.x, i: cols.y };
  };
  const table = (rows: Row[], line: number, kw: string, what: string) => {
    if (rows.length < 2) fail(line, `the table has ${rows.length} row(s); at least two are needed`, kw);
    const x: number[] = [];
    const y: { typ: number[]; min: number[] | null; max: number[] | null } = { typ: [], min: [], max: [] };
    const naSeen = { min: 0, max: 0 };
    for (const row of rows) {
      if (row.tokens.length !== 4) {
        fail(row.line, `malformed table row: expected 4 columns (${what}, typ, min, max), got ${row.tokens.length}`, kw);
      }
      const [xt, typ, min, max] = row.tokens;
      if (isNa(xt)) fail(row.line, `NA in the ${what} column`, kw);
      if (isNa(typ)) fail(row.line, 'NA in the typ column (typ is required)', kw);
      const xv = number(xt, row.line, `${what} column`);
      if (x.length > 0 && !(xv > x[x.length - 1])) {
        fail(row.line, `the ${what} column is not monotonic: ${xt} follows ${x[x.length - 1]} (it must increase row by row)`, kw);
      }
      x.push(xv);
      y.typ.push(number(typ, row.line, 'typ column'));
      for (const [name, token] of [['min', min], ['max', max]] as const) {
        if (isNa(token)) naSeen[name]++;
        else y[name]!.push(number(token, row.line, `${name} column`));
      }
    }
    for (const name of ['min', 'max'] as const) {
      if (naSeen[name] === rows.length) y[name] = null;
      else if (naSeen[name] > 0) fail(line, `the ${name} column mixes NA and numbers (give all of it or NA in every row)`, kw);
    }
    return { x, y };
  };
  const vtTable = (s: Extract<Section, { kind: 'vt' }>, src: string): VtTable => {
    const get = (name: string, fallback: number | null) => {
      const p = s.params.get(name);
      if (p) return p.value;
      if (fallback === null) throw new InputError(`${src} line ${s.line} [${s.keyword}]`, `${name} is missing`);
      return fallback;
    };
    const vTyp = get('v_fixture', null);
    const cols = table(s.rows, s.line, s.keyword, 'time');
    return {
      line: s.line,
      fixture: {
        rFixture: get('r_fixture', null),
        vFixture: { typ: vTyp, min: s.params.get('v_fixture_min')?.value ?? null, max: s.params.get('v_fixture_max')?.value ?? null },
        cFixture: get('c_fixture', 0),
        lFixture: get('l_fixture', 0),
        rDut: get('r_dut', 0),
        lDut: get('l_dut', 0),
        cDut: get('c_dut', 0),
      },
      t: cols.x,
      v: cols.y,
    };
  };
  const ramp = (rows: Row[], line: number): RampData => {
    let rLoad = 50; // the standard's default R_load when [Ramp] omits it
    const edges: Partial<Record<'dv/dt_r' | 'dv/dt_f', RampData['rising']>> = {};
    for (const row of rows) {
      const [name, ...rest] = row.tokens;
      const key = name.toLowerCase();
      if (key === 'r_load') {
        const values = rest[0] === '=' ? rest.slice(1) : rest;
        if (values.length !== 1) fail(row.line, 'R_load: expected one value', 'Ramp');
        rLoad = number(values[0], row.line, 'R_load');
      } else if (key === 'dv/dt_r' || key === 'dv/dt_f') {
        if (rest.length !== 3) fail(row.line, `${name}: expected three ratios dV/dt (typ min max), got ${rest.length}`, 'Ramp');
        const ratio = (t: string, corner: string) => {
          if (isNa(t)) {
            if (corner === 'typ') fail(row.line, `${name}: the typ value is NA (typ is required)`, 'Ramp');
            return null;
          }
          const r = ibisRatio(t);
          if (!r || !(r.dt > 0)) fail(row.line, `${name} ${corner}: "${t}" is not a ratio dV/dt with dt > 0`, 'Ramp');
          return r;
        };
        edges[key] = { typ: ratio(rest[0], 'typ')!, min: ratio(rest[1], 'min'), max: ratio(rest[2], 'max') };
      } else {
        fail(row.line, `unknown [Ramp] entry "${name}" (known: dV/dt_r, dV/dt_f, R_load)`, 'Ramp');
      }
    }
    if (!edges['dv/dt_r']) fail(line, 'dV/dt_r is missing', 'Ramp');
    if (!edges['dv/dt_f']) fail(line, 'dV/dt_f is missing', 'Ramp');
    return { line, rising: edges['dv/dt_r']!, falling: edges['dv/dt_f']!, rLoad };
  };

  for (let index = 0; index < lines.length; index++) {
    const lineNo = index + 1;
    let raw = lines[index];
    const cut = raw.indexOf(comment);
    if (cut >= 0) raw = raw.slice(0, cut);
    const text0 = raw.trim();
    if (text0 === '') continue;
    const kwMatch = /^\[([^\]]+)\](.*)$/.exec(text0);
    if (kwMatch) {
      close();
      keyword = kwMatch[1].trim();
      const kw = canonical(keyword);
      const arg = kwMatch[2].trim();
      if (kw === 'ibis ver') {
        if (!/^\d+\.\d+$/.test(arg)) fail(lineNo, `expected a version such as 4.2, got "${arg}"`);
        version = arg;
        const major = Number(arg.split('.')[0]);
        if (major < 3 || major > 7) fail(lineNo, `version ${arg} is outside what this program reads (3.2 to 7.x)`);
      } else if (kw === 'comment char') {
        const m = /^(\S)_char$/.exec(arg);
        if (!m) fail(lineNo, `expected the form "|_char", got "${arg}"`);
        comment = m![1];
      } else if (kw === 'file name') {
        fileName = arg;
      } else if (kw === 'end') {
        break;
      } else if (HEADER_TEXT.has(kw)) {
        section = { kind: 'ignore' }; // free text, possibly over several lines
      } else if (kw === 'component') {
        if (arg === '') fail(lineNo, 'the component needs a name');
        component = { name: arg, line: lineNo, manufacturer: null, package: null, pins: [] };
        currentModel = null;
        components.push(component);
      } else if (kw === 'manufacturer') {
        if (!component) fail(lineNo, 'only allowed after a [Component]');
        component!.manufacturer = arg;
      } else if (kw === 'package') {
        if (!component) fail(lineNo, 'only allowed after a [Component]');
        section = { kind: 'package', component: component!, line: lineNo, values: new Map() };
      } else if (kw === 'pin') {
        if (!component) fail(lineNo, 'only allowed after a [Component]');
        section = { kind: 'pin', component: component! };
      } else if (kw === 'model selector') {
        if (arg === '') fail(lineNo, 'the model selector needs a name');
        const selector: ModelSelector = { name: arg, line: lineNo, options: [] };
        selectors.push(selector);
        currentModel = null;
        section = { kind: 'selector', selector };
      } else if (kw === 'model') {
        if (arg === '' || /\s/.test(arg)) fail(lineNo, `expected one model name, got "${arg}"`);
        if (models.some((m) => m.name === arg)) fail(lineNo, `a second [Model] named "${arg}"`);
        const model: Draft = {
          name: arg, line: lineNo, modelType: null, polarity: 'Non-Inverting', vinl: null, vinh: null, vmeas: null,
          cref: null, rref: null, vref: null, cComp: null, voltageRange: null, pullupReference: null, pulldownReference: null,
          powerClampReference: null, gndClampReference: null, temperatureRange: null, pullup: null, pulldown: null,
          gndClamp: null, powerClamp: null, ramp: null, rising: [], falling: [],
        };
        models.push(model);
        currentModel = model;
        section = { kind: 'model', model };
      } else if (Object.hasOwn(TRIPLE_KEYWORDS, kw)) {
        const model = modelOf(lineNo);
        section = { kind: 'model', model };
        model[TRIPLE_KEYWORDS[kw as keyof typeof TRIPLE_KEYWORDS]] = triple(arg.split(/\s+/), lineNo, keyword);
      } else if (Object.hasOwn(VI_KEYWORDS, kw)) {
        const model = modelOf(lineNo);
        const field = VI_KEYWORDS[kw as keyof typeof VI_KEYWORDS];
        if (model[field]) fail(lineNo, `a second [${keyword}] in model ${model.name}`);
        section = { kind: 'vi', model, field, keyword, line: lineNo, rows: [] };
      } else if (kw === 'ramp') {
        const model = modelOf(lineNo);
        if (model.ramp) fail(lineNo, `a second [Ramp] in model ${model.name}`);
        section = { kind: 'ramp', model, line: lineNo, rows: [] };
      } else if (kw === 'rising waveform' || kw === 'falling waveform') {
        const model = modelOf(lineNo);
        section = { kind: 'vt', model, edge: kw === 'rising waveform' ? 'rising' : 'falling', keyword, line: lineNo, params: new Map(), rows: [] };
      } else {
        skipped.push({ line: lineNo, keyword, reason: 'not read by this program (docs/ibis.md §1); its data up to the next keyword is skipped' });
        // The model in progress stays current: its later keywords are still read.
        section = { kind: 'ignore' };
      }
      continue;
    }
    const tokens = text0.split(/\s+/);
    switch (section.kind) {
      case 'none':
        fail(lineNo, `data outside any keyword: "${text0}"`);
        break;
      case 'ignore':
        break;
      case 'package': {
        const name = tokens[0].toLowerCase();
        if (!['r_pkg', 'l_pkg', 'c_pkg'].includes(name)) fail(lineNo, `unknown [Package] entry "${tokens[0]}" (known: R_pkg, L_pkg, C_pkg)`);
        section.values.set(name, triple(tokens.slice(1), lineNo, tokens[0]));
        break;
      }
      case 'pin': {
        if (tokens.length !== 3 && tokens.length !== 6) {
          fail(lineNo, `malformed pin row: expected "pin signal model" or "pin signal model R_pin L_pin C_pin", got ${tokens.length} columns`);
        }
        const opt = (t: string | undefined, what: string) => (t === undefined || isNa(t) ? null : number(t, lineNo, what));
        section.component.pins.push({
          line: lineNo, pin: tokens[0], signal: tokens[1], model: tokens[2],
          rPin: opt(tokens[3], 'R_pin'), lPin: opt(tokens[4], 'L_pin'), cPin: opt(tokens[5], 'C_pin'),
        });
        break;
      }
      case 'selector':
        section.selector.options.push({ model: tokens[0], description: tokens.slice(1).join(' ') });
        break;
      case 'model':
        modelParameter(section.model, tokens, lineNo);
        break;
      case 'vi':
      case 'ramp':
        section.rows.push({ line: lineNo, tokens });
        break;
      case 'vt': {
        const eq = /^([A-Za-z_]+)\s*=\s*(\S+)$/.exec(text0);
        if (eq) {
          const name = eq[1].toLowerCase();
          const known = ['r_fixture', 'v_fixture', 'v_fixture_min', 'v_fixture_max', 'c_fixture', 'l_fixture', 'r_dut', 'l_dut', 'c_dut'];
          if (!known.includes(name)) fail(lineNo, `unknown waveform parameter "${eq[1]}" (known: R_fixture, V_fixture, V_fixture_min, V_fixture_max, C_fixture, L_fixture, R_dut, L_dut, C_dut)`);
          if (section.rows.length > 0) fail(lineNo, `${eq[1]} after the table rows (fixture parameters come first)`);
          section.params.set(name, { value: number(eq[2], lineNo, eq[1]), line: lineNo });
        } else section.rows.push({ line: lineNo, tokens });
        break;
      }
    }
  }
  close();

  function modelParameter(model: Draft, tokens: string[], line: number): void {
    const joined = tokens.join(' ');
    const m = /^([A-Za-z_]+)\s*(?:=\s*)?(.*)$/.exec(joined);
    if (!m) fail(line, `cannot read the model parameter "${joined}"`);
    const name = m![1];
    const value = m![2].trim();
    const key = name.toLowerCase();
    const scalar = (what: string) => {
      if (isNa(value)) return null;
      return number(value, line, what);
    };
    switch (key) {
      case 'model_type': {
        const type = MODEL_TYPES.find((t) => t.toLowerCase() === value.toLowerCase());
        if (!type) fail(line, `Model_type "${value}" is not one this program reads (known: ${MODEL_TYPES.join(', ')})`);
        model.modelType = type!;
        break;
      }
      case 'polarity':
        if (!/^(non-inverting|inverting)$/i.test(value)) fail(line, `Polarity "${value}": expected Non-Inverting or Inverting`);
        model.polarity = /^non/i.test(value) ? 'Non-Inverting' : 'Inverting';
        break;
      case 'enable':
        break; // Active-High / Active-Low: timing nets are always enabled (docs/ibis.md §4)
      case 'vinl': model.vinl = scalar('Vinl'); break;
      case 'vinh': model.vinh = scalar('Vinh'); break;
      case 'vmeas': model.vmeas = scalar('Vmeas'); break;
      case 'cref': model.cref = scalar('Cref'); break;
      case 'rref': model.rref = scalar('Rref'); break;
      case 'vref': model.vref = scalar('Vref'); break;
      case 'c_comp': model.cComp = triple(value.split(/\s+/), line, 'C_comp'); break;
      default:
        skipped.push({ line, keyword: `${keyword} ${name}`, reason: 'model parameter not read by this program (docs/ibis.md §1)' });
    }
  }

  if (version === null) throw new InputError(`${source} line 1 [IBIS Ver]`, 'missing: an IBIS file starts with [IBIS Ver]');
  const finished = models.map((m) => finishModel(m, source));
  const names = new Set([...finished.map((m) => m.name), ...selectors.map((s) => s.name)]);
  for (const s of selectors) {
    for (const o of s.options) {
      if (!finished.some((m) => m.name === o.model)) {
        throw new InputError(`${source} line ${s.line} [Model Selector]`, `unknown model name "${o.model}" in selector ${s.name}`);
      }
    }
  }
  for (const c of components) {
    for (const p of c.pins) {
      if (['POWER', 'GND', 'NC'].includes(p.model.toUpperCase())) continue;
      if (!names.has(p.model)) {
        throw new InputError(`${source} line ${p.line} [Pin]`, `unknown model name "${p.model}" for pin ${p.pin} (no [Model] or [Model Selector] of that name)`);
      }
    }
  }
  return { source, version, fileName, components, models: finished, selectors, skipped };
}

/** Checks what a model needs to be simulated (the standard's required keywords per Model_type). */
function finishModel(model: Draft, source: string): IbisModel {
  const at = `${source} line ${model.line} [Model]`;
  if (!model.modelType) throw new InputError(at, `model ${model.name}: Model_type is missing`);
  if (!model.cComp) throw new InputError(at, `model ${model.name}: C_comp is missing`);
  const type = model.modelType;
  const references = model.pullupReference && model.pulldownReference && model.powerClampReference && model.gndClampReference;
  if (!model.voltageRange && !references) throw new InputError(at, `model ${model.name}: [Voltage Range] is missing (or give all four reference keywords)`);
  if (PULLS_DOWN.has(type) && !model.pulldown) throw new InputError(at, `model ${model.name} (${type}): [Pulldown] is missing`);
  if (PULLS_UP.has(type) && !model.pullup) throw new InputError(at, `model ${model.name} (${type}): [Pullup] is missing`);
  if ((PULLS_DOWN.has(type) || PULLS_UP.has(type)) && !model.ramp) throw new InputError(at, `model ${model.name} (${type}): [Ramp] is missing`);
  return { ...model, modelType: type };
}
