/**
 * I/O standard presets: supply, reference and input thresholds of common single-ended standards, in
 * volts, each with the standard it comes from. A part model names its preset in `PartModel.ioStandard`;
 * the values seed a receiver's VIL/VIH/Vref, never replace the part's own data sheet.
 *
 * Every value below was recalled from memory of the cited JEDEC documents, not copied from them
 * (`fromMemory: true`); check them against the standard before a sign-off relies on them.
 */
export interface IoStandardPreset {
  /** Preset name, unique (used as PartModel.ioStandard). */
  name: string;
  description: string;
  /** Nominal I/O supply, V. */
  vddq: number;
  /** Input reference voltage, V (the switching point for ratio-based CMOS inputs). */
  vref: number;
  /** AC input thresholds (used for timing), V. */
  vilAc: number;
  vihAc: number;
  /** DC input thresholds (the level the input must hold after switching), V. */
  vilDc: number;
  vihDc: number;
  /** Termination voltage the standard assumes, V; null for unterminated CMOS. */
  vtt: number | null;
  /** The published standard the values come from. */
  source: string;
  /** True when the values were recalled from memory rather than read from the document. */
  fromMemory: boolean;
  /** Simplifications made to fit the standard into VIL/VIH levels. */
  note: string;
}

/** Thresholds of a JESD8-style SSTL input: Vref +/- the AC and DC offsets, V. */
function sstl(vddq: number, acOffset: number, dcOffset: number) {
  const vref = vddq / 2;
  return { vddq, vref, vilAc: vref - acOffset, vihAc: vref + acOffset, vilDc: vref - dcOffset, vihDc: vref + dcOffset, vtt: vref };
}

/** Thresholds of a ratio-based LVCMOS input (VIL = kl * VDD, VIH = kh * VDD), V. */
function lvcmosRatio(vdd: number, kl: number, kh: number) {
  return { vddq: vdd, vref: vdd / 2, vilAc: kl * vdd, vihAc: kh * vdd, vilDc: kl * vdd, vihDc: kh * vdd, vtt: null };
}

export const IO_STANDARDS: readonly IoStandardPreset[] = [
  {
    name: 'LVCMOS33',
    description: 'LVCMOS/LVTTL 3.3 V, unterminated',
    // JEDEC JESD8C.01 (3.3 V LVTTL/LVCMOS): VIL max 0.8 V, VIH min 2.0 V — value from memory.
    vddq: 3.3, vref: 1.4, vilAc: 0.8, vihAc: 2.0, vilDc: 0.8, vihDc: 2.0, vtt: null,
    source: 'JEDEC JESD8C.01, interface standard for nominal 3.0/3.3 V supply digital circuits',
    fromMemory: true,
    note: 'Fixed (not ratio) thresholds; no separate AC level, so AC = DC. Vref is the TTL switch point 1.4 V.',
  },
  {
    name: 'LVCMOS18',
    description: 'LVCMOS 1.8 V, unterminated',
    // JEDEC JESD8-7A (1.8 V normal range): VIL max 0.35*VDD, VIH min 0.65*VDD — value from memory.
    ...lvcmosRatio(1.8, 0.35, 0.65),
    source: 'JEDEC JESD8-7A, 1.8 V +/- 0.15 V normal range and 1.2 V - 1.95 V wide range',
    fromMemory: true,
    note: 'Ratio thresholds evaluated at the nominal 1.8 V; no separate AC level, so AC = DC.',
  },
  {
    name: 'SSTL18',
    description: 'SSTL_18 (1.8 V, DDR2-class), terminated to VTT = VDDQ/2',
    // JEDEC JESD8-15A: Vref = VDDQ/2, DC +/-125 mV, AC +/-250 mV — value from memory.
    ...sstl(1.8, 0.25, 0.125),
    source: 'JEDEC JESD8-15A, Stub Series Terminated Logic for 1.8 V (SSTL_18)',
    fromMemory: true,
    note: 'AC level of the slower speed grades (+/-250 mV); faster grades use +/-200 mV.',
  },
  {
    name: 'SSTL15',
    description: 'SSTL_15 (1.5 V, DDR3-class), terminated to VTT = VDDQ/2',
    // JEDEC JESD79-3 (DDR3 SDRAM) input levels: DC +/-100 mV, AC175 +/-175 mV — value from memory.
    ...sstl(1.5, 0.175, 0.1),
    source: 'JEDEC JESD79-3 (DDR3 SDRAM standard), AC/DC input levels for single-ended signals',
    fromMemory: true,
    note: 'AC175 level; the fastest speed grades use AC150 (+/-150 mV).',
  },
  {
    name: 'SSTL135',
    description: 'SSTL_135 (1.35 V, DDR3L-class), terminated to VTT = VDDQ/2',
    // JEDEC JESD79-3-1 (DDR3L): DC +/-90 mV, AC160 +/-160 mV — value from memory.
    ...sstl(1.35, 0.16, 0.09),
    source: 'JEDEC JESD79-3-1 (addendum: 1.35 V DDR3L), AC/DC input levels',
    fromMemory: true,
    note: 'AC160 level; the fastest speed grades use AC135 (+/-135 mV).',
  },
  {
    name: 'SSTL12',
    description: 'SSTL 1.2 V command/address (DDR4-class), terminated to VTT = VDD/2',
    // JEDEC JESD79-4 (DDR4 SDRAM) CA input levels: DC75 +/-75 mV, AC100 +/-100 mV — value from memory.
    ...sstl(1.2, 0.1, 0.075),
    source: 'JEDEC JESD79-4 (DDR4 SDRAM standard), command/address AC/DC input levels',
    fromMemory: true,
    note: 'AC100 level of the slower speed grades; faster grades use AC90.',
  },
  {
    name: 'POD12',
    description: 'POD12 (1.2 V pseudo-open drain, DDR4-class data), terminated to VDDQ',
    // JEDEC JESD8-24 (POD12) with JESD79-4 receive mask: VrefDQ trained near 0.7*VDDQ,
    // mask height VdIVW 136 mV (+/-68 mV) — value from memory.
    vddq: 1.2, vref: 0.84, vilAc: 0.84 - 0.068, vihAc: 0.84 + 0.068, vilDc: 0.84 - 0.068, vihDc: 0.84 + 0.068,
    vtt: 1.2,
    source: 'JEDEC JESD8-24 (POD12) and JESD79-4 DQ receive mask',
    fromMemory: true,
    note:
      'The standard specifies a receive eye mask around a trained VrefDQ, not VIL/VIH; modelled as ' +
      'Vref = 0.84 V (0.7 * VDDQ) +/- half the mask height. Set the part\'s Vref after training.',
  },
];

/** The preset of that name, or undefined. */
export function ioStandardByName(name: string): IoStandardPreset | undefined {
  return IO_STANDARDS.find((preset) => preset.name === name);
}
