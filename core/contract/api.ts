/**
 * The one service API every host serves: Electron IPC (preload), the loopback HTTP shell, and the CLI
 * (through the same composition root). The contract sits on top of core: it imports the domain types
 * from their own folders and nothing in core imports it. The renderer knows the application only through this type.
 * All values SI; all methods async so every transport looks the same.
 */
import type {
  ProjectData, ProjectInfo, Stackup, PartModel, BusDefinition, NetDefinition, NetElement, Corner, Waiver,
} from '../project/model.js';
import type { BoardResult, BusResult, NetResult } from '../budget/results.js';
import type { BusResultSummary } from '../engine/board-summary.js';
import type { LayerProperties } from '../stackup/index.js';
import type { ImportPreview, ImportRow } from '../lengths/length-report.js';
import type { ProjectEdit } from '../design/edits.js';
import type { NetWaveforms } from '../engine/waveforms.js';
import type { NetSweep, SweepPoint, SweepCheck, SweepQuantity, SweepRequest } from '../engine/sweep.js';
import type { ModelCurves } from '../ibis/curves.js';
import type { IbisSummary } from '../ibis/summary.js';
import type { IbisFileInfo } from '../netbuild/ibis-parts.js';

export type { LayerProperties, ImportPreview, ImportRow, NetWaveforms, ModelCurves, IbisSummary, IbisFileInfo, Waiver };

/**
 * The project as clients receive it: ProjectData with each stored IBIS file listed by name, SHA-256,
 * size and summary instead of its text (docs/ibis.md §9); services that need a text read it from the store.
 */
export type ClientProjectData = Omit<ProjectData, 'ibisFiles'> & { ibisFiles?: IbisFileInfo[] };

export type { NetSweep, SweepPoint, SweepCheck, SweepQuantity, SweepRequest };

/** An authoring edit of the service API (core/design/edits.ts; docs/design-file.md §9). */
export type { ProjectEdit, TerminationChange } from '../design/edits.js';

/** What undo and redo would restore, newest first. */
export interface EditHistory {
  undo: { action: string; detail: string; at: string }[];
  redo: { action: string; detail: string; at: string }[];
}

export interface ProjectSummary {
  path: string;
  data: ClientProjectData;
  layers: LayerProperties[];
  /** ISO time of the last solve whose results are still fresh, or null. */
  lastSolvedAt: string | null;
  /** ISO time of the latest solve when its results are out of date (inputs changed since), else null. */
  outdatedSolveAt?: string | null;
  /**
   * Why the project is open read-only (the file or its folder cannot be written, or it was opened so
   * on request), or null when it can be edited. Read-only: every edit is refused naming this reason
   * and the workbench turns its edit controls off (docs/workbench.md, "Read-only projects").
   */
  readOnly: string | null;
}



/** One entry of a project's change log (who changed what, when). */
export interface ChangeLogEntry {
  /** ISO 8601 UTC. */
  at: string;
  author: string;
  /** Short kind of change, e.g. "update-bus", "import-lengths". */
  action: string;
  /** One line for people. */
  detail: string;
}

/** What to solve on one routing layer of a stackup: the width for a target Z0, the gap for a target Zdiff. */
export interface LayerTargetRequest {
  layer: string;
  /** Ω; the width is solved for it unless `width` is given. */
  targetZ0?: number;
  /** m; the pair's trace width when no Z0 target is given. */
  width?: number;
  /** Ω; the edge gap of a pair of `width` traces is solved for it. */
  targetZdiff?: number;
}

/** The answer, with the impedances the solved sizes give (same models as the forward results). */
export interface LayerTargetResult {
  layer: string;
  /** m */
  width: number;
  /** Ω at that width */
  z0: number;
  /** m; null without a Zdiff target */
  gap: number | null;
  /** Ω at that width and gap; null without a Zdiff target */
  zdiff: number | null;
}

/**
 * The potential over a routing layer's cross-section for a picture of the field (docs/field-solver.md §8),
 * as plain arrays so every transport carries it: one trace at 1 V, or a pair driven at +1/−1 V.
 */
