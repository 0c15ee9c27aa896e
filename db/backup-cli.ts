import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { backupSqlite } from '@/db/backup';

// npm run db:backup [-- --out FILE]
// SQLite (the default): an online copy with the backup API while the app keeps serving, then an integrity check.
// PostgreSQL (DATABASE_URL=postgres://...): pg_dump in its custom format, restorable with pg_restore.
function main(): Promise<void> | void {
  const args = process.argv.slice(2);
  const i = args.indexOf('--out');
  if (args.some((a, k) => a !== '--out' && k !== i + 1)) {
    console.error('Usage: npm run db:backup [-- --out FILE]');
    process.exitCode = 2;
    return;
  }
  const stamp = new Date().toISOString().replace(/[:.]/g, '-');
  const url = process.env.DATABASE_URL ?? '';
  if (/^postgres(ql)?:/.test(url)) {
    const out = path.resolve(i >= 0 ? args[i + 1]! : `.data/backups/stochos-${stamp}.pgdump`);
    fs.mkdirSync(path.dirname(out), { recursive: true });
    const r = spawnSync('pg_dump', ['--format=custom', `--file=${out}`, '--no-owner', url], { stdio: 'inherit' });
    if (r.error || r.status !== 0) throw new Error(`pg_dump failed${r.error ? `: ${r.error.message}` : ` with code ${r.status}`} (is the PostgreSQL client installed and on PATH?).`);
    console.log(`PostgreSQL backup written: ${out} (${fs.statSync(out).size} bytes). Restore with: pg_restore --clean --if-exists --no-owner -d "$DATABASE_URL" ${out}`);
    return;
  }
  const source = path.resolve(process.env.DATABASE_FILE ?? '.data/stochos.sqlite');
  const out = path.resolve(i >= 0 ? args[i + 1]! : path.join(path.dirname(source), 'backups', `stochos-${stamp}.sqlite`));
  return backupSqlite(source, out).then((r) => {
    if (r.integrity !== 'ok') throw new Error(`The backup at ${r.file} failed SQLite's integrity check: ${r.integrity}`);
    const rows = Object.values(r.tables).reduce((a, b) => a + b, 0);
    console.log(`SQLite backup written: ${r.file} (${r.bytes} bytes, ${r.pages} pages, ${Object.keys(r.tables).length} tables, ${rows} rows, ${r.ms} ms; integrity ok).`);
    console.log(`Restore: stop the app, then copy it over ${source} (and delete ${path.basename(source)}-wal and -shm beside it), then start the app.`);
  });
}

Promise.resolve()
  .then(main)
  .catch((err) => {
    console.error(err instanceof Error ? err.message : err);
    process.exitCode = 1;
  });
