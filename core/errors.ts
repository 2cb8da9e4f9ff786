/**
 * An error caused by the user's input (a file, a field, a number out of range).
 * `where` names the place in words ("segment 3 of net DQ5", "lengths.csv line 12 column length"),
 * so every host can show it as is. Core names fields, never a host's flags or inputs; a host that
 * has its own name for a field (the CLI's "--bus") maps `where` to it. Hosts map it to exit status 2 (CLI) or HTTP 400.
 */
export class InputError extends Error {
  readonly where: string;
  readonly reason: string;
  constructor(where: string, reason: string) {
    super(`${where}: ${reason}`);
    this.name = 'InputError';
    this.where = where;
    this.reason = reason;
  }
}

/** Throws an InputError unless `ok`. Keeps validation code flat. */
export function require_(ok: boolean, where: string, reason: string): asserts ok {
  if (!ok) throw new InputError(where, reason);
}
