/**
 * `slackline sim NET.json [--json] [--csv FILE]`: simulates both edges of one net file (format v1,
 * issue 3) and prints the measurements per receiver; --json prints the issue-3 contract, --csv writes
 * the waveforms (columns: edge, t_s, one column per node in V).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Circuit } from '../../../core/circuit/types.js';
import { attachIbisModels, ibisFilesOf } from '../../../core/ibis/attach.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import type { IbisFile } from '../../../core/ibis/types.js';
import { simulateNet, type Waveform } from '../../../core/solver/transient.js';
import { type EdgeMeasurements, measureReceivers, type ReceiverMeasurements } from '../../../core/measure/index.js';
import { formatIn } from '../../../core/units/quantity.js';
import { type CliCommand, type CliIo, printJson } from '../command.js';
import { readJsonFile } from '../read-json.js';

const usage = `Usage: slackline sim NET.json [--json] [--csv FILE]

Simulates the rising and falling edge of a net (lossless lines by the method of characteristics,
lumped R, C, L) and measures every receiver: launch and first-incidence levels, threshold crossings,
overshoot, ringback, monotonicity, settling, and compensated flight time when the driver gives a
reference load.

  --json       print the measurements and waveforms as JSON (SI units: s, V)
  --csv FILE   write the waveforms to FILE (edge, t_s, one column per node in V)`;

/** The contract's per-edge object: SI numbers, null where a quantity does not exist. */
function edgeJson(m: EdgeMeasurements): Record<string, unknown> {
  return {
    vLaunch: m.vLaunch,
    vFirstIncidence: m.vFirstIncidence,
    firstIncidence: m.firstIncidence,
    vmax: m.vmax,
    vmin: m.vmin,
    tFirstVil: m.tFirstVil,
    tFirstVih: m.tFirstVih,
    ...(m.edge === 'rising' ? { tLastVih: m.tLastVih } : { tLastVil: m.tLastVil }),
    ringbackMargin: m.ringbackMargin,
    overshoot: m.overshoot,
    undershoot: m.undershoot,
    settlingTime: m.settlingTime,
    monotonic: m.monotonic,
    vLaunchClosedForm: m.vLaunchClosedForm,
    firstIncidenceWindow: m.firstIncidenceWindow,
    tFirstVref: m.tFirstVref,
    tLastVref: m.tLastVref,
    overshootArea: m.overshootArea,
    undershootArea: m.undershootArea,
    overshootMargin: m.overshootMargin,
    undershootMargin: m.undershootMargin,
    vFinal: m.vFinal,
    settleBand: m.settleBand,
    flightTimeMin: m.flightTimeMin,
    flightTimeMax: m.flightTimeMax,
  };
}

function waveJson(w: Waveform): { t: number[]; v: Record<string, number[]> } {
  const v: Record<string, number[]> = {};
  w.nodes.forEach((node, i) => (v[node] = Array.from(w.v[i])));
  return { t: Array.from(w.t), v };
}

const ps = (s: number | null) => (s === null ? '—' : Math.abs(s) >= 1e-9 ? formatIn(s, 'ns', 3) : formatIn(s, 'ps', 1));
const volts = (x: number | null) => (x === null ? '—' : formatIn(x, 'V', 3));

function edgeLines(m: EdgeMeasurements): string[] {
  const rising = m.edge === 'rising';
  return [
    `  ${m.edge}:`,
    `    launch ${volts(m.vLaunch)}${m.vLaunchClosedForm === null ? '' : ` (closed form ${volts(m.vLaunchClosedForm)})`}, ` +
      `first incidence ${volts(m.vFirstIncidence)} -> ${m.firstIncidence ? 'switches on the first incident wave' : 'does NOT switch on the first incident wave'}`,
    `    VIL first ${ps(m.tFirstVil)}, VIH first ${ps(m.tFirstVih)}, ` +
      (rising ? `VIH last ${ps(m.tLastVih)}` : `VIL last ${ps(m.tLastVil)}`),
    `    peak ${volts(m.vmax)}, trough ${volts(m.vmin)}, overshoot ${volts(m.overshoot)}, undershoot ${volts(m.undershoot)}`,
    `    ringback margin ${volts(m.ringbackMargin)}, ${m.monotonic ? 'monotonic' : 'NOT monotonic'} in the threshold band, ` +
      `settles to ${volts(m.vFinal)} ± ${volts(m.settleBand)} at ${m.settlingTime === null ? 'not within the run' : ps(m.settlingTime)}`,
    ...(m.flightTimeMin !== null || m.flightTimeMax !== null
      ? [`    flight time (compensated) min ${ps(m.flightTimeMin)}, max ${ps(m.flightTimeMax)}`]
      : []),
  ];
}

