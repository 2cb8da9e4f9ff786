/**
 * A circuit compiled to integer node indices and typed arrays for the solver. Free nodes (unknown
 * voltages) come first, fixed nodes (ground, rails, on-die termination supplies) after them.
 * Receiver input capacitance and on-die termination become ordinary elements here.
 */
import { type Circuit, GROUND } from '../circuit/types.js';

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

/** Branches of one kind as they are collected: node names and values, in input order. */
class BranchList {
  readonly a: string[] = [];
  readonly b: string[] = [];
  readonly value: number[] = [];
  add(a: string, b: string, value: number): void {
    this.a.push(a);
    this.b.push(b);
    this.value.push(value);
  }

  compile(index: Map<string, number>): Branches {
    const count = this.a.length;
    const a = new Int32Array(count);
    const b = new Int32Array(count);
    for (let k = 0; k < count; k++) {
      a[k] = index.get(this.a[k])!;
      b[k] = index.get(this.b[k])!;
    }
    return { a, b, value: Float64Array.from(this.value) };
  }
}

/** Numbers free node `name` next unless it is fixed or numbered already. */
function addFree(name: string, fixed: Map<string, number>, index: Map<string, number>, free: string[]): void {
  if (fixed.has(name) || index.has(name)) return;
  index.set(name, free.length);
  free.push(name);
}

/** Compiles a checked circuit (see checkCircuit). Deterministic: node order follows the input. */
export function compileNetlist(circuit: Circuit): Netlist {
  // fixed nodes by name, with their voltages, in order: ground, the rails, on-die termination supplies
  const fixed = new Map<string, number>([[GROUND, 0]]);
  for (const rail of Object.keys(circuit.rails)) fixed.set(rail, circuit.rails[rail]);
  const res = new BranchList();
  const cap = new BranchList();
  const ind = new BranchList();
  const lin = new BranchList();
  const delays: number[] = [];
  for (const element of circuit.elements) {
    switch (element.kind) {
      case 'line': lin.add(element.a, element.b, element.z0); delays.push(element.delay); break;
      case 'resistor': res.add(element.a, element.b, element.ohms); break;
      case 'capacitor': if (element.farads > 0) cap.add(element.a, element.b, element.farads); break;
      case 'via': if (element.farads > 0) cap.add(element.a, GROUND, element.farads); break;
      case 'inductor': ind.add(element.a, element.b, element.henries); break;
      default: {
        const never: never = element;
        throw new Error(`compileNetlist: unhandled element ${JSON.stringify(never)}`);
      }
    }
  }
  for (const r of circuit.receivers) {
    if (r.cin > 0) cap.add(r.node, GROUND, r.cin);
    if (r.odt) {
      const supply = `#odt:${r.node}`;
      fixed.set(supply, r.odt.vtt);
      res.add(r.node, supply, r.odt.ohms);
    }
  }
  // Behavioural pads (docs/ibis.md §4): C_comp is a linear capacitor to ground at the pad.
  if (circuit.driver.pad && circuit.driver.pad.cComp > 0) cap.add(circuit.driver.node, GROUND, circuit.driver.pad.cComp);
  for (const r of circuit.receivers) if (r.pad && r.pad.cComp > 0) cap.add(r.node, GROUND, r.pad.cComp);
  // free nodes: the driver's, then each branch's ends in the order lines, resistors, capacitors, inductors
  const index = new Map<string, number>([[circuit.driver.node, 0]]);
  const free: string[] = [circuit.driver.node];
  for (const list of [lin, res, cap, ind]) {
    for (let k = 0; k < list.a.length; k++) {
      addFree(list.a[k], fixed, index, free);
      addFree(list.b[k], fixed, index, free);
    }
  }
  const names = free.slice();
  const fixedV = new Float64Array(free.length + fixed.size);
  for (const [name, volts] of fixed) {
    index.set(name, names.length);
    fixedV[names.length] = volts;
    names.push(name);
  }
  return {
    names,
    nFree: free.length,
    fixedV,
    driver: 0,
    resistors: res.compile(index),
    capacitors: cap.compile(index),
    inductors: ind.compile(index),
    lines: { ...lin.compile(index), delay: Float64Array.from(delays) },
  };
}
