/**
 * Node options for the services' worker threads (the solve pool, the import preview): the host's,
 * less those that only make sense for the host's own entry. A worker inherits process.execArgv, and a
 * host started as `node --input-type=module -e ...` (a script runner, the board bench) would otherwise
 * give every worker an option Node refuses for a file entry, so no worker ever starts and every job
 * runs on the host's thread.
 */
export function workerExecArgv(): string[] {
  return process.execArgv.filter((arg) => !arg.startsWith('--input-type'));
}
