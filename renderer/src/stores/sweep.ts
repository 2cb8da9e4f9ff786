/**
 * What-if sweeps of the net view (docs/workbench.md, "What-if sweep"): starts a sweep job, polls its
 * progress and fetches its answer. One sweep at a time; a new one (or Cancel) replaces the running one.
 */
import { defineStore } from 'pinia';
import { ref, shallowRef } from 'vue';
import type { NetSweep, SolveJob, SweepRequest } from '../../../core/contract/api.js';
import { api, messageOf } from '../api/client.js';

const POLL_MS = 150;

export const useSweepStore = defineStore('sweep', () => {
  const job = ref<SolveJob | null>(null);
  /** The latest answer, kept out of deep reactivity (it goes whole into a chart). */
  const result = shallowRef<NetSweep | null>(null);
  const error = ref<string | null>(null);
  /** Where the services placed a refused request ("sweep stop"), for the field to show it. */
  const errorWhere = ref<string | null>(null);
  let timer: ReturnType<typeof setTimeout> | null = null;

  async function start(net: string, request: SweepRequest): Promise<void> {
    if (timer) clearTimeout(timer);
    error.value = null;
    errorWhere.value = null;
    try {
      job.value = await api().startSweep(net, request);
      timer = setTimeout(() => void poll(), POLL_MS);
    } catch (e) {
      job.value = null;
      error.value = messageOf(e);
      errorWhere.value = (e as { where?: string | null }).where ?? null;
    }
  }

  async function poll(): Promise<void> {
    timer = null;
    const asked = job.value;
    if (!asked) return;
    try {
      const reply = await api().getJob(asked.id);
      if (job.value?.id !== asked.id) return; // replaced while the request was out
      job.value = reply;
      if (reply.state === 'running') {
        timer = setTimeout(() => void poll(), POLL_MS);
        return;
      }
      if (reply.state === 'done') result.value = await api().getSweepResult(reply.id);
      else if (reply.state === 'failed') error.value = `The sweep failed: ${reply.message}`;
    } catch (e) {
      if (job.value?.id === asked.id) error.value = messageOf(e);
    }
  }

  async function cancel(): Promise<void> {
    const running = job.value;
    if (!running || running.state !== 'running') return;
    try {
      job.value = await api().cancelJob(running.id);
    } catch (e) {
      error.value = messageOf(e);
    }
  }

  /** Forgets the answer (another net opened, or the inputs changed). */
  function clear(): void {
    result.value = null;
    error.value = null;
    errorWhere.value = null;
  }

  return { job, result, error, errorWhere, start, poll, cancel, clear };
});
