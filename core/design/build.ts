/**
 * Design file -> project: the rules a schema cannot say (units, ranges, duplicate names, references
 * between parts, layers, nets and buses, template expansion, connected topologies), every problem
 * collected with its field path (docs/design-file.md §7). Runs on data the schema check has
 * seen, but stays defensive: a wrong shape is skipped here because the schema already reported it.
 */
import { InputError } from '../errors.js';
import type {
  BudgetAllowance, BusDefinition, Corner, DriverModel, IbisFileRecord, NetDefinition, NetElement, NetEndpoint, NetRole, PartModel,
  ProjectData, ReceiverModel, StackupLayer, Waiver,
} from '../project/model.js';
import { STARTING_CORNERS } from '../project/empty.js';
import { ioStandardByName, IO_STANDARDS } from '../project/io-standards.js';
import { validateProject } from '../project/validate.js';
import { formatPath, type DesignIssue, type FieldPath } from './located.js';
import { readQuantity, readRatio } from './quantities.js';
import { expandTemplate } from './template.js';
import { sha256Hex } from '../hash/sha256.js';
import { parseQuantity } from '../units/quantity.js';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => typeof v === 'object' && v !== null && !Array.isArray(v);
const list = (v: unknown): unknown[] => (Array.isArray(v) ? v : []);
const str = (v: unknown, fallback = ''): string => (typeof v === 'string' ? v : fallback);

const ELEMENT_FIELDS: Record<NetElement['kind'], string[]> = {
  segment: ['a', 'b', 'layer', 'width', 'length', 'spacing'],
  line: ['a', 'b', 'z0', 'delay'],
  resistor: ['a', 'b', 'ohms'],
  capacitor: ['a', 'b', 'farads'],
  inductor: ['a', 'b', 'henries'],
  via: ['a', 'farads'],
};

export interface BuildResult {
  /** The project, or null when any issue was found. */
  project: ProjectData | null;
  issues: DesignIssue[];
}

/** Records a duplicate-name issue for every repeat; returns name -> first index. */
function uniqueNames(issues: DesignIssue[], items: readonly unknown[], path: FieldPath, what: string): Map<string, number> {
  const seen = new Map<string, number>();
  items.forEach((item, i) => {
    if (!isObj(item) || typeof item.name !== 'string') return;
    const first = seen.get(item.name);
    if (first !== undefined) {
      issues.push({ path: [...path, i, 'name'], message: `${what} "${item.name}" is defined twice (first at ${formatIndex(path, first)})` });
    } else {
      seen.set(item.name, i);
    }
  });
  return seen;
}
const formatIndex = (path: FieldPath, i: number) => formatPath([...path, i]);

/**
 * `ibisTexts`: the text of every .ibs file the design's ibisFiles name, by the path as written (the
 * host reads them relative to the design file; core does no I/O).
 */
