/**
 * The unit of work of a board solve, as plain data (so it can cross a worker-thread boundary), and the
 * pure function that runs it. The services run jobs on a thread pool or in-line, with the same results.
 */
import type { ProjectData } from '../project/model.js';
import type { NetResult } from '../budget/results.js';
import type { ReceiverEdgeMeasure } from '../budget/measures.js';
import { busOf, findNet, solveNet, type NetMeasures, type SolveOptions } from './solve-net.js';
import { projectForBus } from './corner-set.js';
import { simulateNetMeasures } from './simulate-net.js';
import { runSweepPoint, type SweepQuantity } from './sweep.js';

/**
 * Revision of the budget engine's results. It enters every cache key with the tool version: bump it
 * when a change to core/ alters results without a version bump, so cached results of the old code are
 * never served as fresh.
 */
export const ENGINE_REVISION = 9; // 3: differential pair segments (odd mode)
// 9: length-window search: each edge's first trial aimed at half the 0.25 ps band (was 1 % + 20 um past
//    the zero), a trial landing in the band is the edge (docs/design.md §6.3); edges move < 36 um.
// 8: length-window search: first trials placed from the segment's delay per metre, secant aimed inside the
//    0.25 ps band, edges set by signal quality or a margin jump to 25 um (was 1 um), other cases checked
//    at an edge only where the linear bound cannot rule them out, secant on the failing margin (docs/design.md §6.3);
//    statuses and margins unchanged on the demo, window edges move < 30 um.
// 7: the first-incidence window moves by the lag of the incident edge's start; stubs behind a package stay capacitive.
// 6: a differential pair's level is checked on Vdiff against VIH,diff (docs/design.md §5), its own check.
// 5: budget and measurement corrections (docs/design.md §5, §6): missing crossings are unknown (null),
//    first incidence from the network's arrival times, ledges in the band, clock nets and Tco per margin,
//    pairs timed at their legs' crossing, one source waveform for net and reference load, guard-band
//    windows, termination trials on the board's own rails.
// 4: both edges of a net in one simulateNet pass (the falling edge by superposition for a symmetric driver):
//    numbers agree with 3 to 5e-13 relative, but where the two edges tie exactly, round-off may now name the other edge.

export type SolveJobSpec =
  /** Stage 1: a source-synchronous strobe's own measurements. */
  | { kind: 'strobe-measures'; net: string; key: string }
  /** Stage 2: a timed or quality-only net (with its strobe's measurements in a source-synchronous bus). */
  | { kind: 'net'; net: string; key: string; strobe: NetMeasures | null }
  /** Stage 3: a strobe's result, from its own and its data nets' measurements. */
  | { kind: 'strobe'; net: string; key: string; own: ReceiverEdgeMeasure[]; dataNets: NetMeasures[] }
  /**
   * One value of a what-if sweep (core/engine/sweep.ts): the net with one element set to `value`, or as
   * it is (null, with the swept segment's length window when `window`). Never cached (key '').
   */
  | {
    kind: 'sweep-point'; net: string; key: string; quantity: SweepQuantity; value: number | null; window: boolean;
    strobe: NetMeasures | null; dataNets: NetMeasures[];
  };

export interface JobOutput {
  /** The job's net. */
  net: string;
  measures: ReceiverEdgeMeasure[];
  /** Null for stage-1 jobs. */
  result: NetResult | null;
  simulations: number;
}

/** Runs one job. Deterministic: the same job on the same project gives the same output. */
export function runJob(project: ProjectData, job: SolveJobSpec, options: SolveOptions = {}): JobOutput {
  switch (job.kind) {
    case 'strobe-measures': {
      const net = findNet(project, job.net);
      // measured at its bus's corner set, as the nets that use these measures (core/engine/corner-set.ts)
      const measures = simulateNetMeasures(projectForBus(project, busOf(project, net)), net);
      return { net: job.net, measures, result: null, simulations: project.corners.length * 2 };
    }
    case 'net': {
      const s = solveNet(project, job.net, { strobe: job.strobe, inputHash: job.key }, options);
      return { net: job.net, measures: s.measures, result: s.result, simulations: s.simulations };
    }
    case 'strobe': {
      const s = solveNet(project, job.net, { ownMeasures: job.own, dataNets: job.dataNets, inputHash: job.key }, options);
      return { net: job.net, measures: s.measures, result: s.result, simulations: s.simulations };
    }
    case 'sweep-point': {
      const s = runSweepPoint(project, job.net, job.quantity, job.value, { strobe: job.strobe, dataNets: job.dataNets, window: job.window });
      return { net: job.net, measures: s.measures, result: s.result, simulations: s.simulations };
    }
    default: {
      const never: never = job;
      throw new Error(`unknown solve job ${JSON.stringify(never)}`);
    }
  }
}
