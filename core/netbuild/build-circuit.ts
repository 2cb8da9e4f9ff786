/**
 * Builds the solver's Circuit for one net of a project at one corner (docs/design.md §4, §6):
 * - routed segments become lossless lines whose Z0 and delay come from the stackup at the trace's
 *   width, with the corner's Dk factor and etch width delta; a segment with a pair spacing is one leg
 *   of a differentially driven edge-coupled pair and gets Zodd and the odd-mode delay (the net then
 *   models one leg; its receivers' thresholds are leg thresholds Vcm ± Vth,diff/2);
 * - explicit lines, R, C, L and vias pass through;
 * - the driver comes from its part: output resistance x driverStrength, 10-90 % times x edgeRate,
 *   VOL/VOH, Vmeas and the reference-load voltage x rail;
 * - each receiver's input capacitance x cin; on-die termination as R to its rail (x rail);
 * - thresholds: VREF tracks the rail, the AC offsets VIH - VREF and VREF - VIL stay fixed (the
 *   JEDEC SSTL/POD way of stating input levels; for LVCMOS levels, stated as fractions of VDD, this
 *   understates their change by (VIH - VREF) x (rail - 1), a few mV at a 5 % rail). Absolute limits
 *   (vmaxAbs / vminAbs) are absolute ratings and are not scaled.
 * - a part with an IBIS model (docs/ibis.md §9) drives or receives through that model at the corner's
 *   IBIS column instead, behind its pin's package written as visible elements; the corner's factors
 *   then do not apply to it (the column carries process, voltage and temperature);
 * Optional changes for the length-window search and termination trials: one segment's length
 * overridden, a series resistor at the driver, a parallel resistor at a node to a mid-rail VTT.
 */
import { InputError } from '../errors.js';
import type { Circuit, CircuitElement, ReceiverSpec } from '../circuit/types.js';
import type { Corner, NetDefinition, PartModel, Stackup, DriverModel, ReceiverModel, IbisFileRecord } from '../project/model.js';
import { ibisDriver, ibisReceiver } from '../ibis/attach.js';
import { packageElements } from '../ibis/package.js';
import { ibisColumnOf, partIbis, partPackage, type PartIbis } from './ibis-parts.js';
import { pairOnLayer, traceOnLayer } from '../stackup/index.js';
import { fullRampTime } from '../circuit/topology.js';

export interface NetBuildChanges {
  /** Replace the length of element `elementIndex` (a segment), m. */
  length?: { elementIndex: number; length: number };
  /** Series resistor between the driver pin and the net, ohm. */
  series?: number;
  /** Replace the value of resistor element `elementIndex` (a termination the net already has), ohm. */
  resistor?: { elementIndex: number; ohms: number };
  /** Parallel resistor from `node` to a termination rail at `vtt` volts (nominal, scaled by rail). */
  parallel?: { node: string; ohms: number; vtt: number };
}

/** The net's parts, looked up by name, with a clear error naming the net and endpoint. */
export function netParts(net: NetDefinition, parts: readonly PartModel[]): {
  driver: { part: PartModel; model: DriverModel };
  receivers: { part: PartModel; model: ReceiverModel; node: string; designator: string }[];
} {
  const byName = new Map(parts.map((p) => [p.name, p]));
  const driverPart = byName.get(net.driver.part);
  if (!driverPart) throw new InputError(`net ${net.name} driver ${net.driver.designator}`, `part "${net.driver.part}" is not in the project`);
  if (!driverPart.driver) throw new InputError(`net ${net.name} driver ${net.driver.designator}`, `part "${driverPart.name}" has no driver model`);
  if (net.receivers.length === 0) throw new InputError(`net ${net.name}`, 'has no receivers');
  const receivers = net.receivers.map((r, i) => {
    const part = byName.get(r.part);
    if (!part) throw new InputError(`net ${net.name} receiver ${i + 1} (${r.designator})`, `part "${r.part}" is not in the project`);
    if (!part.receiver) throw new InputError(`net ${net.name} receiver ${i + 1} (${r.designator})`, `part "${part.name}" has no receiver model`);
    return { part, model: part.receiver, node: r.node, designator: r.designator };
  });
  return { driver: { part: driverPart, model: driverPart.driver }, receivers };
}

