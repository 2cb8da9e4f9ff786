/**
 * Checks a project (or one edited entity) before it is written, so the file never holds a value the
 * solver or the budget cannot use. Every message names the place ("segment 3 of net DQ5").
 */
import { require_ } from '../errors.js';
import type {
  BusDefinition, Corner, NetDefinition, NetElement, PartModel, ProjectData, ProjectInfo, Stackup,
} from './model.js';
import { ioStandardByName } from './io-standards.js';

const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const named = (v: unknown): boolean => typeof v === 'string' && v.trim().length > 0;

function requireFinite(value: unknown, where: string, min?: { value: number; exclusive: boolean }): void {
  require_(finite(value), where, `must be a finite number, got ${String(value)}`);
  if (min) {
    const ok = min.exclusive ? (value as number) > min.value : (value as number) >= min.value;
    require_(ok, where, `must be ${min.exclusive ? 'greater than' : 'at least'} ${min.value}, got ${String(value)}`);
  }
}
const positive = { value: 0, exclusive: true };
const nonNegative = { value: 0, exclusive: false };

function requireUnique(names: string[], what: string): void {
  const seen = new Set<string>();
  for (const name of names) {
    require_(named(name), what, 'every name must be a non-empty text');
    require_(!seen.has(name), `${what} "${name}"`, 'the name is used twice');
    seen.add(name);
  }
}

export function validateInfo(info: ProjectInfo): void {
  require_(named(info.name), 'project name', 'must not be empty');
  require_(typeof info.boardRevision === 'string', 'project board revision', 'must be text');
  require_(typeof info.description === 'string', 'project description', 'must be text');
  requireFinite(info.guardBand, 'project guard band', nonNegative);
  requireFinite(info.settleBand, 'project settle band', positive);
}

export function validateStackup(stackup: Stackup): void {
  require_(typeof stackup.name === 'string', 'stackup name', 'must be text');
  requireUnique(stackup.layers.map((l) => l.name), 'stackup layer');
  stackup.layers.forEach((layer, i) => {
    const where = `stackup layer ${i + 1} (${layer.name})`;
    require_(['copper', 'dielectric', 'mask'].includes(layer.kind), where, `unknown kind "${String(layer.kind)}"`);
    requireFinite(layer.thickness, `${where} thickness`, positive);
    if (layer.kind === 'copper') {
      require_(layer.role === 'signal' || layer.role === 'plane', where, 'a copper layer needs the role "signal" or "plane"');
    } else {
      requireFinite(layer.dk, `${where} Dk`, { value: 1, exclusive: false });
    }
    if (layer.df !== undefined) requireFinite(layer.df, `${where} Df`, nonNegative);
    if (layer.defaultWidth !== undefined) requireFinite(layer.defaultWidth, `${where} default width`, positive);
  });
}

export function validatePart(part: PartModel): void {
  const where = `part ${part.name}`;
  require_(named(part.name), 'part name', 'must not be empty');
  require_(
    part.ioStandard === '' || ioStandardByName(part.ioStandard) !== undefined,
    `${where} I/O standard`,
    `unknown preset "${part.ioStandard}" (use "" for a custom part)`,
  );
  require_(part.driver !== null || part.receiver !== null, where, 'needs a driver model, a receiver model or both');
  const d = part.driver;
  if (d) {
    for (const key of ['vol', 'voh', 'vmeas'] as const) requireFinite(d[key], `${where} driver ${key}`);
    for (const key of ['routHigh', 'routLow', 'riseTime', 'fallTime'] as const) requireFinite(d[key], `${where} driver ${key}`, positive);
    requireFinite(d.tcoMin, `${where} driver tcoMin`);
    requireFinite(d.tcoMax, `${where} driver tcoMax`);
    require_(d.tcoMin <= d.tcoMax, `${where} driver`, 'tcoMin must not exceed tcoMax');
    require_(d.voh > d.vol, `${where} driver`, 'VOH must be above VOL');
    requireFinite(d.refLoad?.ohms, `${where} driver reference load ohms`, positive);
    requireFinite(d.refLoad?.vtt, `${where} driver reference load vtt`);
    requireFinite(d.refLoad?.farads, `${where} driver reference load farads`, nonNegative);
  }
  const r = part.receiver;
  if (r) {
    requireFinite(r.cin, `${where} receiver cin`, nonNegative);
    for (const key of ['vil', 'vih', 'vref', 'odtVtt', 'vmaxAbs', 'vminAbs', 'tsetup', 'thold'] as const) {
      requireFinite(r[key], `${where} receiver ${key}`);
    }
    require_(r.vil < r.vih, `${where} receiver`, 'VIL must be below VIH');
    require_(r.vminAbs < r.vmaxAbs, `${where} receiver`, 'the absolute minimum must be below the absolute maximum');
    if (r.odtOhms !== null) requireFinite(r.odtOhms, `${where} receiver odtOhms`, positive);
    const d = r.derating;
    if (d) {
      const w = `${where} receiver slew derating`;
      for (const key of ['signalSlews', 'strobeSlews'] as const) {
        d[key].forEach((x, i) => requireFinite(x, `${w} ${key}[${i}]`, positive));
        require_(d[key].every((x, i) => i === 0 || x > d[key][i - 1]), `${w} ${key}`, 'slew rates must be ascending');
      }
      for (const key of ['setup', 'hold'] as const) {
        require_(d[key].length === d.signalSlews.length, `${w} ${key}`, `needs one row per signal slew (${d.signalSlews.length}), got ${d[key].length}`);
        d[key].forEach((row, i) => {
          require_(row.length === d.strobeSlews.length, `${w} ${key} row ${i + 1}`, `needs one value per strobe slew (${d.strobeSlews.length}), got ${row.length}`);
          row.forEach((x, j) => requireFinite(x, `${w} ${key}[${i}][${j}]`));
        });
      }
    }
  }
}

