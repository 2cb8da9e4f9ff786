/**
 * What `slackline ibis` shows of a parsed file (docs/ibis.md §6): components, pins, models with the
 * tables they carry, skipped keywords, and the standard's consistency check that matters for
 * simulation: the static V-I operating points into each waveform's fixture against the waveform's
 * first and last values (mismatch in % of the corner's rail voltage).
 */
import type { Edge } from '../circuit/types.js';
import { modelAtCorner } from './corner.js';
import { fixtureOperatingPoint } from './fixture-response.js';
import { staticCoefficients, switchingCoefficients, type SwitchingMethod } from './switching.js';
import { CORNERS, type Corner, type IbisFile, type IbisModel, type Triple } from './types.js';

export interface EndPointCheck {
  edge: Edge;
  /** Line of the waveform table. */
  line: number;
  corner: Corner;
  rFixture: number;
  vFixture: number;
  /** Table's first and last value, and the V-I operating points before and after the edge, V. */
  tableStart: number;
  tableEnd: number;
  viStart: number;
  viEnd: number;
  /** Largest of the two mismatches, % of the rail voltage (pull-up minus pull-down reference). */
  mismatchPercent: number;
}

export interface ModelSummary {
  name: string;
  line: number;
  modelType: string;
  cComp: Triple | null;
  voltageRange: Triple | null;
  vinl: number | null;
  vinh: number | null;
  vmeas: number | null;
  tables: string[];
  risingWaveforms: number;
  fallingWaveforms: number;
  /** How Ku/Kd are found for each edge (typ corner); null for models that do not drive. */
  switching: { rising: SwitchingMethod; falling: SwitchingMethod } | null;
  notes: string[];
  endPoints: EndPointCheck[];
}

export interface IbisSummary {
  source: string;
  version: string;
  components: { name: string; manufacturer: string | null; package: { rPkg: Triple; lPkg: Triple; cPkg: Triple } | null; pins: { pin: string; signal: string; model: string; rPin: number | null; lPin: number | null; cPin: number | null }[] }[];
  selectors: { name: string; models: string[] }[];
  models: ModelSummary[];
  skipped: { line: number; keyword: string; reason: string }[];
}

function tablesOf(m: IbisModel): string[] {
  const out: string[] = [];
  if (m.pullup) out.push('Pullup');
  if (m.pulldown) out.push('Pulldown');
  if (m.gndClamp) out.push('GND Clamp');
  if (m.powerClamp) out.push('POWER Clamp');
  if (m.ramp) out.push('Ramp');
  if (m.rising.length) out.push(`Rising Waveform x${m.rising.length}`);
  if (m.falling.length) out.push(`Falling Waveform x${m.falling.length}`);
  return out;
}

function endPoints(m: IbisModel): EndPointCheck[] {
  const out: EndPointCheck[] = [];
  for (const corner of CORNERS) {
    const b = modelAtCorner(m, corner);
    const rail = Math.abs(b.pullupRef - b.pulldownRef) || 1;
    for (const edge of ['rising', 'falling'] as const) {
      for (const w of b[edge]) {
        const s = staticCoefficients(edge, 'before');
        const e = staticCoefficients(edge, 'after');
        const noPu = !b.pullup;
        const noPd = !b.pulldown;
        const viStart = fixtureOperatingPoint(b, w, noPu ? 0 : s.ku, noPd ? 0 : s.kd);
        const viEnd = fixtureOperatingPoint(b, w, noPu ? 0 : e.ku, noPd ? 0 : e.kd);
        const tableStart = w.v[0];
        const tableEnd = w.v[w.v.length - 1];
        const mismatch = Math.max(Math.abs(viStart - tableStart), Math.abs(viEnd - tableEnd)) / rail;
        out.push({ edge, line: w.line, corner, rFixture: w.rFixture, vFixture: w.vFixture, tableStart, tableEnd, viStart, viEnd, mismatchPercent: 100 * mismatch });
      }
    }
  }
  return out;
}

export function summariseIbis(file: IbisFile): IbisSummary {
  return {
    source: file.source,
    version: file.version,
    components: file.components.map((c) => ({
      name: c.name,
      manufacturer: c.manufacturer,
      package: c.package ? { rPkg: c.package.rPkg, lPkg: c.package.lPkg, cPkg: c.package.cPkg } : null,
      pins: c.pins.map((p) => ({ pin: p.pin, signal: p.signal, model: p.model, rPin: p.rPin, lPin: p.lPin, cPin: p.cPin })),
    })),
    selectors: file.selectors.map((s) => ({ name: s.name, models: s.options.map((o) => o.model) })),
    models: file.models.map((m) => {
      const drives = m.pullup !== null || m.pulldown !== null;
      const notes: string[] = [];
      let switching: ModelSummary['switching'] = null;
      if (drives) {
        const b = modelAtCorner(m, 'typ');
        const r = switchingCoefficients(b, 'rising');
        const f = switchingCoefficients(b, 'falling');
        switching = { rising: r.method, falling: f.method };
        if (m.rising.length + m.falling.length === 0) notes.push('no waveform tables: the edges come from [Ramp] alone (ramp-only rule, docs/ibis.md §4)');
        for (const k of [r, f]) if (k.method === 'one-waveform') notes.push(`${k.edge}: ${k.note}`);
        for (const w of [...m.rising, ...m.falling]) {
          if (w.fixture.lFixture !== 0 || w.fixture.rDut !== 0 || w.fixture.lDut !== 0 || w.fixture.cDut !== 0) {
            notes.push(`waveform at line ${w.line}: L_fixture and the DUT parasitics are not modelled in the switching coefficients`);
          }
        }
      }
      return {
        name: m.name, line: m.line, modelType: m.modelType, cComp: m.cComp, voltageRange: m.voltageRange,
        vinl: m.vinl, vinh: m.vinh, vmeas: m.vmeas, tables: tablesOf(m),
        risingWaveforms: m.rising.length, fallingWaveforms: m.falling.length, switching, notes,
        endPoints: drives ? endPoints(m) : [],
      };
    }),
    skipped: file.skipped,
  };
}
