/**
 * The typed content of an IBIS file (ANSI/EIA-656), as far as a board-level timing simulation needs
 * it (docs/ibis.md §1). SI units everywhere (V, A, s, ohm, F, H). `line` fields are 1-based line
 * numbers in the source text, for messages.
 */

/** One of the standard's three data columns. */
export type Corner = 'typ' | 'min' | 'max';
export const CORNERS: readonly Corner[] = ['typ', 'min', 'max'];

/** A typ/min/max value; min and max are null where the file says NA (then typ is used, §3). */
export interface Triple {
  typ: number;
  min: number | null;
  max: number | null;
}

/** A V-I table: voltage column (strictly increasing) and one current column per corner (A, into the pin). */
export interface ViTable {
  line: number;
  v: number[];
  i: { typ: number[]; min: number[] | null; max: number[] | null };
}

/** The fixture a [Rising Waveform] / [Falling Waveform] was recorded into. */
export interface WaveformFixture {
  rFixture: number;
  vFixture: Triple;
  cFixture: number;
  lFixture: number;
  rDut: number;
  lDut: number;
  cDut: number;
}

/** A V-T table: time column (strictly increasing, s) and one voltage column per corner (V at the pin). */
export interface VtTable {
  line: number;
  fixture: WaveformFixture;
  t: number[];
  v: { typ: number[]; min: number[] | null; max: number[] | null };
}

/** [Ramp]: dV/dt of the 20-80 % part of each edge into R_load, per corner. */
export interface RampData {
  line: number;
  rising: { typ: { dv: number; dt: number }; min: { dv: number; dt: number } | null; max: { dv: number; dt: number } | null };
  falling: { typ: { dv: number; dt: number }; min: { dv: number; dt: number } | null; max: { dv: number; dt: number } | null };
  rLoad: number;
}

/** Model_type values this program reads (plain V-I / V-T data). */
export const MODEL_TYPES = [
  'Input', 'Output', 'I/O', '3-state', 'Open_drain', 'I/O_open_drain', 'Open_sink', 'I/O_open_sink',
  'Open_source', 'I/O_open_source', 'Input_ECL', 'Output_ECL', 'I/O_ECL', '3-state_ECL', 'Terminator',
] as const;
export type ModelType = (typeof MODEL_TYPES)[number];

export interface IbisModel {
  name: string;
  line: number;
  modelType: ModelType;
  polarity: 'Non-Inverting' | 'Inverting';
  vinl: number | null;
  vinh: number | null;
  vmeas: number | null;
  cref: number | null;
  rref: number | null;
  vref: number | null;
  cComp: Triple | null;
  voltageRange: Triple | null;
  pullupReference: Triple | null;
  pulldownReference: Triple | null;
  powerClampReference: Triple | null;
  gndClampReference: Triple | null;
  temperatureRange: Triple | null;
  pullup: ViTable | null;
  pulldown: ViTable | null;
  gndClamp: ViTable | null;
  powerClamp: ViTable | null;
  ramp: RampData | null;
  rising: VtTable[];
  falling: VtTable[];
}

export interface IbisPin {
  line: number;
  pin: string;
  signal: string;
  model: string;
  /** Per-pin package parasitics, null where not given (the [Package] values apply). */
  rPin: number | null;
  lPin: number | null;
  cPin: number | null;
}

export interface IbisPackage {
  line: number;
  rPkg: Triple;
  lPkg: Triple;
  cPkg: Triple;
}

export interface IbisComponent {
  name: string;
  line: number;
  manufacturer: string | null;
  package: IbisPackage | null;
  pins: IbisPin[];
}

export interface ModelSelector {
  name: string;
  line: number;
  options: { model: string; description: string }[];
}

/** A keyword the parser did not use, with where it was (reported, never dropped silently). */
export interface SkippedKeyword {
  line: number;
  keyword: string;
  reason: string;
}

export interface IbisFile {
  /** The name the text was read under (for messages). */
  source: string;
  version: string;
  fileName: string | null;
  components: IbisComponent[];
  models: IbisModel[];
  selectors: ModelSelector[];
  skipped: SkippedKeyword[];
}
