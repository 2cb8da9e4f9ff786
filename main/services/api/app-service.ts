/**
 * AppService: the one implementation of SlacklineApi. Every host (Electron IPC, the loopback HTTP
 * shell) serves this object; it composes the project store, the solver service, core/stackup and the
 * report exporter, which it receives through its constructor (each host's composition root wires them).
 * It holds no physics and no SQL: it sequences calls and keeps the table of running solve jobs.
 */
import { randomUUID } from 'node:crypto';
import { readFile } from 'node:fs/promises';
import { basename, extname, resolve } from 'node:path';
import { InputError } from '../../../core/errors.js';
import type {
  SlacklineApi, ProjectSummary, ImportPreview, SolveJob, NetWaveforms, LayerProperties, OutdatedResults, ExportedFile,
  EditHistory, ProjectEdit, ImportOptions, IbisImportResult, ModelCurves,
  LayerTargetRequest, LayerTargetResult, LayerFieldMap, WaiverRequest, PreviousSolveSummary,
} from '../../../core/contract/api.js';
import { waivableCheck, waiverState } from '../../../core/budget/waiver.js';
import { summariseBus } from '../../../core/engine/board-summary.js';
import { BUS_PAGE_MAX, type BoardSummary, type BusResultsPage, type BusSummary } from '../../../core/contract/api.js';
import type { SolvedBoardSummary, SolvedBus } from '../solve/solve-service.js';
import { layerPotentialMap } from '../../../core/stackup/layer-section.js';
import { planSweep, type NetSweep, type SweepRequest } from '../../../core/engine/sweep.js';
import { ibisFileInfo, partIbisCurves } from '../../../core/netbuild/ibis-parts.js';
import { gapForZdiffOnLayer, pairOnLayer, traceOnLayer, widthForZ0OnLayer } from '../../../core/stackup/index.js';
import type {
  ProjectInfo, Stackup, PartModel, BusDefinition, NetElement, Corner,
} from '../../../core/project/model.js';
import type { BoardResult, NetResult } from '../../../core/budget/results.js';
import type { ProjectPort, SolvePort, LayerPropertiesFn, ReportExporter, NewProjectPort } from './ports.js';
import type { NewProjectRequest, NewProjectResult, NewProjectTarget } from '../../../core/contract/api.js';

export interface AppServiceDeps {
  project: ProjectPort;
  solve: SolvePort;
  layerProperties: LayerPropertiesFn;
  exportReport: ReportExporter;
  /** Creating a project and switching to it; absent where the host cannot switch projects. */
  newProject?: NewProjectPort;
}

interface JobEntry {
  job: SolveJob;
  controller: AbortController;
  done: Promise<void>;
}

/** Media types of the report formats (IANA registrations). */
const EXPORT_MIME: Record<string, string> = { '.pdf': 'application/pdf', '.html': 'text/html', '.csv': 'text/csv' };

/** Finished jobs kept for getJob after they end (the renderer polls until it sees the end state). */
const FINISHED_JOBS_KEPT = 20;

export class AppService implements SlacklineApi {
  private readonly jobs = new Map<string, JobEntry>();
  /** Answers of finished sweep jobs, by job id (forgotten with their jobs). */
  private readonly sweeps = new Map<string, NetSweep>();
  /** Absolute paths of the report files exported in this session (readExport serves only these). */
  private readonly exported = new Set<string>();
  /** Absolute paths the latest export wrote: the only files a desktop host may reveal in their folder. */
  private latestExport: readonly string[] = [];

  constructor(private readonly deps: AppServiceDeps) {}