/**
 * Z0 (Ω) and delay per metre (s/m) of a routed segment at a corner: a single trace from the stackup,
 * or, with a pair `spacing` (m), one leg of a differentially driven edge-coupled pair, which sees only
 * the odd mode: Zodd at c/sqrt(eps_eff,odd) (Cohn 1955; Kirschning & Jansen 1984 for microstrip).
 */
export function routedLine(
  stackup: Stackup, layer: string, width: number, spacing: number | undefined, corner: Corner,
): { z0: number; delayPerMetre: number } {
  // The same segment geometry is rebuilt for every trial of a net's searches and for every net on the
  // layer: the answer is remembered per stackup object (a pure function of these inputs). Project data
  // is never changed in place (an edit makes new objects, core/design/edits.ts), so an object's answers
  // stay right for as long as it lives.
  let memo = lineMemo.get(stackup);
  if (!memo) lineMemo.set(stackup, (memo = new Map()));
  const key = `${layer}|${width}|${spacing}|${corner.dk}|${corner.widthDelta}`;
  let line = memo.get(key);
  if (!line) {
    if (memo.size > 4096) memo.clear();
    line = lineOnStackup(stackup, layer, width, spacing, corner);
    memo.set(key, line);
  }
  return line;
}

const lineMemo = new WeakMap<Stackup, Map<string, { z0: number; delayPerMetre: number }>>();

function lineOnStackup(
  stackup: Stackup, layer: string, width: number, spacing: number | undefined, corner: Corner,
): { z0: number; delayPerMetre: number } {
  const adjust = { dkFactor: corner.dk, widthDelta: corner.widthDelta };
  if (spacing === undefined) {
    const t = traceOnLayer(stackup, layer, width, adjust);
    return { z0: t.z0, delayPerMetre: t.delayPerMetre };
  }
  const leg = pairOnLayer(stackup, layer, width, spacing, adjust);
  return { z0: leg.zodd, delayPerMetre: leg.delayPerMetreOdd };
}

/** Node name of the driver's internal side when a series resistor is inserted. */
export const SERIES_SOURCE_NODE = '~series-source';
/** Rail name of a trial parallel termination. */
export const TERMINATION_RAIL = '~termination-vtt';

/**
 * Net + stackup + parts + corner -> Circuit. Throws InputError naming the net and element on a
 * missing part, an unknown layer (from core/stackup) or a non-segment length override.
 */
/** Names element `index` of `net` in a message (built only when one is thrown: circuits are built per trial). */
function elementWhere(net: NetDefinition, index: number): string {
  return `net ${net.name} element ${index + 1} (${net.elements[index].kind})`;
}