export interface LayerFieldMap {
  layer: string;
  /** m */
  width: number;
  /** m; edge gap of a pair, null for one trace */
  spacing: number | null;
  nx: number;
  ny: number;
  /** Grid lines, m (x across from the structure's centre, y up from the bottom plane). */
  xs: number[];
  ys: number[];
  /** V per node, row-major nx·ny from the bottom-left. */
  potential: number[];
  /** Per node: -1 dielectric or air, 0 ground, k + 1 conductor k. */
  kind: number[];
  /** Relative permittivity per cell, (nx − 1)·(ny − 1) row-major. */
  cellEr: number[];
}

/** A written report file, for a download link: its file name, media type and bytes as base64. */
export interface ExportedFile {
  name: string;
  mime: string;
  base64: string;
}

/** The latest whole-board solve when its inputs no longer match the project: shown marked as outdated. */
export interface OutdatedResults {
  board: BoardResult;
  /** Nets whose inputs changed since that solve (or that are new), by name; their rows are out of date. */
  changedNets: string[];
}

/**
 * One bus of the latest whole-board solve in a few numbers, for the overview (docs/workbench.md,
 * "Board scale"): counts, worst margins and the check behind its badge, without its nets' results.
 */
export interface BusSummary extends BusResultSummary {
  /** Waived nets of the bus and how many of those waivers are stale (docs/workbench.md, "Waivers"). */
  waived: number;
  staleWaivers: number;
  /** Nets of the bus whose inputs changed since the solve (0 while it is fresh). */
  changedNets: number;
}

/** The latest whole-board solve, fresh or outdated, bus by bus (no net results: those come per bus). */
export interface BoardSummary {
  project: string;
  solvedAt: string;
  fingerprint: string;
  toolVersion: string;
  /** False when the inputs changed since that solve (the results are shown marked outdated). */
  fresh: boolean;
  /** Nets in the solve's results. */
  nets: number;
  /** Nets whose inputs changed since the solve, or that are new (0 while fresh). */
  changedNets: number;
  buses: BusSummary[];
}

/** A page of one bus's results from the latest whole-board solve (getBusResults). */
export interface BusResultsPage {
  /** The bus's result; `nets` holds only this page's nets, in the bus's order. */
  bus: BusResult;
  /** Position of the page's first net in the bus, and the bus's whole net count. */
  offset: number;
  total: number;
  solvedAt: string;
  fingerprint: string;
  fresh: boolean;
  /** Nets of this page whose inputs changed since the solve (empty while fresh). */
  changedNets: string[];
  /**
   * The whole-board solve before this one, for "Δ vs previous solve": its fingerprint and each of this
   * page's nets' worst margin then (s; null without a number; absent when that solve did not have the net).
   */
  previous: { fingerprint: string; solvedAt: string; margins: Record<string, number | null> } | null;
}

/** Largest page getBusResults gives (nets). */
export const BUS_PAGE_MAX = 2000;

export interface SolveJob {
  id: string;
  state: 'running' | 'done' | 'failed' | 'cancelled';
  /** 0..1 */
  progress: number;
  message: string;
}


/** Choices the user confirmed for a length import. */
export interface ImportOptions {
  allowRepeatedRows?: boolean;
}

