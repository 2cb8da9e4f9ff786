/**
 * A net as the solver sees it: a driver, a list of two-terminal elements between named nodes, fixed
 * rails and receivers. SI units everywhere (ohm, s, F, H, V). Produced by parseNetFile (net file
 * format v1, docs/design.md §8.1) or built by other core modules and checked with checkCircuit.
 */

/** A driver transition: the rising edge (low to high) or the falling edge. */
export type Edge = 'rising' | 'falling';

/** Reference load the driver's Tco is specified into: `ohms` to `vtt` volts, `farads` to ground. */
export interface ReferenceLoad {
  ohms: number;
  vtt: number;
  farads: number;
}

/** Linear driver (docs/design.md §4): a linear ramp source behind its output resistance. */
/** An IBIS model named in a net file: the .ibs file (relative to the net file) and the [Model] name. */
export interface IbisReference {
  file: string;
  model: string;
}

/** The data column of an IBIS file used for a whole net (docs/ibis.md §4, "Corners"). */
export type IbisCorner = 'typ' | 'min' | 'max';

/** A V-I curve of a behavioural pad: current into the pin (A) against the table voltage (V). */
export interface PadCurve {
  v: Float64Array;
  i: Float64Array;
}

/**
 * The V-I data of a behavioural pad at one corner (docs/ibis.md §4): [Pullup] and [POWER Clamp]
 * tabulated against the voltage below their reference, [Pulldown] and [GND Clamp] above theirs;
 * C_comp from the pad to ground.
 */
export interface PadTables {
  pullupRef: number;
  pulldownRef: number;
  powerClampRef: number;
  gndClampRef: number;
  pullup: PadCurve | null;
  pulldown: PadCurve | null;
  gndClamp: PadCurve | null;
  powerClamp: PadCurve | null;
  cComp: number;
}

/** Switching coefficients of one edge: times (s) and Ku, Kd there, held at the end values outside. */
export interface PadSwitching {
  t: Float64Array;
  ku: Float64Array;
  kd: Float64Array;
  /** 10-90 % time of the coefficient that turns on, s (sets the time step). */
  edgeTime: number;
}

/** A behavioural driver pad: V-I data plus the switching coefficients of both edges. */
export interface DriverPad extends PadTables {
  /** Names the model for messages and reports, e.g. "wren_mc7.ibs dq_drv40 typ". */
  label: string;
  rising: PadSwitching;
  falling: PadSwitching;
}

export interface DriverSpec {
  node: string;
  /**
   * IBIS driver (docs/ibis.md §7): the model and corner named in the net file. The host resolves it
   * into `pad` (core/ibis attachIbisModels); the linear fields then hold equivalents for measurements
   * (vlow/vhigh the pad's rails, rout its small-signal resistance, rise/fall time from the coefficients).
   */
  ibis?: { ref: IbisReference; corner: IbisCorner };
  pad?: DriverPad;
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
  /** A via as a lumped capacitance from `a` to ground (docs/design.md §4). */
  | { kind: 'via'; a: string; farads: number };

export type ElementKind = CircuitElement['kind'];

/** On-die termination: `ohms` from the receiver pin to a fixed `vtt`. */
export interface OnDieTermination {
  ohms: number;
  vtt: number;
}

export interface ReceiverSpec {
  node: string;
  /** IBIS receiver (docs/ibis.md §7): its C_comp and clamps are added at the node once resolved into `pad`. */
  ibis?: IbisReference;
  pad?: PadTables & { label: string };
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

/** The element's second terminal (ground for a via), without allocating the pair. */
export function otherTerminal(element: CircuitElement): string {
  return element.kind === 'via' ? GROUND : element.b;
}
