/**
 * Solve results, running solve jobs (progress, cancel) and per-net waveforms. Results the services
 * call stale are never shown as fresh: the latest solve's results stay on screen marked as outdated,
 * with the nets whose inputs changed and the edits made since, while a background solve (cheap: the
 * cache answers every unchanged net) brings fresh ones.
 */
import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import { BUS_PAGE_MAX, type SolveJob, type NetWaveforms, type PreviousSolveSummary, type BoardSummary, type BusSummary } from '../../../core/contract/api.js';
import type { BusResult, NetResult } from '../../../core/budget/results.js';
import { api, hostCapabilities, messageOf, transportName } from '../api/client.js';
import { netWorstMargin } from '../../../core/report/columns.js';
import { useProjectStore } from './project.js';

/** Poll interval while a solve runs: fast enough for a smooth bar, slow enough not to load the host. */
const POLL_MS = 150;

/** A bus loaded for a view: its result with every net, the solve it is from, and its nets whose inputs changed since. */
interface LoadedBus {
  result: BusResult;
  fingerprint: string;
  changed: Set<string>;
}

export const useResultsStore = defineStore('results', () => {
  /**
   * The latest whole-board solve bus by bus (getBoardSummary; docs/workbench.md, "Board scale"): the
   * overview and the sidebar need nothing more. Net results come per bus (getBusResults) when a bus or
   * net view asks for them, so a board of thousands of nets never travels in one message.
   */
  const summary = shallowRef<BoardSummary | null>(null);
  /** The latest solve when it is fresh, else null. */
  const board = computed<BoardSummary | null>(() => (summary.value?.fresh ? summary.value : null));
  /** The latest solve while it is out of date (null when `board` is fresh or nothing was solved). */
  const stale = computed<BoardSummary | null>(() => (summary.value && !summary.value.fresh ? summary.value : null));
  /** Buses loaded for a bus or net view: all of the bus's nets, from the solve of `fingerprint`. */
  const buses = shallowRef<Map<string, LoadedBus>>(new Map());
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

  /**
   * The solve shown before the current fresh one in this window, bus by bus as far as its buses were
   * loaded: for "Δ vs previous" where no previous solve is stored (a read-only project).
   */
  const previous = shallowRef<{ solvedAt: string; buses: Map<string, BusResult> } | null>(null);
  /**
   * The whole-board solve the services stored before the latest one (getPreviousSolve): what "Δ vs
   * previous" compares with, also after a reload; the solve shown before in this window only where
   * none is stored (docs/workbench.md, "Margin table").
   */
  const storedPrevious = shallowRef<PreviousSolveSummary | null>(null);

  async function loadResults(): Promise<void> {
    const asked = ++seq;
    const before = summary.value;
    try {
      const next = await api().getBoardSummary();
      const fresh = next?.fresh ? next : null;
      if (fresh && before && before.fingerprint !== fresh.fingerprint) {
        previous.value = { solvedAt: before.solvedAt, buses: new Map([...buses.value].map(([name, loaded]) => [name, loaded.result])) };
      }
      if (fresh) outdated.value = false;
      else if (before?.fresh) outdated.value = true;
      summary.value = next;
      // The stored previous solve is the one before the fresh board only when it is not that board itself,
      // and only where solves are stored: a read-only project keeps its new results in memory only.
      const stored = fresh && !useProjectStore().readOnly ? await api().getPreviousSolve() : null;
      storedPrevious.value = stored && fresh && stored.solvedAt !== fresh.solvedAt ? stored : null;
      // Buses a view loaded are loaded again from this solve (the others wait until a view asks); the
      // loaded ones stay on screen until their new pages are in, so an edit never blanks a bus.
      const known = new Set(next?.buses.map((b) => b.bus) ?? []);
      buses.value = new Map([...buses.value].filter(([name]) => known.has(name)));
      await Promise.all([...buses.value.keys()].map((name) => loadBus(name, true)));
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

  /**
   * Loads every net of a bus from the latest solve (pages of BUS_PAGE_MAX nets) unless it is loaded
   * already; the bus and net views call it. Resolves when loaded (or when there is nothing to load).
   */
  async function loadBus(name: string, reload = false): Promise<void> {
    const current = summary.value;
    if (!current || !current.buses.some((b) => b.bus === name)) return;
    if (!reload && buses.value.get(name)?.fingerprint === current.fingerprint) return;
    try {
      const first = await api().getBusResults(name, { offset: 0, limit: BUS_PAGE_MAX });
      if (!first) return;
      const nets = [...first.bus.nets];
      const changed = new Set(first.changedNets);
      while (nets.length < first.total) {
        const page = await api().getBusResults(name, { offset: nets.length, limit: BUS_PAGE_MAX });
        if (!page || page.bus.nets.length === 0) break;
        nets.push(...page.bus.nets);
        for (const n of page.changedNets) changed.add(n);
      }
      // A newer summary arrived while the pages were out: its own load replaces this one.
      if (summary.value?.fingerprint !== first.fingerprint) return;
      const next = new Map(buses.value);
      next.set(name, { result: { ...first.bus, nets }, fingerprint: first.fingerprint, changed });
      buses.value = next;
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** The results on screen: fresh ones, else the latest solve's (marked outdated by `isOutdated`). */
  const shown = computed<BoardSummary | null>(() => summary.value);
  const isOutdated = computed(() => summary.value !== null && !summary.value.fresh);
  const changedNets = computed(() => new Set([...buses.value.values()].flatMap((b) => [...b.changed])));

  function previousNet(name: string): NetResult | undefined {
    for (const b of previous.value?.buses.values() ?? []) {
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

  /** A bus's results with all its nets, once a view loaded it (loadBus); undefined before. */
  function bus(name: string): BusResult | undefined {
    return buses.value.get(name)?.result;
  }

  /** A bus of the latest solve in a few numbers (the overview, the sidebar). */
  function busSummary(name: string): BusSummary | undefined {
    return summary.value?.buses.find((b) => b.bus === name);
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

  /** The newest result of a net: its own re-solve after an edit, else its loaded bus's. */
  function netResult(name: string): NetResult | undefined {
    const updated = netUpdates.value.get(name);
    if (updated) return updated;
    for (const b of buses.value.values()) {
      const found = b.result.nets.find((n) => n.net === name);
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
    summary, loadBus, busSummary,
    loadResults, bus, netResult, netOutdated, noteEdit, startSolve, cancelSolve, resolveNet, loadWaveforms, exportReport, exportDownload, inBrowser, canReveal, revealExport,
  };
});