export function buildProject(value: unknown, ibisTexts: ReadonlyMap<string, string> = new Map()): BuildResult {
  const issues: DesignIssue[] = [];
  if (!isObj(value)) return { project: null, issues: issues.length ? issues : [{ path: [], message: 'the file holds no design (expected a map with version, project, stackup, parts, buses)' }] };
  const q = (v: unknown, kind: Parameters<typeof readQuantity>[2], path: FieldPath, fallback?: number) =>
    readQuantity(issues, v, kind, path, fallback) ?? NaN;

  // ---------------------------------------------------------------- project info
  const p = isObj(value.project) ? value.project : {};
  const info = {
    name: str(p.name),
    boardRevision: str(p.boardRevision),
    description: str(p.description),
    guardBand: q(p.guardBand, 'nonNegativeTime', ['project', 'guardBand'], 25e-12),
    settleBand: q(p.settleBand, 'settleBand', ['project', 'settleBand'], 0.05),
  };

  // ---------------------------------------------------------------- stackup
  const s = isObj(value.stackup) ? value.stackup : {};
  const layerItems = list(s.layers);
  uniqueNames(issues, layerItems, ['stackup', 'layers'], 'layer');
  const layers: StackupLayer[] = [];
  layerItems.forEach((item, i) => {
    if (!isObj(item)) return;
    const at = (key: string): FieldPath => ['stackup', 'layers', i, key];
    const kind = item.kind as StackupLayer['kind'];
    const layer: StackupLayer = { name: str(item.name), kind, thickness: q(item.thickness, 'thickness', at('thickness')) };
    if (kind === 'copper') {
      if (item.role === undefined) issues.push({ path: ['stackup', 'layers', i], message: 'a copper layer needs role: signal or plane' });
      for (const key of ['dk', 'df'] as const) {
        if (item[key] !== undefined) issues.push({ path: at(key), atKey: true, message: `applies to dielectric and mask layers, not copper` });
      }
    } else {
      if (item.role !== undefined) issues.push({ path: at('role'), atKey: true, message: 'applies to copper layers only' });
      if (item.defaultWidth !== undefined) issues.push({ path: at('defaultWidth'), atKey: true, message: 'applies to copper layers only' });
    }
    if (item.dk !== undefined || kind !== 'copper') layer.dk = readRatio(issues, item.dk, at('dk'), 1, 100) ?? NaN;
    if (item.df !== undefined) layer.df = readRatio(issues, item.df, at('df'), 0, 1) ?? NaN;
    if (item.role !== undefined) layer.role = item.role as StackupLayer['role'];
    if (item.defaultWidth !== undefined) layer.defaultWidth = q(item.defaultWidth, 'width', at('defaultWidth'));
    layers.push(layer);
  });
  const layerByName = new Map(layers.map((l) => [l.name, l]));

  // ---------------------------------------------------------------- parts
  const partItems = list(value.parts);
  uniqueNames(issues, partItems, ['parts'], 'part');
  const parts: PartModel[] = [];
  partItems.forEach((item, i) => {
    if (!isObj(item)) return;
    const at: FieldPath = ['parts', i];
    const io = str(item.ioStandard);
    if (io !== '' && !ioStandardByName(io)) {
      issues.push({ path: [...at, 'ioStandard'], message: `unknown I/O standard "${io}" (presets: ${IO_STANDARDS.map((x) => x.name).join(', ')}; "" for a custom part)` });
    }
    const driver = isObj(item.driver) ? readDriver(item.driver, [...at, 'driver']) : null;
    const receiver = isObj(item.receiver) ? readReceiver(item.receiver, [...at, 'receiver']) : null;
    if (driver === null && receiver === null) issues.push({ path: at, message: 'a part needs a driver, a receiver or both' });
    const part: PartModel = { name: str(item.name), description: str(item.description), ioStandard: io, driver, receiver };
    if (isObj(item.ibis)) {
      part.ibis = { file: str(item.ibis.file), model: str(item.ibis.model) };
      if (item.ibis.pin !== undefined) part.ibis.pin = str(item.ibis.pin);
    }
    parts.push(part);
  });

  // ---------------------------------------------------------------- IBIS files (docs/ibis.md §9)
  const ibisItems = list(value.ibisFiles);
  uniqueNames(issues, ibisItems, ['ibisFiles'], 'IBIS file');
  const ibisFiles: IbisFileRecord[] = [];
  ibisItems.forEach((item, i) => {
    if (!isObj(item)) return;
    const path = str(item.path);
    const content = ibisTexts.get(path);
    if (content === undefined) {
      issues.push({ path: ['ibisFiles', i, 'path'], message: `"${path}" was not read (IBIS files are read relative to the design file)` });
      return;
    }
    ibisFiles.push({ name: str(item.name), sha256: sha256Hex(content), text: content });
  });
  const ibisNames = new Set(ibisItems.filter(isObj).map((x) => str(x.name)));
  partItems.forEach((item, i) => {
    if (!isObj(item) || !isObj(item.ibis)) return;
    const file = str(item.ibis.file);
    if (!ibisNames.has(file)) issues.push({ path: ['parts', i, 'ibis', 'file'], message: `IBIS file "${file}" is not listed under ibisFiles` });
  });
  const partByName = new Map(parts.map((x) => [x.name, x]));

  function readDriver(d: Obj, at: FieldPath): DriverModel {
    const f = (key: string): FieldPath => [...at, key];
    const ref = isObj(d.refLoad) ? d.refLoad : {};
    const model: DriverModel = {
      vol: q(d.vol, 'voltage', f('vol')),
      voh: q(d.voh, 'voltage', f('voh')),
      routHigh: q(d.routHigh, 'rout', f('routHigh')),
      routLow: q(d.routLow, 'rout', f('routLow')),
      riseTime: q(d.riseTime, 'edge', f('riseTime')),
      fallTime: q(d.fallTime, 'edge', f('fallTime')),
      tcoMin: q(d.tcoMin, 'signedTime', f('tcoMin')),
      tcoMax: q(d.tcoMax, 'signedTime', f('tcoMax')),
      refLoad: {
        ohms: q(ref.ohms, 'rout', [...at, 'refLoad', 'ohms']),
        vtt: q(ref.vtt, 'voltage', [...at, 'refLoad', 'vtt']),
        farads: q(ref.farads, 'cin', [...at, 'refLoad', 'farads'], 0),
      },
      vmeas: q(d.vmeas, 'voltage', f('vmeas')),
    };
    if (model.voh <= model.vol) issues.push({ path: f('voh'), message: 'must be above vol' });
    if (model.tcoMin > model.tcoMax) issues.push({ path: f('tcoMin'), message: 'must not exceed tcoMax' });
    return model;
  }

  function readReceiver(r: Obj, at: FieldPath): ReceiverModel {
    const f = (key: string): FieldPath => [...at, key];
    const vil = q(r.vil, 'voltage', f('vil'));
    const vih = q(r.vih, 'voltage', f('vih'));
    const vref = q(r.vref, 'voltage', f('vref'), (vil + vih) / 2);
    const model: ReceiverModel = {
      cin: q(r.cin, 'cin', f('cin')),
      vil, vih, vref,
      odtOhms: r.odtOhms === undefined || r.odtOhms === null ? null : q(r.odtOhms, 'ohms', f('odtOhms')),
      odtVtt: q(r.odtVtt, 'voltage', f('odtVtt'), vref),
      vmaxAbs: q(r.vmaxAbs, 'voltage', f('vmaxAbs')),
      vminAbs: q(r.vminAbs, 'voltage', f('vminAbs')),
      tsetup: q(r.tsetup, 'signedTime', f('tsetup')),
      thold: q(r.thold, 'signedTime', f('thold')),
    };
    if (isObj(r.derating)) {
      // plain SI numbers (V/s, s); the table's shape is checked with the part (core/project/validate.ts)
      const d = r.derating;
      const nums = (x: unknown): number[] => (Array.isArray(x) ? x.map(Number) : []);
      model.derating = {
        signalSlews: nums(d.signalSlews), strobeSlews: nums(d.strobeSlews),
        setup: Array.isArray(d.setup) ? d.setup.map(nums) : [], hold: Array.isArray(d.hold) ? d.hold.map(nums) : [],
      };
    }
    if (vil >= vih) issues.push({ path: f('vih'), message: 'must be above vil' });
    if (model.vminAbs >= model.vmaxAbs) issues.push({ path: f('vmaxAbs'), message: 'must be above vminAbs' });
    return model;
  }

  // ---------------------------------------------------------------- corners
  let corners: Corner[];
  if (value.corners === undefined) {
    corners = STARTING_CORNERS.map((c) => ({ ...c }));
  } else {
    const cornerItems = list(value.corners);
    if (cornerItems.length === 0) issues.push({ path: ['corners'], message: 'needs at least one corner (or leave corners out for slow/typical/fast)' });
    uniqueNames(issues, cornerItems, ['corners'], 'corner');
    corners = cornerItems.filter(isObj).map((c, i) => {
      const at = (key: string): FieldPath => ['corners', i, key];
      const m = (key: 'driverStrength' | 'edgeRate' | 'dk' | 'rail' | 'cin') => readRatio(issues, c[key], at(key), 0.01, 10) ?? NaN;
      return {
        name: str(c.name),
        driverStrength: m('driverStrength'), edgeRate: m('edgeRate'), dk: m('dk'),
        widthDelta: q(c.widthDelta, 'widthDelta', at('widthDelta')),
        rail: m('rail'), cin: m('cin'),
        tco: c.tco as Corner['tco'],
      };
    });
  }

  // ---------------------------------------------------------------- buses and nets
  const busItems = list(value.buses);
  uniqueNames(issues, busItems, ['buses'], 'bus');
  const buses: BusDefinition[] = [];
  const nets: NetDefinition[] = [];
  const netPlace = new Map<string, FieldPath>();
  busItems.forEach((item, b) => {
    if (!isObj(item)) return;
    const at: FieldPath = ['buses', b];
    const kind = item.kind as BusDefinition['kind'];
    const t = isObj(item.timing) ? item.timing : {};
    const tp = (key: string): FieldPath => [...at, 'timing', key];
    const foreign = kind === 'common-clock' ? ['tValidBefore', 'tValidAfter'] : ['cycleTime', 'clockSkew', 'jitter'];
    for (const key of foreign) {
      if (key in t) issues.push({ path: tp(key), atKey: true, message: `does not apply to a ${kind} bus` });
    }
    const timing: BusDefinition['timing'] = kind === 'common-clock'
      ? {
        kind,
        cycleTime: q(t.cycleTime, 'cycleTime', tp('cycleTime')),
        clockSkew: q(t.clockSkew, 'signedTime', tp('clockSkew'), 0),
        jitter: q(t.jitter, 'nonNegativeTime', tp('jitter'), 0),
      }
      : {
        kind: 'source-synchronous',
        tValidBefore: q(t.tValidBefore, 'signedTime', tp('tValidBefore')),
        tValidAfter: q(t.tValidAfter, 'signedTime', tp('tValidAfter')),
      };
    const allowanceItems = list(item.allowances);
    uniqueNames(issues, allowanceItems, [...at, 'allowances'], 'allowance');
    const allowances: BudgetAllowance[] = allowanceItems.filter(isObj).map((a, i) => ({
      name: str(a.name),
      value: q(a.value, 'signedTime', [...at, 'allowances', i, 'value']),
      appliesTo: a.appliesTo as BudgetAllowance['appliesTo'],
      note: str(a.note),
    }));
    const referenceNet = typeof item.referenceNet === 'string' ? item.referenceNet : null;
    const busName = str(item.name);
    const bus: BusDefinition = { name: busName, kind, description: str(item.description), referenceNet, timing, allowances };
    const pairing = item.cornerPairing;
    if (pairing === 'fixed' || pairing === 'cross') bus.cornerPairing = pairing;
    else if (Array.isArray(pairing)) bus.cornerPairing = pairing.filter(isObj).map((x) => ({ silicon: str(x.silicon), board: str(x.board) }));
    else if (pairing !== undefined) issues.push({ path: [...at, 'cornerPairing'], message: 'must be "fixed", "cross" or a list of {silicon, board}' });
    buses.push(bus);

    const template = isObj(item.template) ? item.template : null;
    const busNets: string[] = [];
    list(item.nets).forEach((netItem, n) => {
      if (!isObj(netItem)) return;
      const netPath: FieldPath = [...at, 'nets', n];
      const name = str(netItem.name);
      const earlier = netPlace.get(name);
      if (earlier) {
        issues.push({ path: [...netPath, 'name'], message: `net "${name}" is defined twice (first at ${formatPath(earlier)})` });
        return;
      }
      netPlace.set(name, netPath);
      busNets.push(name);
      const net = readNet(netItem, netPath, busName, template, [...at, 'template']);
      if (net) nets.push(net);
    });
    if (referenceNet !== null && !busNets.includes(referenceNet)) {
      issues.push({
        path: [...at, 'referenceNet'],
        message: `net "${referenceNet}" is not a net of bus ${busName} (its nets: ${busNets.slice(0, 12).join(', ')}${busNets.length > 12 ? ', ...' : ''})`,
      });
    }
    if (referenceNet === null && kind === 'source-synchronous') {
      issues.push({ path: at, message: 'a source-synchronous bus needs referenceNet: its strobe net' });
    }
  });

  function readNet(item: Obj, at: FieldPath, bus: string, template: Obj | null, templatePath: FieldPath): NetDefinition | null {
    const explicit = item.elements !== undefined;
    let driver: NetEndpoint;
    let receivers: NetEndpoint[];
    let elements: NetElement[];
    let origins: FieldPath[];
    let receiverOrigins: FieldPath[] = [];
    let rails: Record<string, number>;
    let role = (item.role ?? template?.role ?? 'data') as NetRole;
    if (explicit) {
      for (const key of ['segments', 'steps']) {
        if (item[key] !== undefined) issues.push({ path: [...at, key], atKey: true, message: 'applies to template nets; this net lists its own elements' });
      }
      if (!isObj(item.driver)) {
        issues.push({ path: at, message: 'a net with its own elements needs driver: {part, node, designator}' });
        return null;
      }
      if (list(item.receivers).length === 0) issues.push({ path: at, message: 'a net with its own elements needs at least one receiver' });
      driver = endpointOf(item.driver);
      receivers = list(item.receivers).filter(isObj).map(endpointOf);
      rails = readRails(item.rails, [...at, 'rails']);
      elements = [];
      origins = [];
      list(item.elements).forEach((e, i) => {
        const element = readElement(e, [...at, 'elements', i], new Set(Object.keys(rails)));
        if (element) {
          elements.push(element);
          origins.push([...at, 'elements', i]);
        }
      });
    } else {
      for (const key of ['driver', 'receivers', 'rails']) {
        if (item[key] !== undefined) issues.push({ path: [...at, key], atKey: true, message: 'applies to nets with their own elements; this net uses the bus template' });
      }
      if (!template) {
        issues.push({ path: at, message: `lists no elements and bus ${bus} has no template` });
        return null;
      }
      rails = readRails(template.rails, [...templatePath, 'rails']);
      const tDriver = isObj(template.driver) ? template.driver : {};
      const expanded = expandTemplate(issues, {
        steps: list(template.path),
        stepsPath: [...templatePath, 'path'],
        driver: { part: str(tDriver.part), designator: str(tDriver.designator), ...(typeof tDriver.node === 'string' ? { node: tDriver.node } : {}) },
        segments: list(item.segments),
        segmentsPath: [...at, 'segments'],
        replacements: isObj(item.steps) ? item.steps : {},
        replacementsPath: [...at, 'steps'],
        layers: layerByName,
        rails: new Set(Object.keys(rails)),
      });
      ({ driver, receivers, elements, origins, receiverOrigins } = expanded);
      role = (item.role ?? template.role ?? 'data') as NetRole;
    }
    const partsPath = explicit ? at : templatePath;
    const driverPart = partByName.get(driver.part);
    if (!driverPart) {
      issues.push({ path: [...partsPath, 'driver', 'part'], message: `part "${driver.part}" is not defined under parts` });
    } else if (driverPart.driver === null) {
      issues.push({ path: [...partsPath, 'driver', 'part'], message: `part "${driver.part}" has no driver model` });
    }
    receivers.forEach((r, i) => {
      const part = partByName.get(r.part);
      const where: FieldPath = explicit ? [...at, 'receivers', i, 'part'] : receiverOrigins[i] ?? templatePath;
      if (!part) issues.push({ path: where, message: `receiver ${r.designator}: part "${r.part}" is not defined under parts` });
      else if (part.receiver === null) issues.push({ path: where, message: `receiver ${r.designator}: part "${r.part}" has no receiver model` });
    });
    if (explicit) checkConnected(elements, origins, driver, receivers, new Set(['gnd', ...Object.keys(rails)]), at);
    return { name: str(item.name), bus, role, driver, receivers, elements, rails };
  }

  function endpointOf(e: Obj): NetEndpoint {
    return { part: str(e.part), node: str(e.node), designator: str(e.designator) };
  }

  function readRails(v: unknown, at: FieldPath): Record<string, number> {
    const rails: Record<string, number> = {};
    if (!isObj(v)) return rails;
    for (const [name, volts] of Object.entries(v)) {
      if (name === 'gnd') issues.push({ path: [...at, name], atKey: true, message: '"gnd" is always 0 V and cannot be a rail' });
      rails[name] = q(volts, 'voltage', [...at, name]);
    }
    return rails;
  }


  function readElement(e: unknown, at: FieldPath, railNames: ReadonlySet<string>): NetElement | null {
    if (!isObj(e) || typeof e.kind !== 'string' || !(e.kind in ELEMENT_FIELDS)) return null;
    const kind = e.kind as NetElement['kind'];
    const allowed = ELEMENT_FIELDS[kind];
    let ok = true;
    for (const key of Object.keys(e)) {
      if (key !== 'kind' && !allowed.includes(key)) {
        issues.push({ path: [...at, key], atKey: true, message: `does not apply to a ${kind} (its fields: ${allowed.join(', ')})` });
        ok = false;
      }
    }
    if (kind !== 'via' && typeof e.b !== 'string') {
      issues.push({ path: at, message: `a ${kind} needs node b` });
      return null;
    }
    const a = str(e.a);
    const b = str(e.b);
    const f = (key: string): FieldPath => [...at, key];
    let element: NetElement;
    switch (kind) {
      case 'segment': {
        const layerName = str(e.layer);
        const layer = layerByName.get(layerName);
        if (e.layer === undefined) issues.push({ path: at, message: 'a segment needs layer' });
        else if (!layer) issues.push({ path: f('layer'), message: `layer "${layerName}" is not in the stackup` });
        else if (layer.kind !== 'copper') issues.push({ path: f('layer'), message: `layer "${layerName}" is a ${layer.kind} layer; segments run on copper layers` });
        const width = e.width === undefined && layer?.defaultWidth !== undefined ? layer.defaultWidth : q(e.width, 'width', f('width'));
        element = { kind, a, b, layer: layerName, width, length: q(e.length, 'length', f('length'), 0) };
        if (e.spacing !== undefined) element.spacing = q(e.spacing, 'width', f('spacing'));
        break;
      }
      case 'line': element = { kind, a, b, z0: q(e.z0, 'z0', f('z0')), delay: q(e.delay, 'delay', f('delay')) }; break;
      case 'resistor': element = { kind, a, b, ohms: q(e.ohms, 'ohms', f('ohms')) }; break;
      case 'capacitor': element = { kind, a, b, farads: q(e.farads, 'farads', f('farads')) }; break;
      case 'inductor': element = { kind, a, b, henries: q(e.henries, 'henries', f('henries')) }; break;
      case 'via': element = { kind, a, farads: q(e.farads, 'viaC', f('farads')) }; break;
    }
    if (railNames.has(a) || a === 'gnd') {
      if (kind === 'segment' || kind === 'line' || kind === 'via') issues.push({ path: f('a'), message: `"${a}" is a fixed-voltage node; a ${kind} cannot start there` });
    }
    return ok ? element : null;
  }

  /** Every element and receiver must be reachable from the driver's node without passing a fixed node. */
  function checkConnected(
    elements: readonly NetElement[], origins: readonly FieldPath[], driver: NetEndpoint, receivers: readonly NetEndpoint[],
    fixed: ReadonlySet<string>, at: FieldPath,
  ): void {
    const ends = (e: NetElement) => (e.kind === 'via' ? [e.a] : [e.a, e.b]);
    const reached = new Set([driver.node]);
    let grew = true;
    while (grew) {
      grew = false;
      for (const e of elements) {
        const nodes = ends(e).filter((n) => !fixed.has(n));
        if (nodes.some((n) => reached.has(n))) {
          for (const n of nodes) if (!reached.has(n)) { reached.add(n); grew = true; }
        }
      }
    }
    if (elements.length > 0 && !elements.some((e) => ends(e).includes(driver.node))) {
      issues.push({ path: [...at, 'driver', 'node'], message: `node "${driver.node}" is not on any element of the net` });
      return;
    }
    elements.forEach((e, i) => {
      const nodes = ends(e).filter((n) => !fixed.has(n));
      if (!nodes.some((n) => reached.has(n))) {
        issues.push({ path: origins[i], message: `not connected to the driver node "${driver.node}" (nodes ${ends(e).join(', ')} are unconnected)` });
      }
    });
    receivers.forEach((r, i) => {
      if (!reached.has(r.node)) issues.push({ path: [...at, 'receivers', i, 'node'], message: `node "${r.node}" is not connected to the driver node "${driver.node}"` });
    });
  }

  // ---------------------------------------------------------------- waivers (docs/workbench.md, "Waivers")
  const waivers: Waiver[] = [];
  const netNames = new Set(nets.map((n) => n.name));
  const waivedNets = new Map<string, number>();
  list(value.waivers).forEach((item, i) => {
    if (!isObj(item)) return;
    const at = (key: string): FieldPath => ['waivers', i, key];
    const net = str(item.net);
    if (!netNames.has(net)) issues.push({ path: at('net'), message: `net "${net}" is not in the design` });
    const first = waivedNets.get(net);
    if (first !== undefined) issues.push({ path: at('net'), message: `net "${net}" is waived twice (first at ${formatIndex(['waivers'], first)})` });
    else waivedNets.set(net, i);
    // The margin's unit tells the kind of check: a time (timing margins) or a voltage (signal checks).
    let margin: number | null = null;
    let unit: 's' | 'V' | null = null;
    if (item.margin !== null && item.margin !== undefined) {
      for (const [dimension, u] of [['time', 's'], ['voltage', 'V']] as const) {
        try {
          margin = parseQuantity(item.margin, dimension, formatPath(at('margin')));
          unit = u;
          break;
        } catch {
          // not this dimension: try the next
        }
      }
      if (unit === null || typeof item.margin !== 'string') {
        issues.push({ path: at('margin'), message: `"${String(item.margin)}" is neither a time (e.g. -14ps) nor a voltage (e.g. -12mV)` });
      }
    }
    const status = item.status === 'tight' ? 'tight' : 'fail';
    for (const key of ['comment', 'author'] as const) {
      if (str(item[key]).trim() === '') issues.push({ path: at(key), message: 'is required' });
    }
    if (Number.isNaN(Date.parse(str(item.at)))) issues.push({ path: at('at'), message: `"${str(item.at)}" is not an ISO 8601 time` });
    waivers.push({ net, check: str(item.check), status, margin, unit, comment: str(item.comment), author: str(item.author), at: str(item.at) });
  });

  if (issues.length > 0) return { project: null, issues };
  const project: ProjectData = { info, stackup: { name: str(s.name), layers }, parts, buses, nets, corners };
  if (ibisFiles.length > 0) project.ibisFiles = ibisFiles;
  if (waivers.length > 0) project.waivers = waivers;
  try {
    validateProject(project);
  } catch (error) {
    // The project validator has the last word; its message names the entity in words.
    if (error instanceof InputError) return { project: null, issues: [{ path: [], message: error.message }] };
    throw error;
  }
  return { project, issues };
}
