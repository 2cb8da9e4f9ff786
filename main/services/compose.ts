/**
 * The one composition root (docs/design.md §7): the only place that constructs and wires services.
 * Every host gets them from here — the CLI commands through openProjectServices / createProject /
 * createDemo, Electron main.ts and the loopback shell's serve-project.ts through openWorkbench — and
 * owns what it is given until it calls close().
 */
import { basename, dirname, join } from 'node:path';
import { existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { InputError } from '../../core/errors.js';
import { layerProperties } from '../../core/stackup/index.js';
import { ProjectStore, type ProjectStoreOptions } from './project/project-store.js';
import { previewImportOffThread } from './project/import-preview.js';
import { createDemoProject, DEMO_FILE_NAME } from './project/demo.js';
import { createProjectFromDesign, designTextOf, writeIbisFilesBeside, writeTextFile } from './project/design-file.js';
import { terminationChange } from './project/termination-target.js';
import { applyProjectEdit, editAction, removeWaiver, setWaiver } from '../../core/design/edits.js';
import { SolveService, type SolveServiceOptions } from './solve/solve-service.js';
import { ReportService } from './report/report-service.js';
import type { ProjectData } from '../../core/project/model.js';
import { AppService } from './api/app-service.js';
import type { NewProjectPort, ProjectPort, SolvePort } from './api/ports.js';
import { buildNewProject, projectFileInFolder } from './project/new-project.js';
import type { NewProjectRequest, NewProjectResult, NewProjectTarget } from '../../core/contract/api.js';

export interface Workbench {
  api: AppService;
  projectPath: string;
  /** Why the project is open read-only, or null (docs/workbench.md, "Read-only projects"). */
  readOnly: string | null;
  /** Cancels running solves, stops the worker threads and closes the project file. */
  close(): Promise<void>;
}

export interface WorkbenchOptions {
  store?: ProjectStoreOptions;
  solve?: SolveServiceOptions;
  /** Where exported reports go; default "<project name>-reports" beside the project file. */
  reportDir?: string;
  /** Creating a project and opening it instead (openWorkbenchSession wires it). */
  newProject?: NewProjectPort;
}

/** The services of one open project. The solver's worker threads start only when a solve needs them. */
export interface ProjectServices {
  store: ProjectStore;
  solver: SolveService;
  reports: ReportService;
  /** Cancels running solves, stops the worker threads and closes the project file. */
  close(): Promise<void>;
}

export interface ProjectServicesOptions {
  store?: ProjectStoreOptions;
  solve?: SolveServiceOptions;
}

export function openProjectServices(projectPath: string, options: ProjectServicesOptions = {}): ProjectServices {
  const store = ProjectStore.open(projectPath, options.store);
  const solver = new SolveService(store, options.solve);
  const reports = new ReportService({
    load: () => store.load(),
    solveBoard: (o) => solver.solveBoard(o),
    netWaveforms: (net) => solver.netWaveforms(net),
    latestSolveAt: () => solver.latestSolve()?.solvedAt ?? null,
    previousSolve: () => solver.previousSolve(),
  });
  return {
    store, solver, reports,
    async close() {
      try {
        await solver.close();
      } finally {
        store.close();
      }
    },
  };
}

/** Creates a project file from `data` (refuses to overwrite) and closes it. */
export function createProject(path: string, data: ProjectData, options: ProjectStoreOptions = {}): void {
  ProjectStore.create(path, data, options).close();
}

/** Creates a project file from a design file, all-or-nothing (docs/design-file.md); returns its data. */
export function createProjectFromDesignFile(path: string, designPath: string, options: ProjectStoreOptions = {}): ProjectData {
  return createProjectFromDesign(path, designPath, options);
}

/** A project's design file text; written to `outPath` when given. */
export function exportDesignFile(projectPath: string, outPath?: string): string {
  const text = designTextOf(projectPath);
  if (outPath !== undefined) {
    // The design names its IBIS files by path beside it: write them first, then the design.
    const store = ProjectStore.open(projectPath, { readOnly: true });
    try {
      writeIbisFilesBeside(outPath, store.load());
    } finally {
      store.close();
    }
    writeTextFile(outPath, text);
  }
  return text;
}

/** Creates (or replaces) the invented demo project in `dir`; returns its path. */
export function createDemo(dir: string): string {
  return createDemoProject(dir);
}

/** Where `npm start` / `npm run web` keep the demo project between runs. */
export const DEFAULT_DEMO_DIR = join(tmpdir(), 'slackline-workbench');

/** The demo project's path, created there first when missing. */
export function ensureDemoProject(dir: string = DEFAULT_DEMO_DIR): string {
  const path = join(dir, DEMO_FILE_NAME);
  return existsSync(path) ? path : createDemoProject(dir);
}

export async function openWorkbench(projectPath: string, options: WorkbenchOptions = {}): Promise<Workbench> {
  const services = openProjectServices(projectPath, options);
  const { store, solver, reports } = services;
  const reportDir = options.reportDir ?? join(dirname(store.path), `${basename(store.path).replace(/\.[^.]+$/, '')}-reports`);

  const project: ProjectPort = {
    path: store.path,
    get readOnly() {
      return store.readOnly;
    },
    load: () => store.load(),
    loadShared: () => store.loadShared(),
    updateInfo: (patch) => store.updateInfo(patch),
    updateStackup: (stackup) => store.replaceStackup(stackup),
    upsertPart: (part) => store.upsertPart(part),
    updateBus: (bus) => store.updateBus(bus),
    updateNetElement: (net, index, element) => store.updateNetElement(net, index, element),
    updateCorners: (corners) => store.updateCorners(corners),
    // Off the host's thread for large reports: the shell and the window keep answering (docs/reliability.md §7).
    previewImport: (file, text, options) => previewImportOffThread(store, file, text, { allowRepeatedRows: options?.allowRepeatedRows }),
    applyImport: (file, text, options) => store.applyImport(file, text, { allowRepeatedRows: options?.allowRepeatedRows }),
    editProject: (edit) => void store.authorEdit(editAction(edit), (current) => applyProjectEdit(current, edit)),
    undo: () => void store.undo(),
    redo: () => void store.redo(),
    editHistory: () => store.undoHistory(),
    importIbis: (fileName, text) => store.importIbis(fileName, text),
    setWaiver: (waiver) => void store.authorEdit('set-waiver', (current) => setWaiver(current, waiver)),
    removeWaiver: (net) => void store.authorEdit('remove-waiver', (current) => removeWaiver(current, net)),
    applySuggestion: (net, suggestion) => {
      const edit = { op: 'applyTermination' as const, net, change: terminationChange(store.load(), net, suggestion) };
      store.authorEdit(editAction(edit), (current) => applyProjectEdit(current, edit));
    },
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
    freshSolvedAt: () => solver.freshSolvedAt(),
    boardSummary: () => solver.boardSummary(),
    solvedBus: (bus) => solver.solvedBus(bus),
    latestSolveAt: () => solver.latestSolve()?.solvedAt ?? null,
    outdatedResults: () => solver.outdatedResults(),
    previousSolve: () => solver.previousSolve(),
    netWaveforms: (net) => solver.netWaveforms(net),
    sweepNet: (net, request, options) => solver.sweepNet(net, request, options),
  };

  const api = new AppService({
    project,
    solve,
    // A new empty project has no stackup yet: no routing layers rather than a refusal of the whole project.
    layerProperties: (stackup) => {
      // field-solved layers: from the project's stored solutions, and what had to be solved is kept
      solver.seedFieldSolutions();
      const layers = stackup.layers.length === 0 ? [] : layerProperties(stackup);
      solver.storeFieldSolutions();
      return layers;
    },
    exportReport: async ({ formats, bus }) => {
      const board = solver.freshResults();
      if (!board) throw new InputError('margin report', 'there are no fresh results: solve all buses first, then export');
      return { files: await reports.write(board, { outDir: reportDir, formats, bus }) };
    },
    newProject: options.newProject,
  });

  return {
    api,
    projectPath: store.path,
    readOnly: store.readOnly,
    async close() {
      await api.dispose();
      await services.close();
    },
  };
}

/** Where a host puts new project files (docs/workbench.md §New project). */
export interface NewProjectPlacement {
  /** What the new-project screen is told. */
  target(currentPath: string): NewProjectTarget;
  /**
   * The file to create for a project called `projectName` (null: the user cancelled). Refuses with
   * an InputError a place the host does not allow, and an existing file.
   */
  choose(requested: string | undefined, projectName: string, currentPath: string): Promise<string | null>;
}

/** New projects only in `folder`, by a plain file name the user types (the browser shell). */
export function folderPlacement(folder: string): NewProjectPlacement {
  return {
    target: () => ({ kind: 'folder', folder }),
    choose: async (requested) => projectFileInFolder(folder, requested),
  };
}

/**
 * A host's open project that can change: `current` is the workbench of the project open now. Its
 * createProject checks the request in full, writes the new file only when there is no problem (never
 * over an existing file), opens it, and then closes the project that was open (docs/workbench.md §New project).
 */
export interface WorkbenchSession {
  readonly current: Workbench;
  /** Opens another project instead of the current one (which stays open when this fails). */
  switchTo(projectPath: string): Promise<void>;
  close(): Promise<void>;
}

export async function openWorkbenchSession(
  projectPath: string,
  placement: NewProjectPlacement,
  options: Omit<WorkbenchOptions, 'newProject'> & {
    /** The first project opens read-only (a host's --read-only); projects opened after it as the file allows. */
    firstReadOnly?: boolean;
  } = {},
): Promise<WorkbenchSession> {
  let current: Workbench;
  const { firstReadOnly, ...rest } = options;
  const open = (path: string, readOnly = false) =>
    openWorkbench(path, { ...rest, store: readOnly ? { ...rest.store, readOnly: true } : rest.store, newProject });
  const switchTo = async (path: string) => {
    const next = await open(path);
    const previous = current;
    current = next;
    await previous.close();
  };
  const newProject: NewProjectPort = {
    target: () => placement.target(current.projectPath),
    create: async (request: NewProjectRequest): Promise<NewProjectResult> => {
      const { data, result } = buildNewProject(request);
      if (!data || request.checkOnly) return result;
      let path: string | null;
      try {
        path = await placement.choose(request.path, data.info.name, current.projectPath);
        if (path === null) return { ...result, outcome: 'cancelled' };
        // The same creation as `slackline new`; it refuses an existing file and removes a half-made one.
        if (existsSync(path)) throw new InputError(path, 'exists already; nothing was replaced: choose another name');
        createProject(path, data, rest.store);
      } catch (error) {
        // A refused place is one more problem of the request, listed with the others.
        if (!(error instanceof InputError)) throw error;
        return { ...result, outcome: 'invalid', problems: [{ file: 'new project', line: null, column: null, field: error.where, message: error.reason }] };
      }
      await switchTo(path);
      return { ...result, outcome: 'created', path: current.projectPath };
    },
  };
  current = await open(projectPath, firstReadOnly === true);
  return {
    get current() {
      return current;
    },
    switchTo,
    close: () => current.close(),
  };
}
