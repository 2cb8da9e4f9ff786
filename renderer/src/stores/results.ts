/**
 * Solve results, running solve jobs (progress, cancel) and per-net waveforms. Results the services
 * call stale are never shown as fresh: the latest solve's results stay on screen marked as outdated,
 * with the nets whose inputs changed and the edits made since, while a background solve (cheap: the
 * cache answers every unchanged net) brings fresh ones.
 */
import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type { SolveJob, NetWaveforms, OutdatedResults, PreviousSolveSummary } from '../../../core/contract/api.js';
import type { BoardResult, BusResult, NetResult } from '../../../core/budget/results.js';
import { api, hostCapabilities, messageOf, transportName } from '../api/client.js';
import { netWorstMargin } from '../../../core/report/columns.js';
import { useProjectStore } from './project.js';

/** Poll interval while a solve runs: fast enough for a smooth bar, slow enough not to load the host. */
const POLL_MS = 150;

export const useResultsStore = defineStore('results', () => {
  const board = shallowRef<BoardResult | null>(null);
  /** The latest solve's results while they are out of date (null when `board` is fresh or nothing was solved). */
  const stale = shallowRef<OutdatedResults | null>(null);
  /** Edits made in this session since the results on screen, in words ("stackup", "net DQ3 element 2"). */
  const changes = ref<string[]>([]);
  /** Nets re-solved one by one after an edit, newer than the board shown; `seq` orders them against board loads. */
  const netUpdates = shallowRef<Map<string, NetResult>>(new Map());
  const updateSeq = new Map<string, number>();
  let seq = 0;
  /** A background solve was asked for while one ran: start another when it ends (its inputs are newer). */
  let solveAgain = false;
  const job = ref<SolveJob | null>(null);
  const error = ref<string | null>(null);
  const waveforms = shallowRef<Map<string, NetWaveforms>>(new Map());
  const waveformError = ref<string | null>(null);
  /** True when results were shown and an edit made them stale (said in words, never shown as fresh). */
  const outdated = ref(false);
  let polling: ReturnType<typeof setTimeout> | null = null;

  const solving = computed(() => job.value?.state === 'running');

  /** The last fresh board this window showed (kept when an edit makes it outdated). */
  let lastFresh: BoardResult | null = null;

  function setBoard(next: BoardResult | null): void {
    if (board.value) lastFresh = board.value;
    if (next) outdated.value = false;
    else if (board.value) outdated.value = true;
    board.value = next;
  }

  /** The solve shown before the current fresh one (this session, or the outdated one after a reload): for "Δ vs previous". */
  const previous = shallowRef<BoardResult | null>(null);
  /**
   * The whole-board solve the services stored before the latest one (getPreviousSolve): what "Δ vs
   * previous" compares with, also after a reload; the solve shown before in this window only where
   * none is stored (docs/workbench.md, "Margin table").
   */
  const storedPrevious = shallowRef<PreviousSolveSummary | null>(null);

  async function loadResults(): Promise<void> {
    const asked = ++seq;
    const before = board.value ?? stale.value?.board ?? lastFresh;
    try {
      const fresh = await api().getResults();
      if (fresh && before && before.fingerprint !== fresh.fingerprint) previous.value = before;
      setBoard(fresh);
      stale.value = fresh ? null : await api().getOutdatedResults();
      // The stored previous solve is the one before the fresh board only when it is not that board itself,
      // and only where solves are stored: a read-only project keeps its new results in memory only.
      const stored = fresh && !useProjectStore().readOnly ? await api().getPreviousSolve() : null;
      storedPrevious.value = stored && fresh && stored.solvedAt !== fresh.solvedAt ? stored : null;
      if (fresh) {
        changes.value = [];
        // Only net results older than this answer are covered by it: a net re-solved while the
        // request was out (a deep link, an edit) keeps its own, newer result.
        const kept = new Map([...netUpdates.value].filter(([net]) => (updateSeq.get(net) ?? 0) > asked));
        for (const net of [...updateSeq.keys()]) if (!kept.has(net)) updateSeq.delete(net);
        netUpdates.value = kept;
      }
      error.value = null;
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** The results on screen: fresh ones, else the latest solve's (marked outdated by `isOutdated`). */
  const shown = computed<BoardResult | null>(() => board.value ?? stale.value?.board ?? null);
  const isOutdated = computed(() => !board.value && stale.value !== null);
  const changedNets = computed(() => new Set(stale.value?.changedNets ?? []));

  function previousNet(name: string): NetResult | undefined {
    for (const b of previous.value?.buses ?? []) {
      const found = b.nets.find((n) => n.net === name);
      if (found) return found;
    }
    return undefined;
  }

  /** When the solve "Δ vs previous" compares with ran (ISO), or null when there is none to compare with. */
  const previousAt = computed(() => storedPrevious.value?.solvedAt ?? previous.value?.solvedAt ?? null);

  /** A net's worst margin in that previous solve, s; null where it had no number or did not have the net. */
  function previousMargin(name: string): number | null {
    if (storedPrevious.value) return storedPrevious.value.margins[name] ?? null;
    const before = previousNet(name);
    return before ? netWorstMargin(before) : null;
  }

  function bus(name: string): BusResult | undefined {
    return shown.value?.buses.find((b) => b.bus === name);
  }

  /** True when the row of `net` on screen is from inputs that changed since (and not re-solved since). */
  function netOutdated(net: string): boolean {
    return isOutdated.value && changedNets.value.has(net) && !netUpdates.value.has(net);
  }

  /**
   * After any saved edit: says what changed, shows the latest results marked outdated, and solves
   * the board again in the background (unchanged nets come from the cache).
   */
  async function noteEdit(what: string, options: { net?: string } = {}): Promise<void> {
    if (!changes.value.includes(what)) changes.value = [...changes.value, what];
    // A net edit changes that net's waveforms only (its view reloads them); any other edit may change all.
    if (!options.net) waveforms.value = new Map();
    await loadResults();
    if (!board.value) await startSolve(undefined, true);
  }

  /** The newest result of a net: its own re-solve after an edit, else the board's. */
  function netResult(name: string): NetResult | undefined {
    const updated = netUpdates.value.get(name);
    if (updated) return updated;
    for (const b of shown.value?.buses ?? []) {
      const found = b.nets.find((n) => n.net === name);
      if (found) return found;
    }
    return undefined;
  }

  /** `background`: started by an edit, not the user; a solve already running is followed by another. */
  const background = ref(false);

  async function startSolve(busName?: string, inBackground = false): Promise<void> {
    if (solving.value) {
      if (inBackground) solveAgain = true;
      return;
    }
    background.value = inBackground;
    error.value = null;
    try {
      job.value = await api().startSolve(busName ? { bus: busName } : {});
      schedulePoll();
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  function schedulePoll(): void {
    if (polling) clearTimeout(polling);
    polling = setTimeout(() => void poll(), POLL_MS);
  }

  async function poll(): Promise<void> {
    polling = null;
    const asked = job.value;
    if (!asked) return;
    let reply: SolveJob;
    try {
      reply = await api().getJob(asked.id);
    } catch (e) {
      if (job.value !== asked) return;
      error.value = messageOf(e);
      job.value = null;
      return;
    }
    // While the request was out, a cancel or a new solve may have replaced the job: a late reply about
    // the old one must not overwrite it (the new job would then never be polled to its end).
    if (job.value !== asked) return;
    job.value = reply;
    if (job.value.state === 'running') return schedulePoll();
    if (job.value.state === 'failed') error.value = `The solve failed: ${job.value.message}`;
    // Waveforms depend on the inputs only, not on the solve: the ones loaded stay valid.
    await loadResults();
    if (solveAgain && job.value.state === 'done') {
      solveAgain = false;
      if (!board.value) await startSolve(undefined, true);
    }
  }

  async function cancelSolve(): Promise<void> {
    if (!job.value || job.value.state !== 'running') return;
    try {
      job.value = await api().cancelJob(job.value.id);
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** After an edit of `net`: fresh result for that net now, the board marked stale until re-solved. */
  async function resolveNet(net: string): Promise<NetResult> {
    const result = await api().solveNet(net);
    updateSeq.set(net, ++seq);
    const next = new Map(netUpdates.value);
    next.set(net, result);
    netUpdates.value = next;
    // Its waveforms are the caller's to reload (after an edit, in parallel with this solve).
    return result;
  }

  /** `fresh`: ask again even when known (after an edit of that net). */
  async function loadWaveforms(net: string, options: { fresh?: boolean } = {}): Promise<NetWaveforms | null> {
    const known = waveforms.value.get(net);
    if (known && !options.fresh) return known;
    try {
      const result = await api().getNetWaveforms(net);
      const next = new Map(waveforms.value);
      next.set(net, result);
      waveforms.value = next;
      waveformError.value = null;
      return result;
    } catch (e) {
      waveformError.value = messageOf(e);
      return null;
    }
  }

  async function exportReport(formats: ('pdf' | 'html' | 'csv')[], busName?: string): Promise<string[]> {
    const { files } = await api().exportReport(busName ? { formats, bus: busName } : { formats });
    return files;
  }

  /** In a plain browser (the loopback shell) report files are offered as downloads. */
  const inBrowser = transportName() === 'browser';

  /** The desktop app reveals a written report file in the system's file manager (the browser downloads instead). */
  const host = hostCapabilities();
  const canReveal = host !== null;
  async function revealExport(file: string): Promise<void> {
    if (!host) throw new Error('only the desktop app can show a file in its folder');
    await host.showInFolder(file);
  }

  /** A written report file as a download link's target (an object URL over its bytes). */
  async function exportDownload(file: string): Promise<{ name: string; url: string; bytes: number }> {
    const { name, mime, base64 } = await api().readExport(file);
    const binary = atob(base64);
    const bytes = new Uint8Array(binary.length);
    for (let i = 0; i < binary.length; i++) bytes[i] = binary.charCodeAt(i);
    return { name, url: URL.createObjectURL(new Blob([bytes], { type: mime })), bytes: bytes.length };
  }

  return {
    board, stale, shown, previous, previousNet, previousAt, previousMargin, storedPrevious, isOutdated, changes, netUpdates, job, error, waveforms, waveformError, solving, outdated, background,
    loadResults, bus, netResult, netOutdated, noteEdit, startSolve, cancelSolve, resolveNet, loadWaveforms, exportReport, exportDownload, inBrowser, canReveal, revealExport,
  };
});
