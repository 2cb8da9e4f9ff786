/**
 * Node options for the services' worker threads (the solve pool, the import preview, the report's
 * chart drawing): the host's, less those a worker cannot take. A worker inherits process.execArgv,
 * and a host started as `node --input-type=module -e ...` (a script runner, the board bench) would
 * otherwise give every worker an option Node refuses for a file entry, so no worker ever starts and
 * every job runs on the host's thread.
 */
import { Worker, type WorkerOptions } from 'node:worker_threads';

export function workerExecArgv(): string[] {
  return process.execArgv.filter((arg) => !arg.startsWith('--input-type'));
}

/** The options left once Node has refused some for a worker (learnt at the first refusal). */
let accepted: string[] | null = null;

/**
 * Starts a worker thread with the host's Node options. Node refuses, for a worker, the V8 and
 * per-process options a host may be started with (`node --max-old-space-size=8192 bin/slackline.mjs`):
 * those named in its refusal are dropped and the worker is started again, with none at all if that is
 * refused too. Errors other than a refused option are thrown as they are.
 */
export function startWorker(entry: URL | string, options: Omit<WorkerOptions, 'execArgv'> = {}): Worker {
  let execArgv = accepted ?? workerExecArgv();
  for (;;) {
    try {
      const worker = new Worker(entry, { ...options, execArgv });
      if (execArgv.length < workerExecArgv().length) accepted = execArgv;
      return worker;
    } catch (error) {
      if ((error as { code?: string }).code !== 'ERR_WORKER_INVALID_EXEC_ARGV' || execArgv.length === 0) throw error;
      const refused = refusedOptions((error as Error).message);
      const kept = execArgv.filter((arg) => !refused.some((name) => arg === name || arg.startsWith(`${name}=`)));
      execArgv = kept.length > 0 && kept.length < execArgv.length ? kept : [];
    }
  }
}

/** The option names in Node's refusal, "Initiated Worker with invalid execArgv flags: --a=1, --b". */
function refusedOptions(message: string): string[] {
  const list = message.split('flags:')[1] ?? '';
  return list.split(',').map((s) => s.trim().split('=')[0]).filter((s) => s.startsWith('-'));
}