  async getProject(): Promise<ProjectSummary> {
    // The shared copy when the store has one: the solver's freshness check reads the same object, so
    // a board of thousands of nets is read once per change of the file, not twice per call.
    const port = this.deps.project;
    const { ibisFiles, ...rest } = await (port.loadShared ? port.loadShared() : port.load());
    const data = ibisFiles ? { ...rest, ibisFiles: ibisFiles.map(ibisFileInfo) } : rest;
    // Only when the fresh results were solved: from the manifest when the solver can say so without
    // reading every bus's results (71 MB of JSON at 5,000 nets).
    const solve = this.deps.solve;
    const lastSolvedAt = solve.freshSolvedAt ? solve.freshSolvedAt() : ((await solve.freshResults())?.solvedAt ?? null);
    return {
      path: this.deps.project.path,
      // IBIS texts stay in the store: clients get name, hash, size and summary (docs/ibis.md §9).
      data,
      layers: this.deps.layerProperties(data.stackup),
      lastSolvedAt,
      outdatedSolveAt: lastSolvedAt !== null ? null : await solve.latestSolveAt(),
      readOnly: this.deps.project.readOnly ?? null,
    };
  }

  /**
   * Refuses an edit of a read-only project before anything is solved or written, naming why it is
   * read-only (docs/workbench.md, "Read-only projects"). The store refuses it too; this says which edit.
   */
  private writable(edit: string): void {
    const reason = this.deps.project.readOnly;
    if (reason) throw new InputError(`project ${basename(this.deps.project.path)}`, `is open read-only (${reason}); edits are off: ${edit} was refused and nothing was written`);
  }

  async updateInfo(patch: Partial<ProjectInfo>): Promise<ProjectSummary> {
    this.writable('the project information');
    await this.deps.project.updateInfo(patch);
    return this.getProject();
  }

  async updateStackup(stackup: Stackup): Promise<ProjectSummary> {
    this.writable('the stackup');
    // Computing the layers first refuses a stackup the physics cannot evaluate before it is stored.
    this.deps.layerProperties(stackup);
    await this.deps.project.updateStackup(stackup);
    return this.getProject();
  }

  async previewStackup(stackup: Stackup): Promise<LayerProperties[]> {
    return this.deps.layerProperties(stackup);
  }

  async layerFieldMap(stackup: Stackup, layer: string, width: number, spacing?: number): Promise<LayerFieldMap> {
    const map = layerPotentialMap(stackup, layer, width, spacing);
    return {
      layer, width, spacing: spacing ?? null, nx: map.nx, ny: map.ny,
      xs: Array.from(map.xs), ys: Array.from(map.ys), potential: Array.from(map.potential), kind: Array.from(map.kind), cellEr: Array.from(map.cellEr),
    };
  }

  async solveLayerTarget(stackup: Stackup, request: LayerTargetRequest): Promise<LayerTargetResult> {
    const { layer } = request;
    let width: number;
    if (request.targetZ0 !== undefined) width = widthForZ0OnLayer(stackup, layer, request.targetZ0);
    else if (request.width !== undefined) width = request.width;
    else throw new InputError(`layer ${layer} target`, 'give a target Z0, or a trace width for the Zdiff target');
    const z0 = traceOnLayer(stackup, layer, width).z0;
    if (request.targetZdiff === undefined) return { layer, width, z0, gap: null, zdiff: null };
    const gap = gapForZdiffOnLayer(stackup, layer, width, request.targetZdiff);
    return { layer, width, z0, gap, zdiff: pairOnLayer(stackup, layer, width, gap).zdiff };
  }

  async upsertPart(part: PartModel): Promise<ProjectSummary> {
    this.writable(`saving part ${part.name}`);
    await this.deps.project.upsertPart(part);
    return this.getProject();
  }

  async updateBus(bus: BusDefinition): Promise<ProjectSummary> {
    this.writable(`saving the timing of bus ${bus.name}`);
    await this.deps.project.updateBus(bus);
    return this.getProject();
  }

  async updateNetElement(net: string, elementIndex: number, element: NetElement): Promise<ProjectSummary> {
    this.writable(`editing element ${elementIndex + 1} of net ${net}`);
    await this.deps.project.updateNetElement(net, elementIndex, element);
    return this.getProject();
  }

