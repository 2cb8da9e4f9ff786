/**
 * Whole-board planning and assembly. A board solve runs in three stages because a source-synchronous
 * bus couples its nets through the strobe:
 *   1. the strobes' own measurements (each strobe simulated once),
 *   2. every other net's result (timed data nets need their strobe's measurements),
 *   3. each strobe's result (its margins and length window depend on all its data nets).
 * Every job carries a cache key: the hash of exactly the inputs its result depends on, so editing one
 * net re-solves that net (and, in a source-synchronous bus, the strobe's bus-wide result) only.
 */
import { InputError } from '../errors.js';
import type { BusDefinition, NetDefinition, PartModel, ProjectData } from '../project/model.js';
import type { BoardResult, BusResult, NetResult, Status } from '../budget/results.js';
import { hashOf } from '../hash/index.js';
import { busOf, netKind } from './solve-net.js';
import { referenceOf } from './net-lookup.js';
import { minOrNull } from '../budget/net-budget.js';
import { marginIn } from './net-evaluation.js';

export interface StrobeMeasureJob { net: string; key: string }
export interface NetJob { net: string; key: string; strobe: string | null }
export interface StrobeResultJob { net: string; key: string; dataNets: string[] }

export interface BoardPlan {
  buses: BusDefinition[];
  /** Buses that cannot be evaluated, with the reason in words. */
  busNotes: Map<string, string>;
  strobeMeasures: StrobeMeasureJob[];
  nets: NetJob[];
  strobes: StrobeResultJob[];
}

/**
 * What the keys of one plan share, each hashed once (docs/board-partitioning.md §2): the stackup and
 * corners together, and each part model. A key names them by these hashes, so a key's text is the
 * net's own definition plus a few 16-digit hashes, whatever the size of the parts it uses.
 */
export interface KeyInputs {
  /** hashOf({ stackup, corners }). */
  shared: string;
  /** Each part by name: the model and hashOf(model). */
  parts: Map<string, { part: PartModel; hash: string }>;
}

export function keyInputs(project: ProjectData): KeyInputs {
  return {
    shared: hashOf({ stackup: project.stackup, corners: project.corners }),
    parts: new Map(project.parts.map((part) => [part.name, { part, hash: hashOf(part) }])),
  };
}

/**
 * Every input a net's own simulation depends on (not its bus): its definition, the hashes of the parts
 * it uses (in the order the net names them) and of the stackup and corners.
 */
export function netSimulationInputs(project: ProjectData, net: NetDefinition, inputs: KeyInputs = keyInputs(project)): unknown {
  const parts = [...new Set([net.driver.part, ...net.receivers.map((r) => r.part)])]
    .map((name) => inputs.parts.get(name))
    .filter((p) => p !== undefined);
  // The SHA-256 of each IBIS file the net's parts use (docs/ibis.md §9): a file replaced under the same
  // name changes the key. Absent for nets without IBIS parts.
  const files = new Set(parts.flatMap((p) => (p.part.ibis ? [p.part.ibis.file] : [])));
  const ibis = (project.ibisFiles ?? []).filter((f) => files.has(f.name)).map((f) => ({ name: f.name, sha256: f.sha256 }));
  const hashes = parts.map((p) => p.hash);
  return ibis.length > 0 ? { net, parts: hashes, shared: inputs.shared, ibis } : { net, parts: hashes, shared: inputs.shared };
}

/**
 * Hash over every input of the whole project: BoardResult.fingerprint. Waivers are a reviewer's notes
 * on results, not inputs (docs/workbench.md, "Waivers"): they are left out, so waiving a net keeps the
 * results fresh (a project without waivers hashes as before).
 */
export function projectFingerprint(project: ProjectData, salt: string): string {
  const { waivers: _notAnInput, ...inputs } = project;
  return hashOf({ salt, project: inputs });
}

/**
 * Jobs and cache keys for a board (or one bus). `salt` carries what is not project data but changes
 * results: the tool version and the solve options.
 */