function summary(file: string, receivers: ReceiverMeasurements[], waves: { rising: Waveform; falling: Waveform }, ibis: string[]): string {
  const lines = [
    `${file}: ${receivers.length} receiver(s); step ${ps(waves.rising.step)} rising, ${ps(waves.falling.step)} falling; ` +
      `run ${ps(waves.rising.t[waves.rising.t.length - 1])}`,
  ];
  if (ibis.length) lines.push(`IBIS models: ${ibis.join('; ')}`);
  for (const r of receivers) lines.push('', `receiver ${r.node}`, ...edgeLines(r.rising), ...edgeLines(r.falling));
  lines.push(
    '',
    ...(ibis
      ? ['Modelled: lossless lines, IBIS buffers (V-I tables, switching coefficients, clamps, C_comp; docs/ibis.md), lumped R, C, L.',
        'Not modelled: loss, crosstalk, package parasitics not written in the net. Vendor models, design rules and measurement remain the authority.']
      : ['Modelled: lossless lines, linear driver (ramp behind its output resistance), lumped R, C, L. Not modelled: loss,',
        'crosstalk, nonlinear I/O. Vendor models, design rules and measurement remain the authority.']),
  );
  return lines.join('\n');
}

function csv(waves: { rising: Waveform; falling: Waveform }): string {
  const nodes = waves.rising.nodes;
  const out = [['edge', 't_s', ...nodes.map((n) => `${n}_V`)].join(',')];
  for (const w of [waves.rising, waves.falling]) {
    for (let i = 0; i < w.t.length; i++) out.push([w.edge, w.t[i].toExponential(9), ...w.v.map((x) => x[i].toPrecision(9))].join(','));
  }
  return `${out.join('\n')}\n`;
}

/** Reads the .ibs files a net file names (relative to the net file) and resolves its IBIS drivers and receivers. */
function withIbisModels(circuit: Circuit, netFile: string): Circuit {
  const names = ibisFilesOf(circuit);
  if (names.length === 0) return circuit;
  const files = new Map<string, IbisFile>();
  for (const name of names) {
    const path = join(dirname(netFile), name);
    let text: string;
    try {
      text = readFileSync(path, 'utf8');
    } catch (error) {
      const code = error instanceof Error && 'code' in error ? String((error as { code: unknown }).code) : '';
      throw new InputError(path, code === 'ENOENT' ? `IBIS file not found (named in ${netFile})` : `cannot be read (${code || String(error)})`);
    }
    files.set(name, parseIbis(text, path));
  }
  return attachIbisModels(circuit, files, netFile);
}

export const command: CliCommand = {
  name: 'sim',
  summary: 'simulate one net file (both edges) and measure every receiver',
  usage,
  async run(argv: string[], io: CliIo): Promise<number> {
    const { values, positionals } = parseArgs({
      args: argv,
      allowPositionals: true,
      options: { json: { type: 'boolean' }, csv: { type: 'string' } },
    });
    if (positionals.length !== 1) throw new InputError('arguments', `expected one net file, got ${positionals.length}\n\n${usage}`);
    const file = positionals[0];
    const circuit = withIbisModels(parseNetFile(readJsonFile(file), file), file);
    const waves = simulateNet(circuit);
    const receivers = measureReceivers(circuit, waves);
    if (values.csv) {
      try {
        writeFileSync(values.csv, csv(waves));
      } catch (error) {
        throw new InputError(`--csv ${values.csv}`, `cannot write the file (${(error as NodeJS.ErrnoException).code ?? String(error)})`);
      }
    }
    if (values.json) {
      printJson(io, {
        receivers: receivers.map((r) => ({ node: r.node, rising: edgeJson(r.rising), falling: edgeJson(r.falling) })),
        waveforms: { rising: waveJson(waves.rising), falling: waveJson(waves.falling) },
      });
    } else {
      const models = [circuit.driver.pad?.label, ...circuit.receivers.map((r) => r.pad?.label)].filter((x): x is string => x !== undefined);
      io.out(summary(file, receivers, waves, [...new Set(models)]));
      if (values.csv) io.out(`waveforms written to ${values.csv}`);
    }
    return 0;
  },
};