  async updateCorners(corners: Corner[]): Promise<ProjectSummary> {
    this.writable('the corners');
    await this.deps.project.updateCorners(corners);
    return this.getProject();
  }

  async previewImport(fileName: string, csvText: string, options: ImportOptions = {}): Promise<ImportPreview> {
    return this.deps.project.previewImport(fileName, csvText, options);
  }

  async applyImport(fileName: string, csvText: string, options: ImportOptions = {}): Promise<ImportPreview> {
    this.writable(`the length import ${fileName}`);
    return this.deps.project.applyImport(fileName, csvText, options);
  }

  async startSolve(options: { bus?: string }): Promise<SolveJob> {
    return this.trackJob('starting', 'cancelled; results of the previous solve are kept', (job, signal) => this.deps.solve
      .solveBoard({
        bus: options.bus,
        signal,
        onProgress: ({ fraction, message }) => {
          if (job.state !== 'running') return;
          job.progress = Math.min(1, Math.max(0, Number.isFinite(fraction) ? fraction : 0));
          job.message = message;
        },
      })
      .then((board) => `solved ${countNets(board)} nets`));
  }

  /**
   * Runs `work` as a job the page polls (getJob, cancelJob): `work` reports progress on the job and
   * resolves with the done message; a rejection is 'cancelled' when the job was cancelled, else 'failed'.
   */
  private trackJob(starting: string, cancelled: string, work: (job: SolveJob, signal: AbortSignal) => Promise<string>): SolveJob {
    const id = randomUUID();
    const controller = new AbortController();
    const job: SolveJob = { id, state: 'running', progress: 0, message: starting };
    const done = work(job, controller.signal).then(
      (message) => {
        if (job.state !== 'running') return;
        job.state = 'done';
        job.progress = 1;
        job.message = message;
      },
      (error: unknown) => {
        if (controller.signal.aborted) {
          job.state = 'cancelled';
          job.message = cancelled;
        } else {
          job.state = 'failed';
          job.message = error instanceof Error ? error.message : String(error);
        }
      },
    );
    this.jobs.set(id, { job, controller, done });
    this.forgetOldJobs();
    return { ...job };
  }

  async getJob(id: string): Promise<SolveJob> {
    return { ...this.entry(id).job };
  }

  async cancelJob(id: string): Promise<SolveJob> {
    const entry = this.entry(id);
    if (entry.job.state === 'running') {
      entry.controller.abort();
      await entry.done;
      // A solver that ignores the signal and finishes anyway still counts as cancelled by the user.
      if (entry.job.state === 'running' || entry.job.state === 'done') {
        entry.job.state = 'cancelled';
        entry.job.message = 'cancelled';
      }
    }
    return { ...entry.job };
  }

  /** Resolves when the job has ended (for hosts and tests that want to wait instead of polling). */
  async waitForJob(id: string): Promise<SolveJob> {
    const entry = this.entry(id);
    await entry.done;
    return { ...entry.job };
  }

  async getResults(): Promise<BoardResult | null> {
    return this.deps.solve.freshResults();
  }

  async getOutdatedResults(): Promise<OutdatedResults | null> {
    return (await this.deps.solve.outdatedResults?.()) ?? null;
  }

  async getBoardSummary(): Promise<BoardSummary | null> {
    const solved = await this.solvedSummary();
    if (!solved) return null;
    // Waivers are project data: each waived net's state against its result (only those buses are read).
    const data = await this.deps.project.load();
    const waived = new Map<string, { waived: number; stale: number }>();
    const busOf = new Map(data.nets.map((n) => [n.name, n.bus]));
    for (const waiver of data.waivers ?? []) {
      const busName = busOf.get(waiver.net);
      if (busName === undefined) continue;
      const result = (await this.solvedBus(busName))?.bus.nets.find((n) => n.net === waiver.net);
      if (!result) continue;
      const count = waived.get(busName) ?? { waived: 0, stale: 0 };
      count.waived++;
      if (waiverState(waiver, result).state === 'stale') count.stale++;
      waived.set(busName, count);
    }
    const buses: BusSummary[] = solved.buses.map((b) => ({ ...b, waived: waived.get(b.bus)?.waived ?? 0, staleWaivers: waived.get(b.bus)?.stale ?? 0 }));
    return { ...solved, buses };
  }

