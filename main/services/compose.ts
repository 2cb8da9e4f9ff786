/**
 * Wires the services behind AppService for one open project. Each host's composition root (Electron
 * main.ts, the loopback shell's serve-project.ts) calls openWorkbench once per opened project and
 * owns what it returns; nothing else constructs services.
 */
import { basename, dirname, join } from 'node:path';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { InputError } from '../../core/errors.js';
import { layerProperties } from '../../core/stackup/index.js';
import { ProjectStore, type ProjectStoreOptions } from './project/project-store.js';
import { createDemoProject, DEMO_FILE_NAME } from './project/demo.js';
import { SolveService, type SolveServiceOptions } from './solve/solve-service.js';
import { exportReport } from './report/index.js';
import { AppService } from './api/app-service.js';
import type { ProjectPort, SolvePort } from './api/ports.js';

export interface Workbench {
  api: AppService;
  projectPath: string;
  /** Cancels running solves, stops the worker threads and closes the project file. */
  close(): Promise<void>;
}

export interface WorkbenchOptions {
  store?: ProjectStoreOptions;
  solve?: SolveServiceOptions;
  /** Where exported reports go; default "<project name>-reports" beside the project file. */
  reportDir?: string;
}

/** Where `npm start` / `npm run web` keep the demo project between runs. */
export const DEFAULT_DEMO_DIR = join(tmpdir(), 'slackline-workbench');

/** The demo project's path, created there first when missing. */
export function ensureDemoProject(dir: string = DEFAULT_DEMO_DIR): string {
  const path = join(dir, DEMO_FILE_NAME);
  return existsSync(path) ? path : createDemoProject(dir);
}

export async function openWorkbench(projectPath: string, options: WorkbenchOptions = {}): Promise<Workbench> {
  const store = ProjectStore.open(projectPath, options.store);
  const solver = new SolveService(store, options.solve);
  const reportDir = options.reportDir ?? join(dirname(store.path), `${basename(store.path).replace(/\.[^.]+$/, '')}-reports`);

  const project: ProjectPort = {
    path: store.path,
    load: () => store.load(),
    updateInfo: (patch) => store.updateInfo(patch),
    updateStackup: (stackup) => store.replaceStackup(stackup),
    upsertPart: (part) => store.upsertPart(part),
    updateBus: (bus) => store.updateBus(bus),
    updateNetElement: (net, index, element) => store.updateNetElement(net, index, element),
    updateCorners: (corners) => store.updateCorners(corners),
    previewImport: (file, text) => store.previewImport(file, text),
    applyImport: (file, text) => store.applyImport(file, text),
  };

  const solve: SolvePort = {
    solveBoard: ({ bus, onProgress, signal }) =>
      solver.solveBoard({
        bus,
        signal,
        onProgress: (done, total, message) => onProgress({ fraction: total > 0 ? done / total : 0, message }),
      }),
    solveNet: (net) => solver.solveNet(net),
    freshResults: () => solver.freshResults(),
    latestSolveAt: () => solver.latestSolve()?.solvedAt ?? null,
    outdatedResults: () => solver.outdatedResults(),
    netWaveforms: (net) => solver.netWaveforms(net),
  };

  const api = new AppService({
    project,
    solve,
    layerProperties: (stackup) => layerProperties(stackup),
    exportReport: async ({ formats, bus }) => {
      const board = solver.freshResults();
      if (!board) throw new InputError('margin report', 'there are no fresh results: solve all buses first, then export');
      const files = await exportReport(store.load(), board, {
        outDir: reportDir,
        formats,
        bus,
        waveforms: (net) => solver.netWaveforms(net.net),
      });
      return { files };
    },
  });

  return {
    api,
    projectPath: store.path,
    async close() {
      await api.dispose();
      await solver.close();
      store.close();
    },
  };
}