export interface SlacklineApi {
  getProject(): Promise<ProjectSummary>;
  updateInfo(patch: Partial<ProjectInfo>): Promise<ProjectSummary>;
  updateStackup(stackup: Stackup): Promise<ProjectSummary>;
  /** Z0/delay of a stackup being edited, without saving it. */
  previewStackup(stackup: Stackup): Promise<LayerProperties[]>;
  /** Width for a target Z0 and gap for a target Zdiff on one routing layer of a stackup (not saved). */
  solveLayerTarget(stackup: Stackup, request: LayerTargetRequest): Promise<LayerTargetResult>;
  /** Potential over the cross-section of one routing layer of a stackup (not saved), for a field picture. */
  layerFieldMap(stackup: Stackup, layer: string, width: number, spacing?: number): Promise<LayerFieldMap>;
  upsertPart(part: PartModel): Promise<ProjectSummary>;
  updateBus(bus: BusDefinition): Promise<ProjectSummary>;
  updateNetElement(net: string, elementIndex: number, element: NetElement): Promise<ProjectSummary>;
  updateCorners(corners: Corner[]): Promise<ProjectSummary>;
  /**
   * `allowRepeatedRows`: the user confirmed rows repeating an earlier (net, layer, length) row, under
   * the rule the preview states; without it such rows are errors.
   */
  previewImport(fileName: string, csvText: string, options?: ImportOptions): Promise<ImportPreview>;
  applyImport(fileName: string, csvText: string, options?: ImportOptions): Promise<ImportPreview>;
  startSolve(options: { bus?: string }): Promise<SolveJob>;
  getJob(id: string): Promise<SolveJob>;
  cancelJob(id: string): Promise<SolveJob>;
  /** Latest fresh results, or null when inputs changed since. */
  getResults(): Promise<BoardResult | null>;
  /** The latest solve's results when they are out of date (with the nets whose inputs changed), else null. */
  getOutdatedResults(): Promise<OutdatedResults | null>;
  /**
   * The latest whole-board solve bus by bus, fresh or outdated, without any net's result (the overview
   * of a board of thousands of nets in one small message), or null when the board was never solved.
   */
  getBoardSummary(): Promise<BoardSummary | null>;
  /**
   * One page of a bus's results in the latest whole-board solve (nets offset .. offset + limit − 1 in
   * the bus's order; limit at most BUS_PAGE_MAX, default all up to it), or null when it was never solved.
   */
  getBusResults(bus: string, page?: { offset?: number; limit?: number }): Promise<BusResultsPage | null>;
  /** Re-solves one net now (fast path after an edit) and returns its result. */
  solveNet(net: string): Promise<NetResult>;
  getNetWaveforms(net: string): Promise<NetWaveforms>;
  /**
   * What-if sweep (docs/design.md §6.5): one segment's length or one resistor's value of a net over a
   * range, the net solved at each value; the worst setup and hold margin and the failing checks per value.
   */
  sweepNet(net: string, request: SweepRequest): Promise<NetSweep>;
  /** The same sweep as a job (progress and cancel through getJob / cancelJob); the request is checked first. */
  startSweep(net: string, request: SweepRequest): Promise<SolveJob>;
  /** The answer of a finished sweep job. */
  getSweepResult(jobId: string): Promise<NetSweep>;
  exportReport(options: { formats: ('pdf' | 'html' | 'csv')[]; bus?: string }): Promise<{ files: string[] }>;
  /**
   * The content of a file the last exports of this session wrote (the browser shell offers it as a
   * download); any other path is refused.
   */
  readExport(file: string): Promise<ExportedFile>;
  /**
   * One authoring edit (create, rename or delete a bus, net or part; insert or remove a net element;
   * a termination; a bus template): validated in full, one transaction, in the change log, undoable.
   * Deleting something others refer to is refused with the referrers named.
   */
  editProject(edit: ProjectEdit): Promise<ProjectSummary>;
  /** Inserts the termination the net's check suggests (series at the driver or at the far end). */
  applySuggestedTermination(net: string): Promise<ProjectSummary>;
  /** Restores the project as it was before the newest authoring edit (kept in the file, 50 deep). */
  undo(): Promise<ProjectSummary>;
  redo(): Promise<ProjectSummary>;
  getEditHistory(): Promise<EditHistory>;
  /**
   * Stores an IBIS file (ANSI/EIA-656) in the project after parsing all of it (docs/ibis.md): a
   * malformed file is refused with its line and keyword and nothing is written.
   */
  importIbis(fileName: string, text: string): Promise<IbisImportResult>;
  /** V-I and V-T curves of a part's IBIS model at a corner's column, or null when the part has none. */
  getPartIbisCurves(part: string, corner: string): Promise<ModelCurves | null>;
  /**
   * Waives a failing or tight net (docs/workbench.md, "Waivers"): records the net's worst check, its
   * status and margin as they are now, with the comment and author (both required), as one undoable
   * authoring edit. The net's status is not changed; a passing net is refused.
   */
  setWaiver(net: string, waiver: WaiverRequest): Promise<ProjectSummary>;
  /** Removes a net's waiver (one undoable authoring edit). */
  removeWaiver(net: string): Promise<ProjectSummary>;
  /**
   * The whole-board solve before the latest one, as per-net worst margins (for "Δ vs previous solve"),
   * or null when only one solve was stored.
   */
  getPreviousSolve(): Promise<PreviousSolveSummary | null>;
  /**
   * Creates a project file from a design file (its YAML text and the .ibs files it names) or empty,
   * checked in full first: any problem writes nothing and comes back placed (line, column, field).
   * An existing file is never replaced. On success the host opens the new project in place of the
   * current one (docs/workbench.md §New project). `checkOnly` checks without creating anything.
   */
  createProject(request: NewProjectRequest): Promise<NewProjectResult>;
  /** Where this host puts a new project file: a fixed folder (file name typed) or a save dialog. */
  getNewProjectTarget(): Promise<NewProjectTarget>;
}