export function planBoard(project: ProjectData, options: { bus?: string; salt: string }): BoardPlan {
  const buses = options.bus === undefined ? project.buses : project.buses.filter((b) => b.name === options.bus);
  if (options.bus !== undefined && buses.length === 0) {
    throw new InputError('selected bus', `no bus named "${options.bus}" (buses: ${project.buses.map((b) => b.name).join(', ')})`);
  }
  const plan: BoardPlan = { buses, busNotes: new Map(), strobeMeasures: [], nets: [], strobes: [] };
  const common = { salt: options.salt, guardBand: project.info.guardBand };
  // Keys name the bus and each net's simulation inputs by their hashes (docs/board-partitioning.md §2).
  const inputs = keyInputs(project);
  const own = (net: NetDefinition) => hashOf(netSimulationInputs(project, net, inputs));
  const byBus = netsByBus(project);
  for (const bus of buses) {
    const nets = byBus.get(bus.name) ?? [];
    if (nets.length === 0) {
      plan.busNotes.set(bus.name, 'the bus has no nets');
      continue;
    }
    // the net whose measures the timed nets need first: the strobe, or a common-clock bus's clock net
    let strobe: NetDefinition | null;
    try {
      strobe = referenceOf(project, bus);
    } catch (error) {
      if (!(error instanceof InputError)) throw error;
      plan.busNotes.set(bus.name, error.message);
      continue;
    }
    const strobeOwn = strobe ? own(strobe) : null;
    const busHash = hashOf(bus);
    const timed: string[] = [];
    const timedOwn: string[] = [];
    for (const net of nets) {
      const kind = netKind(project, net);
      if (kind === 'strobe') continue;
      const useStrobe = kind === 'timed' && strobe ? strobe.name : null;
      const netOwn = own(net);
      if (kind === 'timed') {
        timed.push(net.name);
        timedOwn.push(netOwn);
      }
      plan.nets.push({
        net: net.name,
        strobe: useStrobe,
        key: hashOf({ ...common, job: 'net', bus: busHash, own: netOwn, strobe: useStrobe ? strobeOwn : null }),
      });
    }
    if (strobe) plan.strobeMeasures.push({ net: strobe.name, key: hashOf({ salt: options.salt, job: 'strobe-measures', own: strobeOwn }) });
    if (strobe && bus.timing.kind === 'source-synchronous') {
      plan.strobes.push({
        net: strobe.name,
        dataNets: timed,
        key: hashOf({ ...common, job: 'strobe', bus: busHash, own: strobeOwn, data: timedOwn }),
      });
    }
  }
  return plan;
}

/** The project's nets grouped by bus name, in project order (one pass, not one filter per bus). */
function netsByBus(project: ProjectData): Map<string, NetDefinition[]> {
  const groups = new Map<string, NetDefinition[]>();
  for (const net of project.nets) {
    const group = groups.get(net.bus);
    if (group) group.push(net);
    else groups.set(net.bus, [net]);
  }
  return groups;
}

const RANK: Record<Status, number> = { pass: 0, tight: 1, fail: 2 };

/** Worse of two statuses (fail > tight > pass). */
export function worseStatus(a: Status, b: Status): Status {
  return RANK[b] > RANK[a] ? b : a;
}

/** Flight-window midpoint of a net at one corner, s (null when that corner or one of its flights is missing). */
function midFlight(r: NetResult, corner: string): number | null {
  const c = r.corners.find((x) => x.corner === corner);
  return c && c.flightMin !== null && c.flightMax !== null ? (c.flightMin + c.flightMax) / 2 : null;
}

/**
 * Builds the BoardResult from per-net results (copied, not changed): each net's skew to its bus's
 * reference net (midpoint of its flight window minus the reference's at the net's worst corner; positive
 * = data later), the bus worst margins given to quality-only nets, and the status per bus = worst net.
 */
