/**
 * The project's domain model: what a project file holds, in SI base units (metres, seconds, ohms,
 * farads, volts). One place defines it: each shape is a zod schema here and its TypeScript type is
 * inferred from the schema, so the type the engine reads and the check every host runs on incoming
 * data cannot drift apart. The schemas check shape and finiteness only (zod's number() rejects NaN
 * and Infinity); engineering ranges are checked by core/project/validate.ts, which names the field.
 * The database (migrations/, main/services/db) stores exactly these shapes. Ids are database row ids;
 * names are unique within their scope (layers in a stackup, parts, nets and buses in a project).
 */
import { z } from 'zod';

const name = z.string().min(1).max(200);
const text = z.string().max(10_000);
const num = z.number();
const positive = z.number().positive();
const nonNegative = z.number().nonnegative();
const node = z.string().min(1).max(200);

export const projectInfoSchema = z.strictObject({
  name,
  boardRevision: z.string().max(200),
  description: text,
  /** Margin below which a passing net is reported as "tight", seconds (user setting). */
  guardBand: nonNegative,
  /** Band around the final value for settling time, volts (user setting). */
  settleBand: positive,
});
export type ProjectInfo = z.infer<typeof projectInfoSchema>;

// ---------------------------------------------------------------- stackup

export const layerKindSchema = z.enum(['copper', 'dielectric', 'mask']);
export type LayerKind = z.infer<typeof layerKindSchema>;
/** A copper layer is a routing layer, a reference plane, or both (split plane with routing). */
export const copperRoleSchema = z.enum(['signal', 'plane']);
export type CopperRole = z.infer<typeof copperRoleSchema>;

/** One layer of the stack, ordered top (index 0) to bottom. */
export const stackupLayerSchema = z.strictObject({
  name,
  kind: layerKindSchema,
  /** Thickness, m. For copper, the finished copper thickness. */
  thickness: positive,
  /** Relative permittivity (dielectric and mask). */
  dk: positive.optional(),
  /** Loss tangent (dielectric and mask); stored for reports, not used by the lossless solver. */
  df: nonNegative.optional(),
  /** Copper only. */
  role: copperRoleSchema.optional(),
  /** Copper signal layers: default trace width for single-ended routing, m. */
  defaultWidth: positive.optional(),
});
export type StackupLayer = z.infer<typeof stackupLayerSchema>;

/** The stack's name may be empty in a new project that has no stackup yet. */
export const stackupSchema = z.strictObject({ name: z.string().max(200), layers: z.array(stackupLayerSchema).max(200) });
export type Stackup = z.infer<typeof stackupSchema>;

// ---------------------------------------------------------------- parts

/** Linear driver model (docs/design.md §4). */
export const driverModelSchema = z.strictObject({
  vol: num,
  voh: num,
  /** Output resistance while driving high / low, ohm. */
  routHigh: nonNegative,
  routLow: nonNegative,
  /** 10-90 % times of a linear ramp, s. */
  riseTime: positive,
  fallTime: positive,
  /** Clock-to-output into the reference load, s. */
  tcoMin: num,
  tcoMax: num,
  /** The reference load Tco is specified into: `ohms` to `vtt` volts (plus optional farads). */
  refLoad: z.strictObject({ ohms: nonNegative, vtt: num, farads: nonNegative }),
  /** The driver-output voltage at which Tco is measured, V. */
  vmeas: num,
});
export type DriverModel = z.infer<typeof driverModelSchema>;

/**
 * Slew-rate derating of setup and hold (as JEDEC DDR data sheets tabulate it): rows for the signal's
 * slew rates, columns for the strobe's (or clock's), V/s ascending; entries are the added setup and hold
 * requirement, s (negative where the part allows less). Optional: without a table nothing is derated.
 */
export const slewDeratingSchema = z.strictObject({
  signalSlews: z.array(positive).min(1).max(20),
  strobeSlews: z.array(positive).min(1).max(20),
  setup: z.array(z.array(num).max(20)).max(20),
  hold: z.array(z.array(num).max(20)).max(20),
});
export type SlewDerating = z.infer<typeof slewDeratingSchema>;

export const receiverModelSchema = z.strictObject({
  /** Input (pad + package) capacitance, F. */
  cin: nonNegative,
  /** AC thresholds used for timing, V. */
  vil: num,
  vih: num,
  /** Reference voltage, V (for reporting crossings; defaults to (vil+vih)/2). */
  vref: num,
  /** On-die termination to `odtVtt` volts, ohm; null when absent. */
  odtOhms: positive.nullable(),
  odtVtt: num,
  /** Absolute limits the pin may see, V. */
  vmaxAbs: num,
  vminAbs: num,
  /** Setup and hold requirement at the receiver, s. */
  tsetup: num,
  thold: num,
  /** Slew-rate derating table of tsetup/thold (optional; docs/design.md §6.4). */
  derating: slewDeratingSchema.optional(),
});
export type ReceiverModel = z.infer<typeof receiverModelSchema>;

