/**
 * A net as the solver sees it: a driver, a list of two-terminal elements between named nodes, fixed
 * rails and receivers. SI units everywhere (ohm, s, F, H, V). Produced by parseNetFile (net file
 * format v1, issue 3) or built by other core modules and checked with checkCircuit.
 */

/** A driver transition: the rising edge (low to high) or the falling edge. */
export type Edge = 'rising' | 'falling';

/** Reference load the driver's Tco is specified into: `ohms` to `vtt` volts, `farads` to ground. */
export interface ReferenceLoad {
  ohms: number;
  vtt: number;
  farads: number;
}

/** Linear driver (DESIGN.md §4): a linear ramp source behind its output resistance. */
export interface DriverSpec {
  node: string;
  vlow: number;
  vhigh: number;
  /** Output resistance while driving high / low, ohm (> 0). */
  routHigh: number;
  routLow: number;
  /** 10-90 % times of a linear ramp, s (0 = ideal step). Full ramp = t / 0.8. */
  riseTime: number;
  fallTime: number;
  /** Load Tco is specified into, for compensated flight time; null when not given. */
  refLoad: ReferenceLoad | null;
  /** Driver-output voltage at which Tco is measured, V; null = midpoint of vlow and vhigh. */
  vmeas: number | null;
}

export type CircuitElement =
  | { kind: 'line'; a: string; b: string; z0: number; delay: number }
  | { kind: 'resistor'; a: string; b: string; ohms: number }
  | { kind: 'capacitor'; a: string; b: string; farads: number }
  | { kind: 'inductor'; a: string; b: string; henries: number }
  /** A via as a lumped capacitance from `a` to ground (DESIGN.md §4). */
  | { kind: 'via'; a: string; farads: number };

export type ElementKind = CircuitElement['kind'];

/** On-die termination: `ohms` from the receiver pin to a fixed `vtt`. */
export interface OnDieTermination {
  ohms: number;
  vtt: number;
}

export interface ReceiverSpec {
  node: string;
  vil: number;
  vih: number;
  /** Reference voltage for reporting crossings, V; absent = (vil + vih) / 2. */
  vref?: number;
  /** Input capacitance to ground, F (0 when not given). */
  cin: number;
  odt: OnDieTermination | null;
  /** Absolute limits the pin may see, V; null when not given. */
  vmaxAbs: number | null;
  vminAbs: number | null;
}

export interface Circuit {
  driver: DriverSpec;
  elements: CircuitElement[];
  /** Fixed-voltage nodes other than "gnd" (0 V), V. */
  rails: Record<string, number>;
  receivers: ReceiverSpec[];
  /** Simulation end, s; null = chosen automatically (see chooseStop in core/solver). */
  stop: number | null;
}

/** The ground node's name; it is 0 V. */
export const GROUND = 'gnd';

/** Names an element for messages, e.g. "elements[3] (line drv->rx)". */
export function elementLabel(index: number, element: CircuitElement): string {
  const ends = element.kind === 'via' ? `${element.a}->${GROUND}` : `${element.a}->${element.b}`;
  return `elements[${index}] (${element.kind} ${ends})`;
}

/** Both terminals of an element (a via's second terminal is ground). */
export function terminals(element: CircuitElement): [string, string] {
  return element.kind === 'via' ? [element.a, GROUND] : [element.a, element.b];
}
