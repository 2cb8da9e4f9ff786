/**
 * Net file format, version 1 (docs/design.md §8.1): JSON, numbers in SI base units, strings with units accepted
 * ("400ps", "50ohm", "2pF"). Additions of this program, all optional: driver.routHigh/routLow (instead
 * of rout), driver.refLoad {ohms, vtt, farads} and driver.vmeas (Tco reference load), element kind
 * "via" {a, farads} (lumped C to ground), receiver vref, cin, odt {ohms, vtt}, vmaxAbs, vminAbs, and
 * top-level "version" (1) and "note" (free text). `stop` may be omitted (chosen automatically).
 * IBIS forms (docs/ibis.md §7): a driver {node, ibis: {file, model}, corner} instead of the linear
 * fields, and receiver.ibis {file, model} (vil/vih then default to the model's Vinl/Vinh).
 *
 *     { "driver": { "node": "drv", "vlow": 0, "vhigh": 1.8, "rout": 25, "riseTime": "400ps", "fallTime": 4e-10 },
 *       "elements": [ { "kind": "line", "a": "drv", "b": "rx", "z0": 50, "delay": "1ns" } ],
 *       "rails": { "vtt": 0.9 }, "receivers": [ { "node": "rx", "vil": 0.8, "vih": 1.0 } ], "stop": "20ns" }
 */
import { InputError } from '../errors.js';
import { type Dimension, type QuantityLimits, parseQuantity } from '../units/quantity.js';
import { checkCircuit } from './topology.js';
import {
  type Circuit, type CircuitElement, type DriverSpec, type IbisReference, type ReceiverSpec, type ReferenceLoad, GROUND,
} from './types.js';

type Json = Record<string, unknown>;

function object(value: unknown, field: string): Json {
  if (typeof value !== 'object' || value === null || Array.isArray(value)) {
    throw new InputError(field, `expected an object, got ${value === null ? 'null' : Array.isArray(value) ? 'an array' : typeof value}`);
  }
  return value as Json;
}

function onlyKeys(json: Json, known: readonly string[], field: string): void {
  for (const key of Object.keys(json)) {
    if (!known.includes(key)) throw new InputError(`${field}.${key}`, `unknown field (known: ${known.join(', ')})`);
  }
}

function nodeName(value: unknown, field: string): string {
  if (typeof value !== 'string' || value.trim() === '') throw new InputError(field, 'expected a node name (a non-empty string)');
  if (/\s/.test(value)) throw new InputError(field, `node name "${value}" contains white space`);
  return value;
}

function quantity(json: Json, key: string, dimension: Dimension, field: string, limits: QuantityLimits = {}): number {
  const value = json[key];
  if (value === undefined) throw new InputError(`${field}.${key}`, `missing ${dimension} value`);
  const name = `${field}.${key}`;
  const si = parseQuantity(value, dimension, name);
  if (limits.min !== undefined && si < 0 && limits.min >= 0) {
    throw new InputError(name, `negative ${dimension} (${si}) is not allowed`);
  }
  return parseQuantity(value, dimension, name, limits);
}

function optionalQuantity(json: Json, key: string, dimension: Dimension, field: string, limits: QuantityLimits = {}): number | null {
  return json[key] === undefined || json[key] === null ? null : quantity(json, key, dimension, field, limits);
}

const POSITIVE: QuantityLimits = { min: 0, minExclusive: true };
const NON_NEGATIVE: QuantityLimits = { min: 0 };

function ibisReference(value: unknown, field: string): IbisReference {
  const json = object(value, field);
  onlyKeys(json, ['file', 'model'], field);
  for (const key of ['file', 'model'] as const) {
    if (typeof json[key] !== 'string' || (json[key] as string).trim() === '') throw new InputError(`${field}.${key}`, 'expected a non-empty string');
  }
  return { file: json.file as string, model: json.model as string };
}

/**
 * IBIS driver form (docs/ibis.md §7): {node, ibis: {file, model}, corner}. The linear fields are
 * placeholders until the host resolves the model (attachIbisModels in core/ibis).
 */
function parseIbisDriver(json: Json, field: string): DriverSpec {
  onlyKeys(json, ['node', 'ibis', 'corner'], field);
  const corner = json.corner ?? 'typ';
  if (corner !== 'typ' && corner !== 'min' && corner !== 'max') {
    throw new InputError(`${field}.corner`, `expected "typ", "min" or "max", got ${JSON.stringify(corner)}`);
  }
  return {
    node: nodeName(json.node, `${field}.node`),
    vlow: 0, vhigh: 1, routHigh: 1, routLow: 1, riseTime: 0, fallTime: 0, refLoad: null, vmeas: null,
    ibis: { ref: ibisReference(json.ibis, `${field}.ibis`), corner },
  };
}