/** What a reviewer gives to waive a net; what is waived comes from the net's result. */
export interface WaiverRequest {
  comment: string;
  /** Free text: who accepts the net as it is. */
  author: string;
}

/** The solve before the latest one: when it ran and each net's worst margin then (s; null without a number). */
export interface PreviousSolveSummary {
  solvedAt: string;
  fingerprint: string;
  margins: Record<string, number | null>;
}

/** What importIbis stored. */
export interface IbisImportResult {
  name: string;
  sha256: string;
  models: string[];
  /** True when a file of the same name was replaced. */
  replaced: boolean;
}

/** What the new-project screen sends (docs/workbench.md §New project). */
export interface NewProjectRequest {
  /** A host with a fixed folder: the new file's name in it. A host with a save dialog asks instead. */
  path?: string;
  /** From a design file (docs/design-file.md): its name, YAML text and the .ibs files its ibisFiles name. */
  design?: {
    fileName: string;
    text: string;
    /** `path` as the design writes it, or only the file name (matched to the design's entry by name). */
    ibisFiles: { path: string; text: string }[];
  };
  /** An empty project: info and the starting corners, nothing else yet. */
  empty?: { name: string; boardRevision?: string; description?: string };
  /** Check only: nothing is created or asked for. */
  checkOnly?: boolean;
}

/** One problem of a new project's input; line and column are 1-based, null where the problem has no place. */
export interface NewProjectProblem {
  file: string;
  line: number | null;
  column: number | null;
  /** Field path such as "buses[0].nets[2].segments[0].length", or null. */
  field: string | null;
  message: string;
}

export interface NewProjectResult {
  /**
   * created: written and open now; invalid: the problems are listed and nothing was written;
   * checked: checkOnly found no problem; cancelled: the save dialog was closed without a file.
   */
  outcome: 'created' | 'invalid' | 'checked' | 'cancelled';
  /** The new project file (created only). */
  path: string | null;
  problems: NewProjectProblem[];
  /** Every IBIS file the design's ibisFiles name, as the design writes them (empty when it does not parse). */
  namedIbisFiles: string[];
  /** Those of them the request did not carry. */
  missingIbisFiles: string[];
  /** What the input describes, when it could be read that far. */
  outline: { name: string; boardRevision: string; buses: number; nets: number; parts: number; ibisFiles: string[] } | null;
}

/** Where a new project goes: a fixed folder of the host (the user types a file name) or a save dialog. */
export type NewProjectTarget = { kind: 'folder'; folder: string } | { kind: 'dialog' };

export type ApiMethod = keyof SlacklineApi;