export function buildNetCircuit(
  net: NetDefinition,
  stackup: Stackup,
  parts: readonly PartModel[],
  corner: Corner,
  changes: NetBuildChanges = {},
  ibisFiles: readonly IbisFileRecord[] = [],
): Circuit {
  const { driver, receivers } = netParts(net, parts);
  const column = ibisColumnOf(corner);
  const d = driver.model;
  const elements: CircuitElement[] = [];
  const traceCache = new Map<string, { z0: number; delayPerMetre: number }>();
  let totalDelay = 0;
  let maxZ0 = 0;
  let totalC = 0;

  net.elements.forEach((element, index) => {
    switch (element.kind) {
      case 'segment': {
        let length = element.length;
        if (changes.length && changes.length.elementIndex === index) length = changes.length.length;
        if (!(length > 0)) throw new InputError(elementWhere(net, index), `length must be positive, got ${length} m`);
        const spacing = element.spacing;
        const key = `${element.layer}|${element.width}|${spacing ?? ''}`;
        let trace = traceCache.get(key);
        if (!trace) {
          try {
            trace = routedLine(stackup, element.layer, element.width, spacing, corner);
          } catch (error) {
            if (error instanceof InputError) throw new InputError(elementWhere(net, index), error.message);
            throw error;
          }
          traceCache.set(key, trace);
        }
        const delay = trace.delayPerMetre * length;
        totalDelay += delay;
        maxZ0 = Math.max(maxZ0, trace.z0);
        elements.push({ kind: 'line', a: element.a, b: element.b, z0: trace.z0, delay });
        break;
      }
      case 'line':
        totalDelay += element.delay;
        maxZ0 = Math.max(maxZ0, element.z0);
        elements.push({ ...element });
        break;
      case 'capacitor':
      case 'via':
        totalC += element.farads;
        elements.push({ ...element });
        break;
      case 'resistor':
        elements.push(changes.resistor?.elementIndex === index ? { ...element, ohms: changes.resistor.ohms } : { ...element });
        break;
      case 'inductor':
        elements.push({ ...element });
        break;
      default: {
        const never: never = element;
        throw new InputError(elementWhere(net, index), `unknown element kind ${String((never as { kind: unknown }).kind)}`);
      }
    }
  });
  if (changes.length && net.elements[changes.length.elementIndex]?.kind !== 'segment') {
    throw new InputError(`net ${net.name} element ${changes.length.elementIndex + 1}`, 'only a routed segment can be stretched');
  }

  const rails: Record<string, number> = {};
  for (const [name, volts] of Object.entries(net.rails)) rails[name] = volts * corner.rail;

  let driverNode = net.driver.node;
  if (changes.series !== undefined) {
    driverNode = SERIES_SOURCE_NODE;
    elements.push({ kind: 'resistor', a: SERIES_SOURCE_NODE, b: net.driver.node, ohms: changes.series });
  }
  if (changes.parallel) {
    rails[TERMINATION_RAIL] = changes.parallel.vtt * corner.rail;
    elements.push({ kind: 'resistor', a: changes.parallel.node, b: TERMINATION_RAIL, ohms: changes.parallel.ohms });
  }

  const receiverSpecs: ReceiverSpec[] = receivers.map((r) => {
    const vref = r.model.vref * corner.rail;
    const rxIbis = partIbis(r.part, ibisFiles);
    if (rxIbis) {
      const die = behindPackage(rxIbis, column, r.node, elements);
      const rx = ibisReceiver(rxIbis.model, column, ibisLabel(rxIbis, column));
      return {
        node: die,
        ibis: { file: rxIbis.file.name, model: rxIbis.model.name },
        pad: rx.pad,
        vil: vref - (r.model.vref - r.model.vil),
        vih: vref + (r.model.vih - r.model.vref),
        cin: 0,
        odt: null,
        vmaxAbs: r.model.vmaxAbs,
        vminAbs: r.model.vminAbs,
      };
    }
    totalC += r.model.cin * corner.cin;
    return {
      node: r.node,
      vil: vref - (r.model.vref - r.model.vil),
      vih: vref + (r.model.vih - r.model.vref),
      cin: r.model.cin * corner.cin,
      odt: r.model.odtOhms === null ? null : { ohms: r.model.odtOhms, vtt: r.model.odtVtt * corner.rail },
      vmaxAbs: r.model.vmaxAbs,
      vminAbs: r.model.vminAbs,
    };
  });

  const drvIbis = partIbis(driver.part, ibisFiles);
  if (drvIbis) {
    const die = behindPackage(drvIbis, column, driverNode, elements);
    const spec = ibisDriver(die, drvIbis.model, column, ibisLabel(drvIbis, column));
    // The model's Vmeas/Rref/Cref/Vref are the load its Tco is specified into; the part's linear values otherwise.
    const refLoad = spec.refLoad ?? { ohms: d.refLoad.ohms, vtt: d.refLoad.vtt * corner.rail, farads: d.refLoad.farads };
    const vmeas = spec.vmeas ?? d.vmeas * corner.rail;
    const edges = Math.max(spec.riseTime, spec.fallTime);
    return {
      driver: { ...spec, refLoad, vmeas, ibis: { ref: { file: drvIbis.file.name, model: drvIbis.model.name }, corner: column } },
      elements,
      rails,
      receivers: receiverSpecs,
      stop: settleStop(fullRampTime(edges), totalDelay, totalC, Math.max(maxZ0, spec.routHigh, spec.routLow, 50)),
    };
  }

  const riseTime = d.riseTime * corner.edgeRate;
  const fallTime = d.fallTime * corner.edgeRate;
  const routHigh = d.routHigh * corner.driverStrength;
  const routLow = d.routLow * corner.driverStrength;
  return {
    driver: {
      node: driverNode,
      vlow: d.vol * corner.rail,
      vhigh: d.voh * corner.rail,
      routHigh,
      routLow,
      riseTime,
      fallTime,
      refLoad: { ohms: d.refLoad.ohms, vtt: d.refLoad.vtt * corner.rail, farads: d.refLoad.farads },
      vmeas: d.vmeas * corner.rail,
    },
    elements,
    rails,
    receivers: receiverSpecs,
    stop: settleStop(fullRampTime(Math.max(riseTime, fallTime)), totalDelay, totalC, Math.max(maxZ0, routHigh, routLow, 50)),
  };
}

