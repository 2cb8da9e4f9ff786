/**
 * What AppService needs from the services below it. Each host's composition root adapts the concrete
 * services (ProjectStore, SolveService, the report exporter, core/stackup) to these narrow ports, so
 * AppService depends on behaviour, not on construction details.
 */
import type {
  ProjectData, ProjectInfo, Stackup, PartModel, BusDefinition, NetElement, Corner, Waiver,
} from '../../../core/project/model.js';
import type { BoardResult, NetResult, TerminationSuggestion } from '../../../core/budget/results.js';
import type { NetSweep, SweepRequest } from '../../../core/engine/sweep.js';
import type { EditHistory, IbisImportResult, ImportOptions, ImportPreview, LayerProperties, NetWaveforms, OutdatedResults, PreviousSolveSummary, ProjectEdit } from '../../../core/contract/api.js';
import type { NewProjectRequest, NewProjectResult, NewProjectTarget } from '../../../core/contract/api.js';
import type { SolvedBoardSummary, SolvedBus } from '../solve/solve-service.js';

/** The open project: reads and edits, each edit one transaction in the store. */
export interface ProjectPort {
  readonly path: string;
  /** Why the project is open read-only, or null (absent: writable); edits are then refused (docs/workbench.md, "Read-only projects"). */
  readonly readOnly?: string | null;
  load(): ProjectData | Promise<ProjectData>;
  /**
   * Optional: the project as one copy shared by readers while the file is unchanged (ProjectStore
   * loadShared); read it, never modify it.
   */
  loadShared?(): ProjectData | Promise<ProjectData>;
  updateInfo(patch: Partial<ProjectInfo>): void | Promise<void>;
  updateStackup(stackup: Stackup): void | Promise<void>;
  upsertPart(part: PartModel): void | Promise<void>;
  updateBus(bus: BusDefinition): void | Promise<void>;
  updateNetElement(net: string, elementIndex: number, element: NetElement): void | Promise<void>;
  updateCorners(corners: Corner[]): void | Promise<void>;
  previewImport(fileName: string, csvText: string, options?: ImportOptions): ImportPreview | Promise<ImportPreview>;
  applyImport(fileName: string, csvText: string, options?: ImportOptions): ImportPreview | Promise<ImportPreview>;
  // Authoring (docs/design-file.md §9); optional so a read-mostly host or a test double may leave it out.
  /** One authoring edit, undoable. */
  editProject?(edit: ProjectEdit): void | Promise<void>;
  undo?(): void | Promise<void>;
  redo?(): void | Promise<void>;
  editHistory?(): EditHistory | Promise<EditHistory>;
  /** Inserts a termination the check suggested for the net (placed by the check's own rule). */
  applySuggestion?(net: string, suggestion: TerminationSuggestion): void | Promise<void>;
  /** Stores a net's waiver / removes it (docs/workbench.md, "Waivers"), each one undoable authoring edit. */
  setWaiver?(waiver: Waiver): void | Promise<void>;
  removeWaiver?(net: string): void | Promise<void>;
  /** Stores a fully parsed IBIS file (docs/ibis.md); optional for hosts that open projects read-mostly. */
  importIbis?(fileName: string, text: string): IbisImportResult | Promise<IbisImportResult>;
}

export interface SolveProgress {
  /** 0..1 */
  fraction: number;
  message: string;
}

/** Solving and the results cache. */
export interface SolvePort {
  solveBoard(options: {
    bus?: string;
    onProgress: (progress: SolveProgress) => void;
    signal: AbortSignal;
  }): Promise<BoardResult>;
  solveNet(net: string): Promise<NetResult>;
  /** The latest results whose input fingerprint still matches the project, or null. */
  freshResults(): BoardResult | null | Promise<BoardResult | null>;
  /** Time of the latest whole-board solve, fresh or not, or null when the project was never solved. */
  latestSolveAt(): string | null | Promise<string | null>;
  netWaveforms(net: string): Promise<NetWaveforms>;
  /** What-if sweep of one net (core/engine/sweep.ts); optional so a host or test double may leave it out. */
  sweepNet?(net: string, request: SweepRequest, options: { onProgress?: (done: number, total: number, message: string) => void; signal?: AbortSignal }): Promise<NetSweep>;
  /** The latest whole-board solve when it is out of date, with the nets whose inputs changed; null when fresh or never solved. */
  outdatedResults?(): OutdatedResults | null | Promise<OutdatedResults | null>;
  /** The whole-board solve before the latest one (per-net worst margins), or null. */
  previousSolve?(): PreviousSolveSummary | null | Promise<PreviousSolveSummary | null>;
  /** Time of the latest whole-board solve when it is still fresh, else null, without reading its results (optional). */
  freshSolvedAt?(): string | null;
  /** The latest whole-board solve bus by bus without net results (optional; else summarised from the whole board). */
  boardSummary?(): SolvedBoardSummary | null;
  /** One bus of the latest whole-board solve (optional; else taken from the whole board). */
  solvedBus?(bus: string): SolvedBus | null;
}

/** Routing-layer properties of a stackup (core/stackup's layerProperties). */
export type LayerPropertiesFn = (stackup: Stackup) => LayerProperties[];

/** Writes the margin report; returns the files written. */
export type ReportExporter = (options: { formats: ('pdf' | 'html' | 'csv')[]; bus?: string }) => Promise<{ files: string[] }>;

/**
 * New projects (docs/workbench.md §New project): the host's session checks, creates and then opens
 * the new file in place of the current project. Absent where a host cannot switch projects.
 */
export interface NewProjectPort {
  create(request: NewProjectRequest): Promise<NewProjectResult>;
  target(): NewProjectTarget;
}
