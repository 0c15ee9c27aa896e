import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';

// Online backup of the SQLite database with SQLite's backup API (through better-sqlite3), safe while the app
// serves: the copy is a consistent snapshot as of one moment, holding a read lock only while the pages are copied
// (in WAL mode readers never block the app's writes). No 'server-only' here: the CLI and the tests use it.

export interface BackupResult {
  file: string;
  bytes: number;
  pages: number;
  ms: number;
  integrity: string;
  tables: Record<string, number>;
}

/**
 * Copies `source` to `dest` (which must not exist yet). All remaining pages are copied in one step by default, so
 * writes made by the app during the copy never make SQLite restart it; `pagesPerStep` trades that for shorter
 * read locks on very large files.
 */
export async function backupSqlite(source: string, dest: string, opts: { pagesPerStep?: number } = {}): Promise<BackupResult> {
  if (!fs.existsSync(source)) throw new Error(`No database file at ${source}.`);
  if (fs.existsSync(dest)) throw new Error(`${dest} already exists: choose a new file for the backup.`);
  fs.mkdirSync(path.dirname(path.resolve(dest)), { recursive: true });
  const started = performance.now();
  const src = new Database(source, { fileMustExist: true });
  try {
    src.pragma('busy_timeout = 5000');
    const step = opts.pagesPerStep ?? 0x7fffffff;
    const r = await src.backup(dest, { progress: () => step });
    const ms = Math.round(performance.now() - started);
    return { file: path.resolve(dest), bytes: fs.statSync(dest).size, pages: r.totalPages, ms, ...inspect(dest) };
  } finally {
    src.close();
  }
}

/** Opens a backup read-only: SQLite's own integrity check and the row count of every table. */
export function inspect(file: string): { integrity: string; tables: Record<string, number> } {
  const db = new Database(file, { readonly: true, fileMustExist: true });
  try {
    const integrity = (db.pragma('integrity_check', { simple: true }) as string) ?? 'unknown';
    const names = (db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[]).map((r) => r.name);
    const tables: Record<string, number> = {};
    for (const n of names) tables[n] = (db.prepare(`select count(*) as n from "${n.replace(/"/g, '""')}"`).get() as { n: number }).n;
    return { integrity, tables };
  } finally {
    db.close();
  }
}
