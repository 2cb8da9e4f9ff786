/**
 * A bus's stored entry (docs/board-partitioning.md §4): the bus's own fields and, per net, the key of
 * the job whose result it shows and the fields assembly wrote into it (core/engine/board.ts
 * NetAssembly). The nets' results themselves are the job entries stored under those keys, so a
 * whole-board solve no longer writes every result twice (at 1,000 nets, 14 MB of JSON to encode and
 * compress). An entry written before this layout holds the whole BusResult and reads as it is.
 */
import type { BusResult, NetResult } from '../../../core/budget/results.js';
import { netAssembly, withNetAssembly, type NetAssembly } from '../../../core/engine/board.js';

/** Entry layout 1: nets by reference. */
interface BusFrame {
  frame: 1;
  bus: Omit<BusResult, 'nets'>;
  nets: { job: string; assembly: NetAssembly }[];
}

/** The entry text of an assembled bus; each net's job key is its result's `inputHash`. */
export function busEntryJson(bus: BusResult): string {
  const { nets, ...own } = bus;
  const frame: BusFrame = { frame: 1, bus: own, nets: nets.map((n) => ({ job: n.inputHash, assembly: netAssembly(n) })) };
  return JSON.stringify(frame);
}

/**
 * The BusResult of a stored entry; `jobJson(key)` reads a job's stored output (`{ measures, result }`).
 * Null when a job entry it names is gone or does not fit (the caller treats the bus as not stored).
 */
export function busFromEntry(json: string, jobJson: (key: string) => string | null): BusResult | null {
  const stored = JSON.parse(json) as BusFrame | BusResult;
  if (!('frame' in stored)) return stored;
  const nets: NetResult[] = [];
  for (const n of stored.nets) {
    const text = jobJson(n.job);
    if (text === null) return null;
    const own = (JSON.parse(text) as { result?: NetResult | null }).result;
    const assembled = own ? withNetAssembly(own, n.assembly) : null;
    if (!assembled) return null;
    nets.push(assembled);
  }
  const { note, ...own } = stored.bus;
  return { ...own, nets, note }; // BusResult's own key order
}
