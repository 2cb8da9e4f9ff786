/**
 * `slackline sweep`: what-if sweep of one net (docs/design.md §6.5) — one segment's length or one
 * resistor's value over a range, the net's worst setup and hold margin and its signal-quality failures
 * at each value. Parsing and printing only; the sweep is core/engine/sweep.ts run by the solve service.
 */
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import { formatIn, parseQuantity } from '../../../core/units/quantity.js';
import type { NetSweep } from '../../../core/engine/sweep.js';
import { sweepQualityText } from '../../../core/charts/sweep.js';
import { openProjectServices } from '../../services/compose.js';
import { printJson, projectFileArgument, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline sweep FILE --net NET (--length N | --resistor N) --from A --to B [--points K] [--json]

  --net        the net to sweep
  --length N   sweep the length of element N (a segment, numbered from 1 as "slackline show" lists them)
  --resistor N sweep the value of element N (a resistor: series or end termination)
  --from A     first value: a length with its unit (20mm, 800mil) or a resistance (10, 10ohm)
  --to B       last value, same kind
  --points K   number of values, start and end included, 2 to 101 (default 11)
  --json       the sweep in SI units (m or ohm, s)

Nothing is saved: the net is solved at each value as an edit would give it. Exit status 0 when every
value passes, 1 when some value fails, 2 on bad input.`;

function text(sweep: NetSweep): string {
  const unit = sweep.unit === 'Ω' ? 'Ω' : 'mm';
  const v = (si: number) => (unit === 'Ω' ? formatIn(si, 'Ω', 1) : formatIn(si, 'mm', 2));
  const m = (s: number | null) => (s === null ? '—' : formatIn(s, 'ps', 1));
  const lines = [`${sweep.net}: ${sweep.element}, now ${v(sweep.current)} (setup ${m(sweep.atCurrent.setupMargin)}, hold ${m(sweep.atCurrent.holdMargin)}, ${sweep.atCurrent.status})`];
  lines.push(`  ${'value'.padStart(10)}  ${'setup'.padStart(10)}  ${'hold'.padStart(10)}  status  signal quality`);
  for (const p of sweep.points) {
    lines.push(`  ${v(p.value).padStart(10)}  ${m(p.setupMargin).padStart(10)}  ${m(p.holdMargin).padStart(10)}  ${p.status.padEnd(6)}  ${sweepQualityText(p).join('; ') || 'passes'}`);
  }
  const w = sweep.lengthWindow;
  if (w) {
    const e = (x: number | null | undefined) => (x === null || x === undefined ? '—' : v(x));
    lines.push(`length window of segment ${w.elementIndex + 1}: ${e(w.min)} to ${e(w.max)} (margins >= 0), ${e(w.guardMin)} to ${e(w.guardMax)} (margins >= the guard band)`);
  }
  lines.push(`guard band ${formatIn(sweep.guardBand, 'ps', 0)}`);
  return lines.join('\n');
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: {
      net: { type: 'string' }, length: { type: 'string' }, resistor: { type: 'string' },
      from: { type: 'string' }, to: { type: 'string' }, points: { type: 'string', default: '11' },
      json: { type: 'boolean', default: false },
    },
  });
  const path = projectFileArgument(positionals, usage);
  if (!values.net) throw new InputError('--net', 'is required');
  if ((values.length === undefined) === (values.resistor === undefined)) throw new InputError('--length', 'give exactly one of --length N and --resistor N');
  const kind = values.length !== undefined ? 'length' : 'resistance';
  const flag = kind === 'length' ? '--length' : '--resistor';
  const element = Number(values.length ?? values.resistor);
  if (!Number.isInteger(element) || element < 1) throw new InputError(flag, `must be an element number from 1, got "${values.length ?? values.resistor}"`);
  if (values.from === undefined) throw new InputError('--from', 'is required');
  if (values.to === undefined) throw new InputError('--to', 'is required');
  const dimension = kind === 'length' ? 'length' : 'resistance';
  const start = parseQuantity(values.from, dimension, '--from');
  const stop = parseQuantity(values.to, dimension, '--to');
  const points = Number(values.points);
  const services = openProjectServices(path);
  try {
    const sweep = await services.solver.sweepNet(values.net, { quantity: { kind, elementIndex: element - 1 }, start, stop, points });
    if (values.json) printJson(io, sweep);
    else io.out(text(sweep));
    return sweep.points.some((p) => p.status === 'fail') ? 1 : 0;
  } finally {
    await services.close();
  }
}

export const command: CliCommand = {
  name: 'sweep',
  summary: 'what-if sweep: a net\'s margins against one segment length or resistor value',
  usage,
  run,
  flags: { 'sweep start': '--from', 'sweep stop': '--to', 'sweep points': '--points', 'sweep element': '--length/--resistor' },
};
