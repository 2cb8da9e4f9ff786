/**
 * Solve results, running solve jobs (progress, cancel) and per-net waveforms. Results the services
 * call stale come back as null and are never shown as fresh: the views say "solve again" instead.
 */
import { defineStore } from 'pinia';
import { computed, ref, shallowRef } from 'vue';
import type { SolveJob, NetWaveforms } from '../../../core/contract/api.js';
import type { BoardResult, BusResult, NetResult } from '../../../core/budget/results.js';
import { api, messageOf } from '../api/client.js';

/** Poll interval while a solve runs: fast enough for a smooth bar, slow enough not to load the host. */
const POLL_MS = 150;

export const useResultsStore = defineStore('results', () => {
  const board = shallowRef<BoardResult | null>(null);
  /** Nets re-solved one by one after an edit, newer than `board`. */
  const netUpdates = shallowRef<Map<string, NetResult>>(new Map());
  const job = ref<SolveJob | null>(null);
  const error = ref<string | null>(null);
  const waveforms = shallowRef<Map<string, NetWaveforms>>(new Map());
  const waveformError = ref<string | null>(null);
  /** True when results were shown and an edit made them stale (said in words, never shown as fresh). */
  const outdated = ref(false);
  let polling: ReturnType<typeof setTimeout> | null = null;

  const solving = computed(() => job.value?.state === 'running');

  function setBoard(next: BoardResult | null): void {
    if (next) outdated.value = false;
    else if (board.value) outdated.value = true;
    board.value = next;
  }

  async function loadResults(): Promise<void> {
    try {
      setBoard(await api().getResults());
      netUpdates.value = new Map();
      error.value = null;
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  function bus(name: string): BusResult | undefined {
    return board.value?.buses.find((b) => b.bus === name);
  }

  /** The newest result of a net: its own re-solve after an edit, else the board's. */
  function netResult(name: string): NetResult | undefined {
    const updated = netUpdates.value.get(name);
    if (updated) return updated;
    for (const b of board.value?.buses ?? []) {
      const found = b.nets.find((n) => n.net === name);
      if (found) return found;
    }
    return undefined;
  }

  async function startSolve(busName?: string): Promise<void> {
    if (solving.value) return;
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
    await loadResults();
    waveforms.value = new Map();
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
    const next = new Map(netUpdates.value);
    next.set(net, result);
    netUpdates.value = next;
    const cached = new Map(waveforms.value);
    cached.delete(net);
    waveforms.value = cached;
    try {
      const fresh = await api().getResults();
      if (fresh === null) setBoard(null);
      else if (fresh.fingerprint !== board.value?.fingerprint) setBoard(fresh);
    } catch {
      /* keep what is shown; the next solve refreshes it */
    }
    return result;
  }

  async function loadWaveforms(net: string): Promise<NetWaveforms | null> {
    const known = waveforms.value.get(net);
    if (known) return known;
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

  return {
    board, netUpdates, job, error, waveforms, waveformError, solving, outdated,
    loadResults, bus, netResult, startSolve, cancelSolve, resolveNet, loadWaveforms, exportReport,
  };
});
