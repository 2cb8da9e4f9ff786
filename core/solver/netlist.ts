/**
 * A circuit compiled to integer node indices and typed arrays for the solver. Free nodes (unknown
 * voltages) come first, fixed nodes (ground, rails, on-die termination supplies) after them.
 * Receiver input capacitance and on-die termination become ordinary elements here.
 */
import { type Circuit, GROUND, terminals } from '../circuit/types.js';

export interface Branches {
  a: Int32Array;
  b: Int32Array;
  /** ohm, F, H or Z0 (ohm) by kind. */
  value: Float64Array;
}

export interface Netlist {
  /** Every node name; index < nFree: free, else fixed. */
  names: string[];
  nFree: number;
  /** Voltage of every fixed node (free entries 0), V. */
  fixedV: Float64Array;
  driver: number;
  resistors: Branches;
  capacitors: Branches;
  inductors: Branches;
  lines: Branches & { delay: Float64Array };
}

type Raw = { a: string; b: string; value: number; delay?: number };

function branches(list: Raw[], index: Map<string, number>): Branches {
  const a = new Int32Array(list.length);
  const b = new Int32Array(list.length);
  const value = new Float64Array(list.length);
  for (let k = 0; k < list.length; k++) {
    a[k] = index.get(list[k].a)!;
    b[k] = index.get(list[k].b)!;
    value[k] = list[k].value;
  }
  return { a, b, value };
}

/** Compiles a checked circuit (see checkCircuit). Deterministic: node order follows the input. */
export function compileNetlist(circuit: Circuit): Netlist {
  const fixed = new Map<string, number>([[GROUND, 0], ...Object.entries(circuit.rails)]);
  const res: Raw[] = [];
  const cap: Raw[] = [];
  const ind: Raw[] = [];
  const lin: Raw[] = [];
  for (const element of circuit.elements) {
    const [a, b] = terminals(element);
    switch (element.kind) {
      case 'line': lin.push({ a, b, value: element.z0, delay: element.delay }); break;
      case 'resistor': res.push({ a, b, value: element.ohms }); break;
      case 'capacitor':
      case 'via': if (element.farads > 0) cap.push({ a, b, value: element.farads }); break;
      case 'inductor': ind.push({ a, b, value: element.henries }); break;
      default: {
        const never: never = element;
        throw new Error(`compileNetlist: unhandled element ${JSON.stringify(never)}`);
      }
    }
  }
  for (const r of circuit.receivers) {
    if (r.cin > 0) cap.push({ a: r.node, b: GROUND, value: r.cin });
    if (r.odt) {
      const supply = `#odt:${r.node}`;
      fixed.set(supply, r.odt.vtt);
      res.push({ a: r.node, b: supply, value: r.odt.ohms });
    }
  }
  // Behavioural pads (docs/ibis.md §4): C_comp is a linear capacitor to ground at the pad.
  if (circuit.driver.pad && circuit.driver.pad.cComp > 0) cap.push({ a: circuit.driver.node, b: GROUND, value: circuit.driver.pad.cComp });
  for (const r of circuit.receivers) if (r.pad && r.pad.cComp > 0) cap.push({ a: r.node, b: GROUND, value: r.pad.cComp });
  const free: string[] = [circuit.driver.node];
  const seen = new Set(free);
  for (const e of [...lin, ...res, ...cap, ...ind]) {
    for (const n of [e.a, e.b]) {
      if (!fixed.has(n) && !seen.has(n)) {
        seen.add(n);
        free.push(n);
      }
    }
  }
  const names = [...free, ...fixed.keys()];
  const index = new Map(names.map((n, i) => [n, i]));
  const fixedV = new Float64Array(names.length);
  for (const [n, v] of fixed) fixedV[index.get(n)!] = v;
  return {
    names,
    nFree: free.length,
    fixedV,
    driver: 0,
    resistors: branches(res, index),
    capacitors: branches(cap, index),
    inductors: branches(ind, index),
    lines: { ...branches(lin, index), delay: new Float64Array(lin.map((e) => e.delay!)) },
  };
}