  async getBusResults(bus: string, page: { offset?: number; limit?: number } = {}): Promise<BusResultsPage | null> {
    const solved = await this.solvedBus(bus);
    if (!solved) {
      const data = await this.deps.project.load();
      if (!data.buses.some((b) => b.name === bus)) throw new InputError(`bus ${bus}`, 'is not in the project');
      return null;
    }
    const offset = page.offset ?? 0;
    const limit = Math.min(page.limit ?? BUS_PAGE_MAX, BUS_PAGE_MAX);
    const nets = solved.bus.nets.slice(offset, offset + limit);
    const before = (await this.deps.solve.previousSolve?.()) ?? null;
    const previous = before
      ? { fingerprint: before.fingerprint, solvedAt: before.solvedAt, margins: Object.fromEntries(nets.filter((n) => n.net in before.margins).map((n) => [n.net, before.margins[n.net]])) }
      : null;
    return {
      bus: { ...solved.bus, nets }, offset, total: solved.bus.nets.length, solvedAt: solved.solvedAt, fingerprint: solved.fingerprint,
      fresh: solved.fresh, changedNets: nets.filter((n) => solved.changedNets.has(n.net)).map((n) => n.net), previous,
    };
  }

  /**
   * The port's board summary, else one made from the whole board: a port without summaries, or a
   * read-only project, whose solve is held in memory only (nothing is stored in it).
   */
  private async solvedSummary(): Promise<SolvedBoardSummary | null> {
    const solve = this.deps.solve;
    const stored = solve.boardSummary ? await solve.boardSummary() : null;
    if (stored) return stored;
    const fresh = await solve.freshResults();
    const outdated = fresh ? null : ((await solve.outdatedResults?.()) ?? null);
    const board = fresh ?? outdated?.board;
    if (!board) return null;
    const changed = new Set(outdated?.changedNets ?? []);
    return {
      project: board.project, solvedAt: board.solvedAt, fingerprint: board.fingerprint, toolVersion: board.toolVersion, fresh: !!fresh,
      nets: board.buses.reduce((sum, b) => sum + b.nets.length, 0), changedNets: changed.size,
      buses: board.buses.map((b) => ({ ...summariseBus(b), changedNets: b.nets.filter((n) => changed.has(n.net)).length })),
    };
  }

  /** The port's bus of the latest solve, else taken from the whole board. */
  private async solvedBus(bus: string): Promise<SolvedBus | null> {
    const solve = this.deps.solve;
    const stored = solve.solvedBus ? await solve.solvedBus(bus) : null;
    if (stored) return stored;
    const fresh = await solve.freshResults();
    const outdated = fresh ? null : ((await solve.outdatedResults?.()) ?? null);
    const board = fresh ?? outdated?.board;
    const found = board?.buses.find((b) => b.bus === bus);
    if (!board || !found) return null;
    return { bus: found, solvedAt: board.solvedAt, fingerprint: board.fingerprint, fresh: !!fresh, changedNets: new Set(outdated?.changedNets ?? []) };
  }

  async solveNet(net: string): Promise<NetResult> {
    return this.deps.solve.solveNet(net);
  }

  /** The project port's authoring side; refused where the host wired none. */
  private authoring(): Required<Pick<ProjectPort, 'editProject' | 'undo' | 'redo' | 'editHistory' | 'applySuggestion'>> {
    const p = this.deps.project;
    if (!p.editProject || !p.undo || !p.redo || !p.editHistory || !p.applySuggestion) {
      throw new InputError('project', 'this host opened the project without authoring');
    }
    return p as Required<Pick<ProjectPort, 'editProject' | 'undo' | 'redo' | 'editHistory' | 'applySuggestion'>>;
  }