export function validateBus(bus: BusDefinition): void {
  const where = `bus ${bus.name}`;
  require_(named(bus.name), 'bus name', 'must not be empty');
  require_(bus.kind === 'common-clock' || bus.kind === 'source-synchronous', where, `unknown kind "${String(bus.kind)}"`);
  require_(bus.timing?.kind === bus.kind, `${where} timing`, `timing must be of kind "${bus.kind}"`);
  const t = bus.timing;
  if (t.kind === 'common-clock') {
    requireFinite(t.cycleTime, `${where} cycle time`, positive);
    requireFinite(t.clockSkew, `${where} clock skew`);
    requireFinite(t.jitter, `${where} jitter`, nonNegative);
  } else {
    requireFinite(t.tValidBefore, `${where} valid-before time`);
    requireFinite(t.tValidAfter, `${where} valid-after time`);
  }
  require_(
    bus.cornerPairing === undefined || bus.cornerPairing === 'fixed' || bus.cornerPairing === 'cross' || Array.isArray(bus.cornerPairing),
    `${where} corner pairing`, 'must be "fixed", "cross" or a list of {silicon, board} corner names',
  );
  requireUnique(bus.allowances.map((a) => a.name), `${where} allowance`);
  for (const a of bus.allowances) {
    requireFinite(a.value, `${where} allowance ${a.name}`);
    require_(['setup', 'hold', 'both'].includes(a.appliesTo), `${where} allowance ${a.name}`, 'appliesTo must be setup, hold or both');
  }
}

export function validateElement(element: NetElement, where: string, copperLayers: ReadonlySet<string>): void {
  require_(named(element.a), where, 'node a must be named');
  if (element.kind !== 'via') require_(named(element.b), where, 'node b must be named');
  require_(
    element.kind === 'segment' || (element as { spacing?: unknown }).spacing === undefined,
    `${where} pair spacing`, 'applies only to routed segments (a pair gap on a stackup layer)',
  );
  switch (element.kind) {
    case 'segment':
      require_(copperLayers.has(element.layer), where, `layer "${element.layer}" is not a copper layer of the stackup`);
      requireFinite(element.width, `${where} width`, positive);
      requireFinite(element.length, `${where} length`, nonNegative);
      // A pair gap makes the segment one leg of an edge-coupled pair (odd-mode analysis, core/netbuild).
      if (element.spacing !== undefined) requireFinite(element.spacing, `${where} pair spacing`, positive);
      return;
    case 'line':
      requireFinite(element.z0, `${where} Z0`, positive);
      requireFinite(element.delay, `${where} delay`, nonNegative);
      return;
    case 'resistor': requireFinite(element.ohms, `${where} ohms`, positive); return;
    case 'capacitor': requireFinite(element.farads, `${where} farads`, positive); return;
    case 'inductor': requireFinite(element.henries, `${where} henries`, positive); return;
    case 'via': requireFinite(element.farads, `${where} farads`, nonNegative); return;
    default:
      require_(false, where, `unknown element kind "${(element as { kind: string }).kind}"`);
  }
}

export function copperLayerNames(stackup: Stackup): Set<string> {
  return new Set(stackup.layers.filter((l) => l.kind === 'copper').map((l) => l.name));
}

