import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

// A throwaway PostgreSQL cluster in a temporary folder on a loopback port, for `npm run bench:load -- --postgres`
// and `npm run demo:scale -- --postgres`.
// Debian's `postgresql` package is installed when its binaries are missing (as root). Run as the `postgres` user
// when started as root, since PostgreSQL refuses to run as root.

export interface ThrowawayPostgres {
  url: string;
  port: number;
  stop(): Promise<void>;
}

const BIN = process.env.PG_BIN ?? '/usr/lib/postgresql/15/bin';

function ensureInstalled(): void {
  if (fs.existsSync(path.join(BIN, 'pg_ctl'))) return;
  if (process.getuid?.() !== 0) throw new Error(`PostgreSQL binaries not found in ${BIN}: install Debian's 'postgresql' package (or set PG_BIN).`);
  execFileSync('apt-get', ['update', '-qq'], { stdio: 'inherit' });
  execFileSync('apt-get', ['install', '-y', '-qq', 'postgresql'], { stdio: 'inherit', env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
  if (!fs.existsSync(path.join(BIN, 'pg_ctl'))) throw new Error(`PostgreSQL was installed but ${BIN}/pg_ctl is still missing (set PG_BIN).`);
}

export async function startThrowawayPostgres(o: { port: number }): Promise<ThrowawayPostgres> {
  ensureInstalled();
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-pg-'));
  const asRoot = process.getuid?.() === 0;
  const run = (cmd: string, args: string[]) => {
    const quoted = [path.join(BIN, cmd), ...args].map((a) => `'${a.replace(/'/g, `'\\''`)}'`).join(' ');
    const r = asRoot ? spawnSync('su', ['postgres', '-s', '/bin/sh', '-c', quoted], { encoding: 'utf8' }) : spawnSync(path.join(BIN, cmd), args, { encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`${cmd} failed:\n${r.stdout}\n${r.stderr}`);
  };
  if (asRoot) execFileSync('chown', ['postgres', dir]);
  const data = path.join(dir, 'data');
  run('initdb', ['-D', data, '-A', 'trust', '-U', 'postgres', '--no-sync']);
  run('pg_ctl', ['-D', data, '-o', `-p ${o.port} -k ${dir} -c listen_addresses=127.0.0.1 -c fsync=off -c max_connections=200`, '-l', path.join(dir, 'log'), '-w', 'start']);
  return {
    port: o.port,
    url: `postgres://postgres@127.0.0.1:${o.port}/postgres`,
    async stop() {
      try {
        run('pg_ctl', ['-D', data, '-m', 'fast', '-w', 'stop']);
      } finally {
        fs.rmSync(dir, { recursive: true, force: true });
      }
    },
  };
}