export const partModelSchema = z.strictObject({
  name,
  /** Free text such as "memory controller, data I/O". */
  description: text,
  /** Name of the I/O standard preset this part follows (IO_STANDARDS), or "" for custom. */
  ioStandard: z.string().max(200),
  driver: driverModelSchema.nullable(),
  receiver: receiverModelSchema.nullable(),
  /**
   * IBIS model of the part's pin (docs/ibis.md §9): `file` names an entry of ProjectData.ibisFiles,
   * `model` a [Model] in it. When set, the driver's and receiver's electrical behaviour come from the
   * model; the linear fields above stay required as the fallback and the timing data (Tco, setup/hold,
   * thresholds are the part's). `pin` names the [Pin] row whose package (R_pin/L_pin/C_pin, else
   * [Package]) the part's pins sit behind; absent: the first [Pin] row that uses the model.
   */
  ibis: z.strictObject({ file: name, model: name, pin: name.optional() }).optional(),
});
export type PartModel = z.infer<typeof partModelSchema>;

// ---------------------------------------------------------------- nets

export const netRoleSchema = z.enum(['data', 'strobe', 'clock', 'address', 'command', 'control']);
export type NetRole = z.infer<typeof netRoleSchema>;

/**
 * One element of a net's topology. Nodes are named by strings local to the net; "gnd" is 0 V and rail
 * names (NetDefinition.rails) are fixed-voltage nodes.
 */
export const netElementSchema = z.discriminatedUnion('kind', [
  /** Routed trace on a stackup layer: Z0 and delay come from the stackup at the trace's width. */
  z.strictObject({
    kind: z.literal('segment'), a: node, b: node, layer: name, width: positive, length: nonNegative,
    /**
     * Edge-to-edge gap to the partner leg of an edge-coupled differential pair, m. When set, the
     * segment is one leg of a pair driven differentially; absent for a single-ended trace.
     */
    spacing: positive.optional(),
  }),
  /** Explicit transmission line (connector, cable, package trace). */
  z.strictObject({ kind: z.literal('line'), a: node, b: node, z0: positive, delay: nonNegative }),
  z.strictObject({ kind: z.literal('resistor'), a: node, b: node, ohms: positive }),
  z.strictObject({ kind: z.literal('capacitor'), a: node, b: node, farads: nonNegative }),
  z.strictObject({ kind: z.literal('inductor'), a: node, b: node, henries: nonNegative }),
  /** A via modelled as a lumped capacitance from `a` to ground (docs/design.md §4). */
  z.strictObject({ kind: z.literal('via'), a: node, farads: nonNegative }),
]);
export type NetElement = z.infer<typeof netElementSchema>;

export const netEndpointSchema = z.strictObject({
  /** Part model name. */
  part: name,
  /** Node of the topology where the part's pin sits. */
  node,
  /** Designator of the device, e.g. "U3" (for people). */
  designator: name,
});
export type NetEndpoint = z.infer<typeof netEndpointSchema>;

export const netDefinitionSchema = z.strictObject({
  name,
  bus: name,
  role: netRoleSchema,
  driver: netEndpointSchema,
  receivers: z.array(netEndpointSchema),
  elements: z.array(netElementSchema),
  /** Named fixed-voltage nodes (e.g. { vtt: 0.6 }), V at nominal rails. */
  rails: z.record(z.string(), num),
});
export type NetDefinition = z.infer<typeof netDefinitionSchema>;

// ---------------------------------------------------------------- buses and budgets

export const busKindSchema = z.enum(['common-clock', 'source-synchronous']);
export type BusKind = z.infer<typeof busKindSchema>;

/** A budget line item entered by the user (allowances, clock skew, jitter...). */
export const budgetAllowanceSchema = z.strictObject({
  name,
  /** s; positive values always reduce margin. */
  value: num,
  /** Which margin it is charged against. */
  appliesTo: z.enum(['setup', 'hold', 'both']),
  note: text,
});
export type BudgetAllowance = z.infer<typeof budgetAllowanceSchema>;

