/**
 * Loads the invented report fixture (fixtures/report/heron-ridge.*.json, see the README there):
 * a project and a hand-made BoardResult with a failing, a tight and passing nets, and an empty bus.
 */
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { BoardResult, NetResult, BusResult } from '../../../core/budget/results.js';
import type { ProjectData } from '../../../core/project/model.js';

const dir = fileURLToPath(new URL('../../../fixtures/report/', import.meta.url));

export function loadProject(): ProjectData {
  return JSON.parse(readFileSync(`${dir}heron-ridge.project.json`, 'utf8')) as ProjectData;
}

export function loadResult(): BoardResult {
  return JSON.parse(readFileSync(`${dir}heron-ridge.result.json`, 'utf8')) as BoardResult;
}

/** A bus of `count` invented data nets plus two strobes, for pagination and chart splitting. */
export function wideBus(count: number): BusResult {
  const template = loadResult().buses[0].nets[1];
  const nets: NetResult[] = [];
  for (const name of ['DQS_P', 'DQS_N']) nets.push({ ...template, net: name, role: 'strobe' });
  for (let i = 0; i < count; i++) {
    nets.push({ ...template, net: `D${i}`, flightMin: template.flightMin! + i * 1e-12, flightMax: template.flightMax! + i * 1e-12, setupMargin: template.setupMargin! - i * 1e-12 });
  }
  return { bus: 'WIDE', kind: 'source-synchronous', status: 'pass', worstSetup: nets[nets.length - 1].setupMargin, worstHold: template.holdMargin, worstNet: nets[nets.length - 1].net, nets, note: null };
}
