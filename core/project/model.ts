/**
 * The project's domain model: what a project file holds, in SI base units (metres, seconds, ohms,
 * farads, volts). The data layer (main/services) stores and loads exactly these shapes; the budget
 * engine (core/budget) and the renderer read them. Ids are database row ids; names are unique within
 * their scope (layer names in a stackup, part names in a project, net names in a project).
 */

export interface ProjectInfo {
  name: string;
  boardRevision: string;
  description: string;
  /** Margin below which a passing net is reported as "tight", seconds (user setting). */
  guardBand: number;
  /** Band around the final value for settling time, volts (user setting). */
  settleBand: number;
}

// ---------------------------------------------------------------- stackup

export type LayerKind = 'copper' | 'dielectric' | 'mask';
/** A copper layer is a routing layer, a reference plane, or both (split plane with routing). */
export type CopperRole = 'signal' | 'plane';

/** One layer of the stack, ordered top (index 0) to bottom. */
export interface StackupLayer {
  name: string;
  kind: LayerKind;
  /** Thickness, m. For copper, the finished copper thickness. */
  thickness: number;
  /** Relative permittivity (dielectric and mask). */
  dk?: number;
  /** Loss tangent (dielectric and mask); stored for reports, not used by the lossless solver. */
  df?: number;
  /** Copper only. */
  role?: CopperRole;
  /** Copper signal layers: default trace width for single-ended routing, m. */
  defaultWidth?: number;
}

export interface Stackup {
  name: string;
  layers: StackupLayer[];
}

// ---------------------------------------------------------------- parts

/** Linear driver model (DESIGN.md §4). */
export interface DriverModel {
  vol: number;
  voh: number;
  /** Output resistance while driving high / low, ohm. */
  routHigh: number;
  routLow: number;
  /** 10-90 % times of a linear ramp, s. */
  riseTime: number;
  fallTime: number;
  /** Clock-to-output into the reference load, s. */
  tcoMin: number;
  tcoMax: number;
  /** The reference load Tco is specified into: `ohms` to `vtt` volts (plus optional farads). */
  refLoad: { ohms: number; vtt: number; farads: number };
  /** The driver-output voltage at which Tco is measured, V. */
  vmeas: number;
}

export interface ReceiverModel {
  /** Input (pad + package) capacitance, F. */
  cin: number;
  /** AC thresholds used for timing, V. */
  vil: number;
  vih: number;
  /** Reference voltage, V (for reporting crossings; defaults to (vil+vih)/2). */
  vref: number;
  /** On-die termination to `odtVtt` volts, ohm; null when absent. */
  odtOhms: number | null;
  odtVtt: number;
  /** Absolute limits the pin may see, V. */
  vmaxAbs: number;
  vminAbs: number;
  /** Setup and hold requirement at the receiver, s. */
  tsetup: number;
  thold: number;
}

export interface PartModel {
  name: string;
  /** Free text such as "memory controller, data I/O". */
  description: string;
  /** Name of the I/O standard preset this part follows (IO_STANDARDS), or "" for custom. */
  ioStandard: string;
  driver: DriverModel | null;
  receiver: ReceiverModel | null;
}

// ---------------------------------------------------------------- nets

export type NetRole = 'data' | 'strobe' | 'clock' | 'address' | 'command' | 'control';

/**
 * One element of a net's topology. Nodes are named by strings local to the net; "gnd" is 0 V and rail
 * names (NetDefinition.rails) are fixed-voltage nodes.
 */
export type NetElement =
  /** Routed trace on a stackup layer: Z0 and delay come from the stackup at the trace's width. */
  | {
    kind: 'segment'; a: string; b: string; layer: string; width: number; length: number;
    /**
     * Edge-to-edge gap to the partner leg of an edge-coupled differential pair, m. When set, the
     * segment is one leg of a pair driven differentially and is modelled in the odd mode (Zodd and
     * the odd-mode velocity); absent for a single-ended trace.
     */
    spacing?: number;
  }
  /** Explicit transmission line (connector, cable, package trace). */
  | { kind: 'line'; a: string; b: string; z0: number; delay: number }
  | { kind: 'resistor'; a: string; b: string; ohms: number }
  | { kind: 'capacitor'; a: string; b: string; farads: number }
  | { kind: 'inductor'; a: string; b: string; henries: number }
  /** A via modelled as a lumped capacitance from `a` to ground (DESIGN.md §4). */
  | { kind: 'via'; a: string; farads: number };

export interface NetEndpoint {
  /** Part model name. */
  part: string;
  /** Node of the topology where the part's pin sits. */
  node: string;
  /** Designator of the device, e.g. "U3" (for people). */
  designator: string;
}

export interface NetDefinition {
  name: string;
  bus: string;
  role: NetRole;
  driver: NetEndpoint;
  receivers: NetEndpoint[];
  elements: NetElement[];
  /** Named fixed-voltage nodes (e.g. { vtt: 0.6 }), V at nominal rails. */
  rails: Record<string, number>;
}

// ---------------------------------------------------------------- buses and budgets

export type BusKind = 'common-clock' | 'source-synchronous';

/** A budget line item entered by the user (allowances, clock skew, jitter...). */
export interface BudgetAllowance {
  name: string;
  /** s; positive values always reduce margin. */
  value: number;
  /** Which margin it is charged against. */
  appliesTo: 'setup' | 'hold' | 'both';
  note: string;
}

export interface CommonClockTiming {
  kind: 'common-clock';
  /** Clock period, s. */
  cycleTime: number;
  /** Clock flight to the driver minus clock flight to the receiver, s (DESIGN.md §6). */
  clockSkew: number;
  /** Cycle-to-cycle jitter charged to setup, s. */
  jitter: number;
}

export interface SourceSyncTiming {
  kind: 'source-synchronous';
  /** Data valid before / after the strobe edge at the driver, s. */
  tValidBefore: number;
  tValidAfter: number;
}

export interface BusDefinition {
  name: string;
  kind: BusKind;
  description: string;
  /** Net name of the clock (common clock, informative) or strobe (source synchronous). */
  referenceNet: string | null;
  timing: CommonClockTiming | SourceSyncTiming;
  allowances: BudgetAllowance[];
}

// ---------------------------------------------------------------- corners

/**
 * A process/voltage/temperature corner as multipliers on nominal values. "slow" makes edges slower
 * and drivers weaker; each factor is 1 at typical.
 */
export interface Corner {
  name: string;
  /** Multiplies driver output resistance. */
  driverStrength: number;
  /** Multiplies rise and fall times. */
  edgeRate: number;
  /** Multiplies dielectric Dk. */
  dk: number;
  /** Added to every trace width (etch), m (negative = narrower = higher Z0). */
  widthDelta: number;
  /** Multiplies supply rails (VOH, VTT, thresholds referenced to the rail). */
  rail: number;
  /** Multiplies receiver input capacitance. */
  cin: number;
  /** Which Tco of the driver applies: slow corner uses tcoMax for setup, fast uses tcoMin for hold. */
  tco: 'min' | 'max' | 'typ';
}

/** The whole content of a project, as loaded. */
export interface ProjectData {
  info: ProjectInfo;
  stackup: Stackup;
  parts: PartModel[];
  buses: BusDefinition[];
  nets: NetDefinition[];
  corners: Corner[];
}
