/**
 * A bus result in a few numbers (docs/workbench.md, "Board scale"): what the overview shows of a bus
 * without any net's result, computed once when a whole-board solve is stored.
 */
import type { BusResult, BusTable, NetResult, NetSummary, Status } from '../budget/results.js';

export interface BusResultSummary {
  bus: string;
  kind: string;
  status: Status;
  /** Nets in the bus's result. */
  nets: number;
  failing: number;
  tight: number;
  /** s; null when unknown (as BusResult). */
  worstSetup: number | null;
  worstHold: number | null;
  worstNet: string | null;
  note: string | null;
  /**
   * The check behind a fail or tight badge: "NET: first reason" of the first net with the bus's status
   * and a reason (else of the first net with a reason), else the bus's note; null when the bus passes.
   */
  reason: string | null;
}

export function summariseBus(bus: BusTable): BusResultSummary {
  let failing = 0;
  let tight = 0;
  for (const n of bus.nets) {
    if (n.status === 'fail') failing++;
    else if (n.status === 'tight') tight++;
  }
  let reason: string | null = null;
  if (bus.status !== 'pass') {
    const net = bus.nets.find((n) => n.status === bus.status && n.reasons.length) ?? bus.nets.find((n) => n.reasons.length);
    reason = net ? `${net.net}: ${net.reasons[0]}` : bus.note ?? null;
  }
  return {
    bus: bus.bus, kind: bus.kind, status: bus.status, nets: bus.nets.length, failing, tight,
    worstSetup: bus.worstSetup, worstHold: bus.worstHold, worstNet: bus.worstNet, note: bus.note ?? null, reason,
  };
}

/** A net result's margin-table row: corners without line items, only the failing quality checks. */
export function netSummary(net: NetResult): NetSummary {
  return {
    ...net,
    corners: net.corners.map((c) => ({ corner: c.corner, flightMin: c.flightMin, flightMax: c.flightMax, setupMargin: c.setupMargin, holdMargin: c.holdMargin })),
    quality: net.quality.filter((q) => !q.pass),
  };
}

/** A bus result's margin table (docs/board-partitioning.md §4, "Margin tables"). */
export function busTable(bus: BusResult): BusTable {
  return { ...bus, nets: bus.nets.map(netSummary) };
}