export const commonClockTimingSchema = z.strictObject({
  kind: z.literal('common-clock'),
  /** Clock period, s. */
  cycleTime: positive,
  /** Clock flight to the driver minus clock flight to the receiver, s (docs/design.md §6). */
  clockSkew: num,
  /** Cycle-to-cycle jitter charged to setup, s. */
  jitter: nonNegative,
});
export type CommonClockTiming = z.infer<typeof commonClockTimingSchema>;

export const sourceSyncTimingSchema = z.strictObject({
  kind: z.literal('source-synchronous'),
  /** Data valid before / after the strobe edge at the driver, s. */
  tValidBefore: num,
  tValidAfter: num,
});
export type SourceSyncTiming = z.infer<typeof sourceSyncTimingSchema>;

export const busDefinitionSchema = z.strictObject({
  name,
  kind: busKindSchema,
  description: text,
  /** Net name of the clock (common clock) or strobe (source synchronous). */
  referenceNet: name.nullable(),
  timing: z.discriminatedUnion('kind', [commonClockTimingSchema, sourceSyncTimingSchema]),
  allowances: z.array(budgetAllowanceSchema).max(200),
  /**
   * How the bus pairs silicon with board tolerances (docs/design.md §6.3). Absent or 'fixed': each corner
   * as defined. 'cross': every corner's silicon (driver strength, edge rate, rail, Cin, Tco) with every
   * corner's board (Dk, width change). A list: just those (silicon corner, board corner) pairs.
   */
  cornerPairing: z.union([
    z.enum(['fixed', 'cross']),
    z.array(z.strictObject({ silicon: name, board: name })).min(1).max(100),
  ]).optional(),
});
export type BusDefinition = z.infer<typeof busDefinitionSchema>;

// ---------------------------------------------------------------- corners

/**
 * A process/voltage/temperature corner as multipliers on nominal values. "slow" makes edges slower
 * and drivers weaker; each factor is 1 at typical.
 */
export const cornerSchema = z.strictObject({
  name,
  /** Multiplies driver output resistance. */
  driverStrength: positive,
  /** Multiplies rise and fall times. */
  edgeRate: positive,
  /** Multiplies dielectric Dk. */
  dk: positive,
  /** Added to every trace width (etch), m (negative = narrower = higher Z0). */
  widthDelta: num,
  /** Multiplies supply rails (VOH, VTT, thresholds referenced to the rail). */
  rail: positive,
  /** Multiplies receiver input capacitance. */
  cin: positive,
  /** Which Tco of the driver applies: slow corner uses tcoMax for setup, fast uses tcoMin for hold. */
  tco: z.enum(['min', 'max', 'typ']),
});
export type Corner = z.infer<typeof cornerSchema>;

/** An IBIS file stored in the project (docs/ibis.md §9): its name, SHA-256 of its text (hex) and the text. */
export const ibisFileRecordSchema = z.strictObject({
  name,
  sha256: z.string().regex(/^[0-9a-f]{64}$/),
  text: z.string().max(50_000_000),
});
export type IbisFileRecord = z.infer<typeof ibisFileRecordSchema>;

// ---------------------------------------------------------------- waivers

/**
 * A reviewer's waiver of one net's failing or tight check (docs/workbench.md, "Waivers"). It records
 * what it waives as it was when waived, so a later result can be compared with it (the net's own
 * status is never changed by a waiver). Comment and author are required (checked in validate.ts,
 * which names the field).
 */
export const waiverSchema = z.strictObject({
  net: name,
  /** The check waived: "setup margin", "hold margin", "timing" (no crossing) or a signal check name. */
  check: z.string().min(1).max(200),
  /** The net's status when waived. */
  status: z.enum(['fail', 'tight']),
  /** That check's margin when waived (s for timing, V for signal checks); null when it has none. */
  margin: num.nullable(),
  unit: z.enum(['s', 'V']).nullable(),
  comment: text,
  author: z.string().max(200),
  /** ISO 8601 UTC of the waiver. */
  at: z.string().min(1).max(40),
});
export type Waiver = z.infer<typeof waiverSchema>;

/** The whole content of a project, as loaded. */
export const projectDataSchema = z.strictObject({
  info: projectInfoSchema,
  stackup: stackupSchema,
  parts: z.array(partModelSchema),
  buses: z.array(busDefinitionSchema),
  nets: z.array(netDefinitionSchema),
  corners: z.array(cornerSchema),
  /** IBIS files the parts refer to; absent in projects without any. */
  ibisFiles: z.array(ibisFileRecordSchema).optional(),
  /** Reviewers' waivers, one per net at most; absent in projects without any. Not an input of any result. */
  waivers: z.array(waiverSchema).optional(),
});
export type ProjectData = z.infer<typeof projectDataSchema>;
