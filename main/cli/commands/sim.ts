/**
 * `slackline sim NET.json [--json] [--csv FILE]`: simulates both edges of one net file (format v1,
 * docs/design.md §8.1) and prints the measurements per receiver (§5); --json prints them in SI units, --csv writes
 * the waveforms (columns: edge, t_s, one column per node in V).
 */
import { closeSync, openSync, readFileSync, writeSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { parseNetFile } from '../../../core/circuit/parse.js';
import type { Circuit } from '../../../core/circuit/types.js';
import { attachIbisModels, ibisFilesOf } from '../../../core/ibis/attach.js';
import { parseIbis } from '../../../core/ibis/parse.js';
import type { IbisFile } from '../../../core/ibis/types.js';
import { chooseStep, chooseStop, simulateNet, type Waveform } from '../../../core/solver/transient.js';
import { GROUND } from '../../../core/circuit/types.js';
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

/**
 * Writes the waveforms as CSV, streamed in blocks of rows: memory stays at one block whatever the
 * run's length. Write errors name the file.
 */
function writeCsv(path: string, waves: { rising: Waveform; falling: Waveform }): void {
  const fail = (error: unknown): never => {
    throw new InputError(`--csv ${path}`, `cannot write the file (${(error as NodeJS.ErrnoException).code ?? String(error)})`);
  };
  let fd: number;
  try {
    fd = openSync(path, 'w');
  } catch (error) {
    return fail(error);
  }
  try {
    let block = `${['edge', 't_s', ...waves.rising.nodes.map((n) => `${n}_V`)].join(',')}\n`;
    for (const w of [waves.rising, waves.falling]) {
      for (let i = 0; i < w.t.length; i++) {
        block += `${[w.edge, w.t[i].toExponential(9), ...w.v.map((x) => x[i].toPrecision(9))].join(',')}\n`;
        if (block.length > 1 << 20) {
          writeSync(fd, block);
          block = '';
        }
      }
    }
    writeSync(fd, block);
  } catch (error) {
    fail(error);
  } finally {
    closeSync(fd);
  }
}

/**
 * Largest waveform --json prints (samples × (nodes + 1) numbers over both edges): about 20 bytes of
 * text per number, so 2e6 numbers is some 40 MB. Longer runs go to --csv, which streams.
 */
export const JSON_WAVEFORM_LIMIT = 2e6;

/** Numbers --json would print for the waveforms, from the solver's own step and stop rules, before any work. */
function waveformNumbers(circuit: Circuit): number {
  const stop = circuit.stop ?? chooseStop(circuit);
  const rails = new Set(Object.keys(circuit.rails ?? {}));
  const nodes = new Set<string>([circuit.driver.node]);
  for (const e of circuit.elements) for (const n of [e.a, 'b' in e ? e.b : GROUND]) if (n !== GROUND && !rails.has(n)) nodes.add(n);
  let total = 0;
  for (const edge of ['rising', 'falling'] as const) total += (Math.ceil(stop / chooseStep(circuit, edge, stop)) + 1) * (nodes.size + 1);
  return total;
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
    if (values.json) {
      const numbers = waveformNumbers(circuit);
      if (numbers > JSON_WAVEFORM_LIMIT) {
        throw new InputError('--json', `the waveforms would be about ${numbers.toPrecision(2)} numbers (limit ${JSON_WAVEFORM_LIMIT}, some 40 MB of JSON); ` +
          'shorten the net file\'s stop time, or leave out --json and write them with --csv FILE (streamed)');
      }
    }
    const waves = simulateNet(circuit);
    const receivers = measureReceivers(circuit, waves);
    if (values.csv) writeCsv(values.csv, waves);
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