export function assembleBoard(
  project: ProjectData,
  plan: BoardPlan,
  results: ReadonlyMap<string, NetResult>,
  meta: { fingerprint: string; toolVersion: string; solvedAt: string },
): BoardResult {
  const byBus = netsByBus(project);
  const byName = new Map(project.nets.map((n) => [n.name, n]));
  const buses: BusResult[] = plan.buses.map((bus) => {
    const note = plan.busNotes.get(bus.name) ?? null;
    const names = (byBus.get(bus.name) ?? []).map((n) => n.name);
    const nets = names.map((name) => results.get(name)).filter((r): r is NetResult => r !== undefined).map((r) => structuredCloneResult(r));
    if (nets.length === 0) {
      return { bus: bus.name, kind: bus.kind, status: 'fail' as Status, worstSetup: null, worstHold: null, worstNet: null, nets, note: note ?? 'no results' };
    }
    const reference = bus.referenceNet ? results.get(bus.referenceNet) ?? null : null;
    const kindOf = (r: NetResult) => netKind(project, byName.get(r.net)!);
    const timed = nets.filter((r) => kindOf(r) !== 'quality-only');
    // an unknown margin (a receiver that never crosses) makes the bus worst unknown, never a number
    const worstSetup = timed.length ? minOrNull(timed.map((r) => r.setupMargin)) : null;
    const worstHold = timed.length ? minOrNull(timed.map((r) => r.holdMargin)) : null;
    let status: Status = 'pass';
    let worstNet: NetResult | null = null;
    for (const r of nets) {
      if (kindOf(r) === 'quality-only') {
        r.setupMargin = worstSetup;
        r.holdMargin = worstHold;
        for (const row of r.corners) {
          const same = timed.map((t) => t.corners.find((c) => c.corner === row.corner)).filter((c) => c !== undefined);
          row.setupMargin = same.length ? minOrNull(same.map((c) => c.setupMargin)) : null;
          row.holdMargin = same.length ? minOrNull(same.map((c) => c.holdMargin)) : null;
        }
      }
      if (reference && r.net !== reference.net) {
        const a = midFlight(r, r.worstCorner);
        const b = midFlight(reference, r.worstCorner);
        r.skew = a !== null && b !== null ? a - b : null;
      }
      status = worseStatus(status, r.status);
      // A strobe/clock row repeats its data nets' margins; name the net that owns them instead.
      const ownsMargins = !r.marginsFrom && kindOf(r) !== 'quality-only';
      const worstOwns = worstNet !== null && !worstNet.marginsFrom && kindOf(worstNet) !== 'quality-only';
      if (
        !worstNet ||
        (RANK[r.status] === RANK[worstNet.status] && ownsMargins && !worstOwns) || RANK[r.status] > RANK[worstNet.status] ||
        (RANK[r.status] === RANK[worstNet.status] && ownsMargins === worstOwns &&
          Math.min(marginIn(r.setupMargin), marginIn(r.holdMargin)) < Math.min(marginIn(worstNet.setupMargin), marginIn(worstNet.holdMargin)))
      ) {
        worstNet = r;
      }
    }
    if (note) status = worseStatus(status, 'fail');
    return {
      bus: bus.name,
      kind: bus.kind,
      status,
      worstSetup,
      worstHold,
      worstNet: worstNet?.net ?? null,
      nets,
      note: note ?? (timed.length === 0 ? 'no timed nets: signal quality only' : null),
    };
  });
  return { project: project.info.name, solvedAt: meta.solvedAt, fingerprint: meta.fingerprint, toolVersion: meta.toolVersion, buses };
}

/**
 * Copy of a result so assembly never changes cached objects: assembly writes only the net's skew and
 * margins and its corner rows' margins (the fields of NetAssembly), so those objects are copied and the
 * rest (quality checks, budget items, length window) is shared, read-only.
 */
function structuredCloneResult(r: NetResult): NetResult {
  return { ...r, corners: r.corners.map((c) => ({ ...c })) };
}

/**
 * What assembleBoard writes into a net's own result (its job's): the skew to the bus reference, the
 * net's margins and each corner row's margins (a quality-only net takes the bus's). A stored bus entry
 * keeps these per net and reads the rest from the net's job result (docs/board-partitioning.md §4).
 */
export interface NetAssembly {
  skew: number | null;
  setupMargin: number | null;
  holdMargin: number | null;
  /** [setup, hold] margin of each corner row, in the rows' order. */
  corners: [number | null, number | null][];
}

/** The assembly fields of an assembled net result. */
export function netAssembly(r: NetResult): NetAssembly {
  return { skew: r.skew, setupMargin: r.setupMargin, holdMargin: r.holdMargin, corners: r.corners.map((c) => [c.setupMargin, c.holdMargin]) };
}

/**
 * The assembled result from a net's own result and its assembly fields (the inverse of netAssembly
 * on the result assembleBoard made from it); null when the rows do not match (not its result).
 */
export function withNetAssembly(own: NetResult, a: NetAssembly): NetResult | null {
  if (own.corners.length !== a.corners.length) return null;
  const r = structuredCloneResult(own);
  r.skew = a.skew;
  r.setupMargin = a.setupMargin;
  r.holdMargin = a.holdMargin;
  r.corners.forEach((row, i) => {
    row.setupMargin = a.corners[i][0];
    row.holdMargin = a.corners[i][1];
  });
  return r;
}