  async editProject(edit: ProjectEdit): Promise<ProjectSummary> {
    this.writable(`the edit ${edit.op}`);
    await this.authoring().editProject(edit);
    return this.getProject();
  }

  async applySuggestedTermination(net: string): Promise<ProjectSummary> {
    this.writable(`the suggested termination of net ${net}`);
    const { suggestion } = await this.deps.solve.solveNet(net);
    if (!suggestion) throw new InputError(`net ${net}`, 'the check suggests no termination for it');
    await this.authoring().applySuggestion(net, suggestion);
    return this.getProject();
  }

  async undo(): Promise<ProjectSummary> {
    this.writable('undo');
    await this.authoring().undo();
    return this.getProject();
  }

  async redo(): Promise<ProjectSummary> {
    this.writable('redo');
    await this.authoring().redo();
    return this.getProject();
  }

  async getEditHistory(): Promise<EditHistory> {
    return this.authoring().editHistory();
  }

  async importIbis(fileName: string, text: string): Promise<IbisImportResult> {
    this.writable(`the IBIS import ${fileName}`);
    const importIbis = this.deps.project.importIbis;
    if (!importIbis) throw new InputError('project', 'this host opened the project without IBIS import');
    return importIbis(fileName, text);
  }

  async getPartIbisCurves(partName: string, cornerName: string): Promise<ModelCurves | null> {
    const data = await this.deps.project.load();
    const part = data.parts.find((p) => p.name === partName);
    if (!part) throw new InputError(`part ${partName}`, 'not in the project');
    const corner = data.corners.find((c) => c.name === cornerName);
    if (!corner) throw new InputError(`corner ${cornerName}`, 'not in the project');
    return partIbisCurves(part, data.ibisFiles, corner);
  }

  async sweepNet(net: string, request: SweepRequest): Promise<NetSweep> {
    return this.sweeper()(net, request, {});
  }

  async startSweep(net: string, request: SweepRequest): Promise<SolveJob> {
    const sweep = this.sweeper();
    // A request the core refuses (a bad range, an unknown element) fails this call, naming the field.
    planSweep(await this.deps.project.load(), net, request);
    return this.trackJob('starting the sweep', 'sweep cancelled', async (job, signal) => {
      const result = await sweep(net, request, {
        signal,
        onProgress: (done, total, message) => {
          if (job.state !== 'running') return;
          job.progress = total > 0 ? Math.min(1, done / total) : 0;
          job.message = message;
        },
      });
      if (job.state === 'running') this.sweeps.set(job.id, result);
      return `swept ${result.points.length} values`;
    });
  }

  async getSweepResult(jobId: string): Promise<NetSweep> {
    const entry = this.entry(jobId);
    const result = this.sweeps.get(jobId);
    if (!result) throw new InputError(`sweep job ${jobId}`, entry.job.state === 'running' ? 'is still running' : `has no result (${entry.job.state}: ${entry.job.message})`);
    return result;
  }

  private sweeper(): NonNullable<SolvePort['sweepNet']> {
    const sweep = this.deps.solve.sweepNet;
    if (!sweep) throw new InputError('sweep', 'this host opened the project without what-if sweeps');
    return sweep.bind(this.deps.solve);
  }

