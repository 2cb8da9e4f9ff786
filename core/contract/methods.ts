import type { ApiMethod } from './api.js';

/**
 * Every method of SlacklineApi, by name. Transports (Electron preload and IPC, the HTTP shell and its
 * client) iterate this list instead of hand-copying method names, so a method added to the contract
 * and forgotten here is a type error below rather than a silently missing channel.
 */
export const API_METHODS = [
  'getProject',
  'updateInfo',
  'updateStackup',
  'previewStackup',
  'solveLayerTarget',
  'layerFieldMap',
  'upsertPart',
  'updateBus',
  'updateNetElement',
  'updateCorners',
  'previewImport',
  'applyImport',
  'startSolve',
  'getJob',
  'cancelJob',
  'getResults',
  'getOutdatedResults',
  'getBoardSummary',
  'getBusResults',
  'solveNet',
  'getNetWaveforms',
  'sweepNet',
  'startSweep',
  'getSweepResult',
  'exportReport',
  'readExport',
  'editProject',
  'applySuggestedTermination',
  'undo',
  'redo',
  'getEditHistory',
  'importIbis',
  'getPartIbisCurves',
  'setWaiver',
  'removeWaiver',
  'getPreviousSolve',
  'createProject',
  'getNewProjectTarget',
] as const satisfies readonly ApiMethod[];

type Listed = (typeof API_METHODS)[number];
/** Compile-time check: resolves to `true` only when the list covers every ApiMethod. */
type Covers = Exclude<ApiMethod, Listed> extends never ? true : never;
export const API_METHODS_COMPLETE: Covers = true;

export function isApiMethod(name: string): name is ApiMethod {
  return (API_METHODS as readonly string[]).includes(name);
}
