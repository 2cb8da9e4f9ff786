/**
 * Schema history as plain SQL: migrations/NNN-verb-noun.sql, applied in order, each in one
 * transaction, recorded in the table `schema_migration` and in `PRAGMA user_version`. A shipped
 * migration is never edited; on users' files the schema only rolls forward.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import type Database from 'better-sqlite3';

/** `PRAGMA application_id` of every project file: "SlkL" as a big-endian 32-bit integer. */
export const APPLICATION_ID = 0x536c6b4c;

export interface Migration {
  version: number;
  /** File name, e.g. "001-create-project.sql". */
  name: string;
  sql: string;
  /** Tables this migration creates (parsed from its SQL). */
  creates: string[];
}

/**
 * Where the SQL files are: $SLACKLINE_MIGRATIONS_DIR, else the first `migrations/` folder holding
 * 001-*.sql found walking up from this module (the source tree, or a bundled build beside it), else
 * Electron's resources folder of a packaged app.
 */
function findMigrationsDir(): string {
  if (process.env.SLACKLINE_MIGRATIONS_DIR) return process.env.SLACKLINE_MIGRATIONS_DIR;
  const holds = (dir: string) => existsSync(dir) && readdirSync(dir).some((name) => name.startsWith('001-') && name.endsWith('.sql'));
  let dir = dirname(fileURLToPath(import.meta.url));
  for (let up = 0; up < 6; up += 1) {
    if (holds(join(dir, 'migrations'))) return join(dir, 'migrations');
    dir = dirname(dir);
  }
  const resources = (process as { resourcesPath?: string }).resourcesPath;
  if (resources && holds(join(resources, 'migrations'))) return join(resources, 'migrations');
  throw new Error('cannot find the migrations/ folder (set SLACKLINE_MIGRATIONS_DIR)');
}

/** The folder of numbered SQL migrations (normally the repository's migrations/). */
export const MIGRATIONS_DIR = findMigrationsDir();

const FILE_NAME = /^(\d{3})-[a-z0-9-]+\.sql$/;
const CREATE_TABLE = /CREATE\s+TABLE\s+(?:IF\s+NOT\s+EXISTS\s+)?["`]?(\w+)/gi;

const cache = new Map<string, Migration[]>();

/** Reads and checks the numbered migration files: versions must run 1, 2, 3... without gaps. */
export function loadMigrations(dir: string = MIGRATIONS_DIR): Migration[] {
  const cached = cache.get(dir);
  if (cached) return cached;
  const files = readdirSync(dir).filter((name) => name.endsWith('.sql')).sort();
  const migrations = files.map((name, index): Migration => {
    const match = FILE_NAME.exec(name);
    if (!match) throw new Error(`migration file "${name}" is not named NNN-verb-noun.sql`);
    const version = Number(match[1]);
    if (version !== index + 1) throw new Error(`migration "${name}" breaks the sequence: expected number ${index + 1}`);
    const sql = readFileSync(`${dir}/${name}`, 'utf8');
    const creates = [...sql.matchAll(CREATE_TABLE)].map((m) => m[1]);
    return { version, name, sql, creates };
  });
  cache.set(dir, migrations);
  return migrations;
}

/** The newest schema version this program knows. */
export function latestVersion(dir: string = MIGRATIONS_DIR): number {
  return loadMigrations(dir).length;
}

/** Tables a file at `version` must hold (bookkeeping table included). */
export function expectedTables(version: number, dir: string = MIGRATIONS_DIR): string[] {
  const tables = loadMigrations(dir)
    .filter((m) => m.version <= version)
    .flatMap((m) => m.creates);
  return version > 0 ? ['schema_migration', ...tables] : tables;
}

/**
 * Applies every migration newer than the file's version, up to `target` (default: the latest).
 * Each runs in its own transaction with its bookkeeping, so a failure leaves the file at the last
 * complete version. Returns the versions applied.
 */
export function migrate(db: Database.Database, target?: number, dir: string = MIGRATIONS_DIR): number[] {
  const migrations = loadMigrations(dir);
  const goal = target ?? migrations.length;
  const from = db.pragma('user_version', { simple: true }) as number;
  const applied: number[] = [];
  for (const migration of migrations) {
    if (migration.version <= from || migration.version > goal) continue;
    // BEGIN IMMEDIATE: a second process opening the same old file waits here, then sees the
    // version the first one reached and skips what is already applied (docs/reliability.md §1).
    const ran = db.transaction(() => {
      if ((db.pragma('user_version', { simple: true }) as number) >= migration.version) return false;
      if (migration.version === 1) {
        db.pragma(`application_id = ${APPLICATION_ID}`);
        db.exec(`CREATE TABLE schema_migration (
          version    INTEGER NOT NULL CONSTRAINT SchemaMigration_pk PRIMARY KEY,
          name       TEXT NOT NULL,
          applied_at TEXT NOT NULL)`);
      }
      db.exec(migration.sql);
      const broken = db.pragma('foreign_key_check') as unknown[];
      if (broken.length > 0) throw new Error(`migration ${migration.name} leaves ${broken.length} broken foreign keys`);
      db.prepare('INSERT INTO schema_migration (version, name, applied_at) VALUES (?, ?, ?)').run(
        migration.version,
        migration.name,
        new Date().toISOString(),
      );
      db.pragma(`user_version = ${migration.version}`);
      return true;
    }).immediate();
    if (ran) applied.push(migration.version);
  }
  return applied;
}