function parseDriver(value: unknown, field: string): DriverSpec {
  const json = object(value, field);
  if (json.ibis !== undefined) return parseIbisDriver(json, field);
  onlyKeys(json, ['node', 'vlow', 'vhigh', 'rout', 'routHigh', 'routLow', 'riseTime', 'fallTime', 'refLoad', 'vmeas'], field);
  const vlow = quantity(json, 'vlow', 'voltage', field);
  const vhigh = quantity(json, 'vhigh', 'voltage', field);
  if (!(vhigh > vlow)) throw new InputError(`${field}.vhigh`, `must be above vlow (${vlow} V), got ${vhigh} V`);
  let routHigh: number;
  let routLow: number;
  if (json.rout !== undefined) {
    if (json.routHigh !== undefined || json.routLow !== undefined) {
      throw new InputError(`${field}.rout`, 'give either rout or routHigh/routLow, not both');
    }
    routHigh = routLow = quantity(json, 'rout', 'resistance', field, POSITIVE);
  } else {
    routHigh = quantity(json, 'routHigh', 'resistance', field, POSITIVE);
    routLow = quantity(json, 'routLow', 'resistance', field, POSITIVE);
  }
  let refLoad: ReferenceLoad | null = null;
  if (json.refLoad !== undefined && json.refLoad !== null) {
    const f = `${field}.refLoad`;
    const r = object(json.refLoad, f);
    onlyKeys(r, ['ohms', 'vtt', 'farads'], f);
    refLoad = {
      ohms: quantity(r, 'ohms', 'resistance', f, POSITIVE),
      vtt: quantity(r, 'vtt', 'voltage', f),
      farads: r.farads === undefined ? 0 : quantity(r, 'farads', 'capacitance', f, NON_NEGATIVE),
    };
  }
  return {
    node: nodeName(json.node, `${field}.node`),
    vlow,
    vhigh,
    routHigh,
    routLow,
    riseTime: quantity(json, 'riseTime', 'time', field, NON_NEGATIVE),
    fallTime: quantity(json, 'fallTime', 'time', field, NON_NEGATIVE),
    refLoad,
    vmeas: optionalQuantity(json, 'vmeas', 'voltage', field),
  };
}

function parseElement(value: unknown, field: string): CircuitElement {
  const json = object(value, field);
  const kind = json.kind;
  const a = () => nodeName(json.a, `${field}.a`);
  const b = () => nodeName(json.b, `${field}.b`);
  switch (kind) {
    case 'line':
      onlyKeys(json, ['kind', 'a', 'b', 'z0', 'delay'], field);
      return { kind, a: a(), b: b(), z0: quantity(json, 'z0', 'resistance', field, POSITIVE), delay: quantity(json, 'delay', 'time', field, POSITIVE) };
    case 'resistor':
      onlyKeys(json, ['kind', 'a', 'b', 'ohms'], field);
      return { kind, a: a(), b: b(), ohms: quantity(json, 'ohms', 'resistance', field, POSITIVE) };
    case 'capacitor':
      onlyKeys(json, ['kind', 'a', 'b', 'farads'], field);
      return { kind, a: a(), b: b(), farads: quantity(json, 'farads', 'capacitance', field, NON_NEGATIVE) };
    case 'inductor':
      onlyKeys(json, ['kind', 'a', 'b', 'henries'], field);
      return { kind, a: a(), b: b(), henries: quantity(json, 'henries', 'inductance', field, POSITIVE) };
    case 'via':
      onlyKeys(json, ['kind', 'a', 'farads'], field);
      return { kind, a: a(), farads: quantity(json, 'farads', 'capacitance', field, NON_NEGATIVE) };
    default:
      throw new InputError(`${field}.kind`, `unknown element kind ${JSON.stringify(kind)} (known: line, resistor, capacitor, inductor, via)`);
  }
}