/** Label of an IBIS buffer in messages and reports: file, model, column. */
function ibisLabel(ibis: PartIbis, column: 'typ' | 'min' | 'max'): string {
  return `${ibis.file.name} ${ibis.model.name} ${column}`;
}

/**
 * Adds the package of an IBIS part's pin between its die pad and `pin` (docs/ibis.md §9) and returns
 * the die node, where the buffer sits; the pin itself when the file gives the model no [Pin] row.
 */
function behindPackage(ibis: PartIbis, column: 'typ' | 'min' | 'max', pin: string, elements: CircuitElement[]): string {
  const pkg = partPackage(ibis, column);
  if (!pkg || (pkg.rPkg <= 0 && pkg.lPkg <= 0)) return pin;
  const die = `${pin}~die`;
  elements.push(...packageElements(pkg, die, pin));
  return die;
}

/**
 * Simulation end: the full ramp, then ten one-way delays of all lines in series (five round trips
 * of the longest possible path, enough for the reflections of a lightly damped net to fall inside
 * typical ringback limits) and five RC time constants of the lumped capacitance — common practice,
 * no source. At least 2 ns after the ramp so very short nets still settle against their loads.
 */
export function settleStop(fullRamp: number, totalDelay: number, totalCapacitance: number, impedance: number): number {
  return fullRamp + Math.max(10 * totalDelay + 5 * totalCapacitance * impedance, 2e-9);
}

/**
 * True when the net is an edge-coupled differential pair (any segment carries a pair spacing): it is
 * built as one leg in the odd mode and timed at the crossing of its two legs (docs/design.md §5).
 */
export function isDifferentialNet(net: NetDefinition): boolean {
  return net.elements.some((e) => e.kind === 'segment' && e.spacing !== undefined);
}

/** The longest routed segment of a net (the one the length window stretches), or null. */
export function longestSegment(net: NetDefinition): { elementIndex: number; layer: string; width: number; length: number; spacing?: number } | null {
  let best: { elementIndex: number; layer: string; width: number; length: number; spacing?: number } | null = null;
  net.elements.forEach((e, i) => {
    if (e.kind === 'segment' && (best === null || e.length > best.length)) {
      best = { elementIndex: i, layer: e.layer, width: e.width, length: e.length };
      if (e.spacing !== undefined) best.spacing = e.spacing;
    }
  });
  return best;
}
