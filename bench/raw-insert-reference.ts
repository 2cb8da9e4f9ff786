/**
 * Reference for the import benchmark: the plainest way to write the same rows with this driver and
 * the project's settings (WAL, synchronous=FULL) — one prepared INSERT per row in one transaction
 * into a bare table. An import cannot be faster than this; the benchmark reports the ratio.
 */
import Database from 'better-sqlite3';

export interface ReferenceRow {
  net: string;
  layer: string;
  length: number;
  width: number | null;
}

/** Writes `rows` into a new file at `path`; returns the milliseconds spent in the transaction. */
export function rawInsertReference(path: string, rows: readonly ReferenceRow[]): number {
  const db = new Database(path);
  try {
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = FULL');
    db.exec('CREATE TABLE routed_length (net TEXT NOT NULL, layer TEXT NOT NULL, length REAL NOT NULL, width REAL)');
    const insert = db.prepare('INSERT INTO routed_length (net, layer, length, width) VALUES (?, ?, ?, ?)');
    const start = performance.now();
    db.transaction(() => {
      for (const r of rows) insert.run(r.net, r.layer, r.length, r.width);
    })();
    return performance.now() - start;
  } finally {
    db.close();
  }
}