function parseReceiver(value: unknown, field: string): ReceiverSpec {
  const json = object(value, field);
  onlyKeys(json, ['node', 'vil', 'vih', 'vref', 'cin', 'odt', 'vmaxAbs', 'vminAbs', 'ibis'], field);
  const ibis = json.ibis === undefined ? undefined : ibisReference(json.ibis, `${field}.ibis`);
  // An IBIS receiver may leave vil/vih to the model's Vinl/Vinh (NaN until attachIbisModels fills them).
  const vil = ibis && json.vil === undefined ? NaN : quantity(json, 'vil', 'voltage', field);
  const vih = ibis && json.vih === undefined ? NaN : quantity(json, 'vih', 'voltage', field);
  if (!Number.isNaN(vil) && !Number.isNaN(vih) && !(vih > vil)) throw new InputError(`${field}.vih`, `must be above vil (${vil} V), got ${vih} V`);
  let odt: ReceiverSpec['odt'] = null;
  if (json.odt !== undefined && json.odt !== null) {
    const f = `${field}.odt`;
    const o = object(json.odt, f);
    onlyKeys(o, ['ohms', 'vtt'], f);
    odt = { ohms: quantity(o, 'ohms', 'resistance', f, POSITIVE), vtt: quantity(o, 'vtt', 'voltage', f) };
  }
  return {
    node: nodeName(json.node, `${field}.node`),
    ...(ibis ? { ibis } : {}),
    vil,
    vih,
    vref: optionalQuantity(json, 'vref', 'voltage', field) ?? (vil + vih) / 2,
    cin: json.cin === undefined ? 0 : quantity(json, 'cin', 'capacitance', field, NON_NEGATIVE),
    odt,
    vmaxAbs: optionalQuantity(json, 'vmaxAbs', 'voltage', field),
    vminAbs: optionalQuantity(json, 'vminAbs', 'voltage', field),
  };
}

/** "elements[3] (line drv->rx)" from the raw JSON when its kind and nodes are readable, else "elements[3]". */
function rawElementLabel(index: number, raw: unknown): string {
  const r = (typeof raw === 'object' && raw !== null ? raw : {}) as Json;
  const name = (v: unknown) => (typeof v === 'string' ? v : '?');
  if (typeof r.kind !== 'string') return `elements[${index}]`;
  const b = r.kind === 'via' ? GROUND : name(r.b);
  return `elements[${index}] (${r.kind} ${name(r.a)}->${b})`;
}

/**
 * Parses and fully validates a net file (format v1). `where` names the source (a file name) and
 * prefixes every message, e.g. "net.json: elements[3] (line drv->rx).z0: ...". Throws InputError.
 */
export function parseNetFile(json: unknown, where: string): Circuit {
  const at = (field: string) => `${where}: ${field}`;
  const top = object(json, where);
  for (const key of Object.keys(top)) {
    if (!['version', 'note', 'driver', 'elements', 'rails', 'receivers', 'stop'].includes(key)) {
      throw new InputError(at(key), 'unknown field (known: version, note, driver, elements, rails, receivers, stop)');
    }
  }
  if (top.version !== undefined && top.version !== 1) {
    throw new InputError(at('version'), `unsupported net file version ${JSON.stringify(top.version)} (this program reads version 1)`);
  }
  if (top.driver === undefined) throw new InputError(at('driver'), 'missing');
  const driver = parseDriver(top.driver, at('driver'));
  if (!Array.isArray(top.elements) || top.elements.length === 0) {
    throw new InputError(at('elements'), 'expected a non-empty array of elements');
  }
  const elements = top.elements.map((element, index) => {
    return parseElement(element, at(rawElementLabel(index, element)));
  });
  const rails: Record<string, number> = {};
  if (top.rails !== undefined) {
    const r = object(top.rails, at('rails'));
    for (const [name, volts] of Object.entries(r)) {
      if (name === GROUND) throw new InputError(at(`rails.${name}`), '"gnd" is always 0 V and cannot be a rail');
      nodeName(name, at(`rails.${name}`));
      rails[name] = parseQuantity(volts, 'voltage', at(`rails.${name}`));
    }
  }
  if (!Array.isArray(top.receivers) || top.receivers.length === 0) {
    throw new InputError(at('receivers'), 'expected a non-empty array of receivers (there is nothing to measure without one)');
  }
  const receivers = top.receivers.map((r, index) => parseReceiver(r, at(`receivers[${index}]`)));
  const stop = top.stop === undefined || top.stop === null ? null : parseQuantity(top.stop, 'time', at('stop'), POSITIVE);
  const circuit: Circuit = { driver, elements, rails, receivers, stop };
  checkCircuit(circuit, where);
  return circuit;
}
