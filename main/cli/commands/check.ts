/** `slackline check FILE [--bus NAME] [--threads N] [--json]`: per-bus margin tables with pass / tight / fail. */
import { availableParallelism } from 'node:os';
import { parseArgs } from 'node:util';
import { InputError } from '../../../core/errors.js';
import type { BoardTable, BusTable, NetSummary } from '../../../core/budget/results.js';
import { formatIn } from '../../../core/units/quantity.js';
import { SCOPE_SUMMARY } from '../../../core/report/scope-text.js';
import { waivedStatusText, waiverState, type WaiverState } from '../../../core/budget/waiver.js';
import type { Waiver } from '../../../core/project/model.js';
import { openProjectServices } from '../../services/compose.js';
import type { SolveBoardOptions } from '../../services/solve/solve-service.js';
import { printJson, projectFileArgument, type CliCommand, type CliIo } from '../command.js';

const usage = `Usage: slackline check FILE [--bus NAME] [--threads N] [--json]

Simulates every net of the project FILE at every corner on both edges, builds each bus's timing
budget and prints a margin table per bus: flight time window, setup and hold margin at the worst
corner, status (pass, tight = under the project's guard band, fail) and the reason in words.
Results are cached in the project by a hash of their inputs; unchanged nets are not re-solved.

  --bus NAME     check one bus only
  --threads N    worker threads for the simulations (default: one per core; on one or two
                 cores a check of up to 3,000 jobs runs in this command's own thread, the
                 quicker there); 0 = always in this command's own thread
  --json         print the BoardResult (SI units: s, V, m, ohm)

A net a reviewer waived (docs/workbench.md, "Waivers") keeps its status, shown as "FAIL · waived"
(or "waived (stale)" when the result no longer matches what was waived), with the waiver below the
table; a waiver changes neither the counts of pass, tight and fail nor the exit status.

Exit status: 0 when no net fails, 1 when any net fails, 2 on bad input.`;

const ps = (s: number | null): string => formatIn(s, 'ps', 0, false);

/**
 * Where a check runs its jobs when --threads is not given, for `cores` (os.availableParallelism()):
 * one worker per core, and on fewer than three cores every solve of up to 3,000 jobs in this thread.
 * Measured on two cores (docs/board-partitioning.md §5): the pool spends about 1.45x the CPU time of
 * one thread (each worker starts, compiles and collects garbage on its own), so two workers end later
 * than this thread alone on boards up to about 3,000 nets and sooner above (one thread's heap grows
 * with the board). A command may block its own thread; the workbench's hosts keep the pool so their
 * event loop stays free.
 */
export function defaultCheckThreads(cores: number): { workers: number; inThreadUpTo?: number } {
  return cores >= 3 ? { workers: cores } : { workers: cores, inThreadUpTo: 3000 };
}

/** Pads cells to column widths; the last column is left free. */
function table(header: string[], rows: string[][], rightAligned: Set<number>): string[] {
  const widths = header.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const line = (cells: string[]) =>
    cells.map((c, i) => (i === cells.length - 1 ? c : rightAligned.has(i) ? c.padStart(widths[i]) : c.padEnd(widths[i]))).join('  ').trimEnd();
  return [line(header), line(widths.map((w, i) => (i === widths.length - 1 ? '-'.repeat(Math.max(6, header[i].length)) : '-'.repeat(w)))), ...rows.map(line)];
}

/** Each waived net's waiver and whether it still matches the net's result. */
type WaiverStates = Map<string, { waiver: Waiver; state: WaiverState }>;

function netRow(n: NetSummary, waivers: WaiverStates): string[] {
  const mark = n.marginsFrom ? '*' : '';
  const w = waivers.get(n.net);
  return [
    n.net, n.role, ps(n.flightMin), ps(n.flightMax), `${ps(n.setupMargin)}${mark}`, `${ps(n.holdMargin)}${mark}`,
    // the status in capitals, its waiver beside it in words ("FAIL · waived (stale)")
    n.worstCorner, `${n.status.toUpperCase()}${w ? waivedStatusText(n.status, w.state.state).slice(n.status.length) : ''}`, n.reasons[0] ?? '',
  ];
}

/** "length window of segment 3 (L3_SIG): 31.20 to 38.90 mm, now 78.00 mm". */
function windowText(n: NetSummary): string {
  const w = n.lengthWindow!;
  const mm = (m: number) => formatIn(m, 'mm', 2, false);
  const range = w.min === null || w.max === null ? 'none in the searched range' : `${mm(w.min)} to ${mm(w.max)} mm`;
  return `length window of segment ${w.elementIndex + 1} (${w.layer}): ${range}, now ${mm(w.current)} mm`;
}