  async setWaiver(net: string, request: WaiverRequest): Promise<ProjectSummary> {
    this.writable(`the waiver of net ${net}`);
    if (!this.deps.project.setWaiver) throw new InputError('project', 'this host opened the project without authoring');
    // Refused before any solving, naming the field (docs/workbench.md, "Waivers").
    const where = `waiver of net ${net}`;
    if (request.comment.trim().length === 0) throw new InputError(`${where} comment`, 'is required: say why the net is accepted as it is');
    if (request.author.trim().length === 0) throw new InputError(`${where} author`, 'is required: say who accepts it');
    const data = await this.deps.project.load();
    if (!data.nets.some((n) => n.name === net)) throw new InputError(`net ${net}`, 'is not in the project');
    // What is waived is the net's result as it is now: the fresh board's row, else solved now (cached).
    const busName = data.nets.find((n) => n.name === net)?.bus ?? '';
    const solved = await this.solvedBus(busName);
    const result = (solved?.fresh ? solved.bus.nets.find((n) => n.net === net) : undefined) ?? await this.deps.solve.solveNet(net);
    const check = waivableCheck(result);
    if (!check) throw new InputError(`net ${net}`, 'passes every check: there is nothing to waive');
    await this.deps.project.setWaiver({ net, ...check, comment: request.comment, author: request.author, at: new Date().toISOString() });
    return this.getProject();
  }

  async removeWaiver(net: string): Promise<ProjectSummary> {
    this.writable(`removing the waiver of net ${net}`);
    if (!this.deps.project.removeWaiver) throw new InputError('project', 'this host opened the project without authoring');
    await this.deps.project.removeWaiver(net);
    return this.getProject();
  }

  async getPreviousSolve(): Promise<PreviousSolveSummary | null> {
    return (await this.deps.solve.previousSolve?.()) ?? null;
  }

  async getNetWaveforms(net: string): Promise<NetWaveforms> {
    return this.deps.solve.netWaveforms(net);
  }

  async exportReport(options: { formats: ('pdf' | 'html' | 'csv')[]; bus?: string }): Promise<{ files: string[] }> {
    const written = await this.deps.exportReport(options);
    for (const file of written.files) this.exported.add(resolve(file));
    this.latestExport = Object.freeze(written.files.map((file) => resolve(file)));
    return written;
  }

  /** The files the latest export of this session wrote, absolute (not an API method: hosts only). */
  latestExportedFiles(): readonly string[] {
    return this.latestExport;
  }

  async readExport(file: string): Promise<ExportedFile> {
    const path = resolve(file);
    // Only what this session's exports wrote: the method must not become a way to read any file.
    if (!this.exported.has(path)) throw new InputError(`report file ${basename(file)}`, 'is not one this session exported');
    const bytes = await readFile(path);
    return { name: basename(path), mime: EXPORT_MIME[extname(path).toLowerCase()] ?? 'application/octet-stream', base64: bytes.toString('base64') };
  }

  async createProject(request: NewProjectRequest): Promise<NewProjectResult> {
    return this.newProjectPort().create(request);
  }

  async getNewProjectTarget(): Promise<NewProjectTarget> {
    return this.newProjectPort().target();
  }

  private newProjectPort(): NewProjectPort {
    if (!this.deps.newProject) throw new InputError('new project', 'this host cannot create and open another project');
    return this.deps.newProject;
  }

  /** Cancels every running job (host shutdown). */
  async dispose(): Promise<void> {
    const running = [...this.jobs.values()].filter((entry) => entry.job.state === 'running');
    for (const entry of running) entry.controller.abort();
    await Promise.all(running.map((entry) => entry.done));
  }

  private entry(id: string): JobEntry {
    const entry = this.jobs.get(id);
    if (!entry) throw new InputError(`solve job ${id}`, 'no such job (it may have ended long ago)');
    return entry;
  }

  private forgetOldJobs(): void {
    const finished = [...this.jobs.entries()].filter(([, entry]) => entry.job.state !== 'running');
    for (const [id] of finished.slice(0, Math.max(0, finished.length - FINISHED_JOBS_KEPT))) {
      this.jobs.delete(id);
      this.sweeps.delete(id);
    }
  }
}

function countNets(board: BoardResult): number {
  return board.buses.reduce((sum, bus) => sum + bus.nets.length, 0);
}