export function validateNet(net: NetDefinition, project: Pick<ProjectData, 'stackup' | 'parts' | 'buses'>): void {
  const where = `net ${net.name}`;
  require_(named(net.name), 'net name', 'must not be empty');
  require_(project.buses.some((b) => b.name === net.bus), where, `bus "${net.bus}" is not in the project`);
  require_(['data', 'strobe', 'clock', 'address', 'command', 'control'].includes(net.role), where, `unknown role "${net.role}"`);
  const parts = new Map(project.parts.map((p) => [p.name, p]));
  const driverPart = parts.get(net.driver.part);
  require_(driverPart !== undefined, `${where} driver ${net.driver.designator}`, `part "${net.driver.part}" is not in the project`);
  require_(driverPart.driver !== null, `${where} driver ${net.driver.designator}`, `part "${net.driver.part}" has no driver model`);
  require_(net.receivers.length > 0, where, 'needs at least one receiver');
  for (const r of net.receivers) {
    const part = parts.get(r.part);
    require_(part !== undefined, `${where} receiver ${r.designator}`, `part "${r.part}" is not in the project`);
    require_(part.receiver !== null, `${where} receiver ${r.designator}`, `part "${r.part}" has no receiver model`);
  }
  for (const [name, volts] of Object.entries(net.rails)) requireFinite(volts, `${where} rail ${name}`);
  const copper = copperLayerNames(project.stackup);
  net.elements.forEach((element, i) => validateElement(element, `element ${i + 1} (${element.kind}) of ${where}`, copper));
}

export function validateCorners(corners: readonly Corner[]): void {
  require_(corners.length > 0, 'corners', 'at least one corner is needed');
  requireUnique(corners.map((c) => c.name), 'corner');
  for (const c of corners) {
    const where = `corner ${c.name}`;
    for (const key of ['driverStrength', 'edgeRate', 'dk', 'rail', 'cin'] as const) requireFinite(c[key], `${where} ${key}`, positive);
    requireFinite(c.widthDelta, `${where} widthDelta`);
    require_(['min', 'max', 'typ'].includes(c.tco), where, 'tco must be min, max or typ');
  }
}

/** Checks a whole project, including every cross-reference. */
export function validateProject(data: ProjectData): void {
  validateInfo(data.info);
  validateStackup(data.stackup);
  requireUnique(data.parts.map((p) => p.name), 'part');
  data.parts.forEach(validatePart);
  requireUnique(data.buses.map((b) => b.name), 'bus');
  data.buses.forEach(validateBus);
  requireUnique(data.nets.map((n) => n.name), 'net');
  for (const net of data.nets) validateNet(net, data);
  validateReferences(data);
  validateCorners(data.corners);
  validateIbisReferences(data);
  validateWaivers(data);
}

/**
 * Each waiver names a net of the project (at most one per net) and carries a comment and an author
 * (docs/workbench.md, "Waivers").
 */
export function validateWaivers(data: Pick<ProjectData, 'nets' | 'waivers'>): void {
  const waivers = data.waivers ?? [];
  requireUnique(waivers.map((w) => w.net), 'waiver of net');
  const nets = new Set(data.nets.map((n) => n.name));
  for (const w of waivers) {
    const where = `waiver of net ${w.net}`;
    require_(nets.has(w.net), where, `net "${w.net}" is not in the project`);
    require_(w.comment.trim().length > 0, `${where} comment`, 'is required: say why the net is accepted as it is');
    require_(w.author.trim().length > 0, `${where} author`, 'is required: say who accepts it');
    require_(!Number.isNaN(Date.parse(w.at)), `${where} time`, `"${w.at}" is not an ISO 8601 time`);
  }
}

/**
 * IBIS files have unique names and each part's `ibis.file` names one of them (docs/ibis.md §9); that
 * the model exists in the file needs the parser and is checked where the file is parsed (core/netbuild).
 */
export function validateIbisReferences(data: ProjectData): void {
  const files = data.ibisFiles ?? [];
  requireUnique(files.map((f) => f.name), 'IBIS file');
  const names = new Set(files.map((f) => f.name));
  for (const part of data.parts) {
    if (!part.ibis) continue;
    require_(names.has(part.ibis.file), `part ${part.name} ibis.file`, `IBIS file "${part.ibis.file}" is not in the project (import it first)`);
  }
}

/** Bus reference nets and stackup-to-segment references that a single-entity edit can break. */
export function validateReferences(data: ProjectData): void {
  const netNames = new Set(data.nets.map((n) => n.name));
  for (const bus of data.buses) {
    if (bus.referenceNet !== null) {
      require_(netNames.has(bus.referenceNet), `bus ${bus.name} reference net`, `net "${bus.referenceNet}" is not in the project`);
    }
  }
  const cornerNames = new Set(data.corners.map((c) => c.name));
  for (const bus of data.buses) {
    const pairing = bus.cornerPairing;
    if (pairing === undefined || typeof pairing === 'string') continue;
    pairing.forEach((p, i) => {
      for (const side of ['silicon', 'board'] as const) {
        require_(cornerNames.has(p[side]), `bus ${bus.name} corner pairing ${i + 1} ${side}`, `corner "${p[side]}" is not in the project`);
      }
    });
  }
  const copper = copperLayerNames(data.stackup);
  for (const net of data.nets) {
    net.elements.forEach((e, i) => {
      if (e.kind === 'segment') {
        require_(copper.has(e.layer), `element ${i + 1} (segment) of net ${net.name}`, `layer "${e.layer}" is not a copper layer of the stackup`);
      }
    });
  }
}
