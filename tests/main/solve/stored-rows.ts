/** Test helper: rows of `sql` read from a project file opened read-only (the store's own handle untouched). */
import Database from 'better-sqlite3';

export function storedRows(path: string, sql: string): unknown[] {
  const db = new Database(path, { readonly: true });
  try {
    return db.prepare(sql).all();
  } finally {
    db.close();
  }
}