function busText(bus: BusTable, waivers: WaiverStates): string[] {
  const lines = [
    `${bus.bus} (${bus.kind}): ${bus.status.toUpperCase()}` +
      (bus.nets.length ? ` — worst setup ${formatIn(bus.worstSetup, 'ps', 0)}, worst hold ${formatIn(bus.worstHold, 'ps', 0)}` +
        (bus.worstNet ? `, worst net ${bus.worstNet}` : '') : ''),
  ];
  if (bus.note) lines.push(`  note: ${bus.note}`);
  if (bus.nets.length === 0) return lines;
  const header = ['net', 'role', 'flight min ps', 'flight max ps', 'setup ps', 'hold ps', 'worst corner', 'status', 'reason'];
  lines.push(...table(header, bus.nets.map((n) => netRow(n, waivers)), new Set([2, 3, 4, 5])).map((l) => `  ${l}`));
  for (const n of bus.nets) {
    const w = waivers.get(n.net);
    if (w) {
      lines.push(`    ${n.net}: waived (${w.waiver.status} ${w.waiver.check}) by ${w.waiver.author} on ${w.waiver.at.slice(0, 10)}: ${w.waiver.comment}`);
      if (w.state.state === 'stale') lines.push(`    ${n.net}: the waiver is stale: ${w.state.why}`);
    }
    for (const extra of n.reasons.slice(1)) lines.push(`    ${n.net}: ${extra}`);
    if (n.status !== 'pass' && n.lengthWindow) lines.push(`    ${n.net}: ${windowText(n)}`);
    if (n.suggestion) lines.push(`    ${n.net}: suggestion: ${n.suggestion.note}`);
  }
  const starred = bus.nets.filter((n) => n.marginsFrom);
  for (const n of starred) lines.push(`  * ${n.net}: ${n.marginsFrom}`);
  return lines;
}

export function checkText(board: BoardTable, path: string, waivers: readonly Waiver[] = []): string {
  const counts = { pass: 0, tight: 0, fail: 0 };
  const states: WaiverStates = new Map();
  for (const b of board.buses) {
    for (const n of b.nets) {
      counts[n.status]++;
      const waiver = waivers.find((w) => w.net === n.net);
      if (waiver) states.set(n.net, { waiver, state: waiverState(waiver, n) });
    }
  }
  const waived = states.size ? `; ${states.size} waived by a reviewer` : '';
  const lines = [
    `${board.project} — ${path}`,
    `${counts.pass} pass, ${counts.tight} tight, ${counts.fail} fail${waived} (solved ${board.solvedAt}, slackline ${board.toolVersion})`,
    '',
  ];
  for (const bus of board.buses) lines.push(...busText(bus, states), '');
  lines.push(`Modelled: ${SCOPE_SUMMARY.modelled}`, `Neglected: ${SCOPE_SUMMARY.neglected}`, SCOPE_SUMMARY.caution);
  return lines.join('\n');
}

async function run(argv: string[], io: CliIo): Promise<number> {
  const { values, positionals } = parseArgs({
    args: argv,
    strict: true,
    allowPositionals: true,
    options: { bus: { type: 'string' }, threads: { type: 'string' }, json: { type: 'boolean', default: false } },
  });
  const path = projectFileArgument(positionals, usage);
  const workers = values.threads === undefined ? undefined : Number(values.threads);
  if (workers !== undefined && !(Number.isInteger(workers) && workers >= 0 && workers <= 256)) {
    throw new InputError('--threads', `must be a whole number from 0 to 256, got "${values.threads}"`);
  }
  const services = openProjectServices(path, { solve: workers === undefined ? defaultCheckThreads(availableParallelism()) : { workers } });
  const started = Date.now();
  let reported = 0;
  try {
    const solve: SolveBoardOptions = {
      bus: values.bus,
      onProgress: (done, total, message) => {
        // progress on stderr only for runs that take a while, at most every quarter
        if (Date.now() - started < 1000 || total === 0) return;
        const quarter = Math.floor((4 * done) / total);
        if (quarter > reported) {
          reported = quarter;
          io.err(`check: ${done}/${total} jobs (${message})`);
        }
      },
    };
    // The tables need no budget line items: buses taken from the store are read as margin tables.
    const board: BoardTable = values.json ? await services.solver.solveBoard(solve) : await services.solver.solveBoardTable(solve);
    if (values.json) printJson(io, board);
    else io.out(checkText(board, path, services.store.loadShared().waivers ?? []));
    // Said once, on stderr (stdout stays the result): a read-only project is checked but keeps no results.
    const readOnly = services.store.readOnly;
    if (readOnly) io.err(`check: ${path} is read-only (${readOnly}); results were computed but not stored in it`);
    const failing = board.buses.some((b) => b.status === 'fail');
    return failing ? 1 : 0;
  } finally {
    await services.close();
  }
}

export const command: CliCommand = { name: 'check', summary: 'per-bus timing margins: pass, tight or fail', usage, run, flags: { 'selected bus': '--bus' } };
