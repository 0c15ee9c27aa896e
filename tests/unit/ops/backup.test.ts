import { describe, it, expect } from 'vitest';
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { backupSqlite, inspect } from '@/db/backup';

// npm run db:backup copies the SQLite file online. Here another process commits rows as fast as it can while the
// backup runs; the restored copy must hold every row committed before the backup started, and be a consistent
// snapshot (rows 1..k with no gap: a transaction is in the copy whole or not at all).

const WRITER = `
const Database = require('better-sqlite3');
const db = new Database(process.argv[1]);
db.pragma('journal_mode = WAL'); db.pragma('busy_timeout = 5000'); db.pragma('synchronous = NORMAL');
const ins = db.prepare('insert into ledger (seq, note) values (?, ?)');
const two = db.transaction((n) => { ins.run(n, 'first of two'); ins.run(n + 1, 'second of two'); });
let n = 1;
const end = Date.now() + Number(process.argv[2]);
process.stdout.write('ready\\n');
(function loop() {
  for (let k = 0; k < 50 && Date.now() < end; k++) { two(n); n += 2; process.stdout.write('committed ' + (n - 1) + '\\n'); }
  if (Date.now() < end) setImmediate(loop); else { db.close(); process.exit(0); }
})();
`;

describe('online SQLite backup', () => {
  it('restores a copy taken under concurrent writes with every row committed before it started, and no torn transaction', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-backup-'));
    const file = path.join(dir, 'live.sqlite');
    const setup = new Database(file);
    setup.pragma('journal_mode = WAL');
    setup.exec('create table ledger (seq integer primary key, note text not null)');
    // Some bulk so the copy takes more than an instant.
    setup.exec("create table padding (id integer primary key, blob text); insert into padding (blob) select hex(randomblob(512)) from (with recursive c(x) as (select 1 union all select x + 1 from c where x < 20000) select x from c)");
    setup.close();

    // The writer stops by itself after 30 s at most; the test stops it once the copy is done.
    const writer = spawn(process.execPath, ['-e', WRITER, file, '30000'], { cwd: process.cwd(), stdio: ['ignore', 'pipe', 'inherit'] });
    let lastCommitted = 0;
    let buf = '';
    const ready = new Promise<void>((resolve) => {
      writer.stdout.on('data', (d: Buffer) => {
        buf += d.toString();
        const lines = buf.split('\n');
        buf = lines.pop()!;
        for (const l of lines) {
          if (l === 'ready') resolve();
          else if (l.startsWith('committed ')) lastCommitted = Number(l.slice(10));
        }
      });
    });
    const exited = new Promise<void>((r) => writer.on('exit', () => r()));
    await ready;
    await new Promise((r) => setTimeout(r, 500));
    const committedBefore = lastCommitted;
    expect(committedBefore).toBeGreaterThan(0);

    const out = path.join(dir, 'backups', 'copy.sqlite');
    const r = await backupSqlite(file, out);
    const committedAfterStart = lastCommitted;
    // The writer really was writing during and after the copy.
    await expect.poll(() => lastCommitted, { timeout: 10_000 }).toBeGreaterThan(committedAfterStart);
    writer.kill('SIGTERM');
    await exited;
    expect(r.integrity).toBe('ok');

    // Restore the way the README says: the copy becomes the database file.
    const restored = path.join(dir, 'restored.sqlite');
    fs.copyFileSync(out, restored);
    const db = new Database(restored, { readonly: true });
    const { n, lo, hi } = db.prepare('select count(*) as n, min(seq) as lo, max(seq) as hi from ledger').get() as { n: number; lo: number; hi: number };
    db.close();
    expect(lo).toBe(1);
    expect(n).toBe(hi); // no gap
    expect(hi % 2).toBe(0); // both rows of every transaction, never one
    expect(hi).toBeGreaterThanOrEqual(committedBefore);
    expect(inspect(restored).tables.padding).toBe(20_000);
    fs.rmSync(dir, { recursive: true, force: true });
  });

  it('npm run db:backup writes a checked copy of the configured database and refuses to overwrite a file', () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-backup-cli-'));
    const file = path.join(dir, 'app.sqlite');
    const db = new Database(file);
    db.pragma('journal_mode = WAL');
    db.exec("create table t (x integer); insert into t values (1), (2), (3)");
    db.close();
    const out = path.join(dir, 'b.sqlite');
    const run = () => spawnSync(process.execPath, [path.resolve('node_modules/tsx/dist/cli.mjs'), 'db/backup-cli.ts', '--out', out], { env: { ...process.env, DATABASE_FILE: file, DATABASE_URL: '', NODE_OPTIONS: '' }, encoding: 'utf8' });
    const first = run();
    expect(first.stderr).toBe('');
    expect(first.status).toBe(0);
    expect(first.stdout).toMatch(/SQLite backup written: .*b\.sqlite .*1 tables, 3 rows.*integrity ok/);
    expect(inspect(out).tables).toEqual({ t: 3 });
    const second = run();
    expect(second.status).toBe(1);
    expect(second.stderr).toMatch(/already exists/);
    fs.rmSync(dir, { recursive: true, force: true });
  });
});
