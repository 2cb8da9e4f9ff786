/**
 * The one way a margin report is made (docs/design.md §7): from a board result, with each drawn net's
 * waveforms from the solve service, or by solving first. The CLI's report and demo commands and the
 * API's exportReport all come here.
 */
import type { BoardResult } from '../../../core/budget/results.js';
import type { ProjectData } from '../../../core/project/model.js';
import type { NetWaveforms } from '../../../core/engine/waveforms.js';
import type { ReportFormat } from './export.js';
import type { PreviousMargins } from '../../../core/report/csv.js';

/** What the report service needs of the project and of the solver. */
export interface ReportSources {
  load(): ProjectData;
  solveBoard(options: { bus?: string; onProgress?: (done: number, total: number, message: string) => void }): Promise<BoardResult>;
  netWaveforms(net: string): Promise<NetWaveforms>;
  /** Optional: the latest stored whole-board solve's time, and the summary of the one before it. */
  latestSolveAt?(): string | null;
  previousSolve?(): PreviousMargins | null;
}

export interface WriteReportOptions {
  outDir: string;
  formats: readonly ReportFormat[];
  bus?: string;
}

export class ReportService {
  constructor(private readonly sources: ReportSources) {}

  /** Writes the report of `board` and returns the files written. */
  async write(board: BoardResult, options: WriteReportOptions): Promise<string[]> {
    // Loaded on first use: the writers pull in the PDF and chart libraries (about a second of module
    // loading), which every other command of the one composition root would otherwise pay at start-up.
    const { exportReport } = await import('./export.js');
    return exportReport(this.sources.load(), board, {
      outDir: options.outDir,
      formats: [...options.formats],
      bus: options.bus,
      waveforms: (net) => this.sources.netWaveforms(net.net),
      previous: this.previousOf(board),
    });
  }

  /**
   * The solve before `board` for "Δ vs previous solve": the stored summary, when `board` is the latest
   * stored whole-board solve (a one-bus solve is not stored, so it has no named predecessor).
   */
  private previousOf(board: BoardResult): PreviousMargins | null {
    if (!this.sources.previousSolve || this.sources.latestSolveAt?.() !== board.solvedAt) return null;
    return this.sources.previousSolve();
  }

  /** Solves the board (unchanged nets come from the cache), then writes its report. */
  async solveAndWrite(
    options: WriteReportOptions & { onProgress?: (done: number, total: number, message: string) => void },
  ): Promise<{ board: BoardResult; files: string[] }> {
    const board = await this.sources.solveBoard({ bus: options.bus, onProgress: options.onProgress });
    return { board, files: await this.write(board, options) };
  }
}
