import type { CliIo } from './command.js';

/** Writes "solving: 40 % (12/30 jobs)" lines to stderr, at most one per 10 % step. */
export function progressPrinter(io: CliIo): (done: number, total: number, message: string) => void {
  let lastStep = -1;
  return (done, total, message) => {
    const fraction = total > 0 ? done / total : 1;
    const step = Math.floor(fraction * 10);
    if (step === lastStep) return;
    lastStep = step;
    io.err(`solving: ${Math.round(fraction * 100)} % (${done}/${total} jobs)${message ? ` ${message}` : ''}`);
  };
}
