/**
 * Load benchmark of the embed path: `npm run bench:load` (after `npm run build`).
 *
 * Starts the production build (`next start`) with fresh demo data on loopback, signs in as the demo owner,
 * takes one of the demo passes and drives, one after the other at the same concurrency:
 *   - the app's static `/icon.svg` (the framework's floor on this machine: the reference for the ratios),
 *   - `GET /api/embed/passes/{id}/widget` (full read, 200 with the payload),
 *   - the same read revalidated with `If-None-Match` (304, no body),
 *   - `POST /api/embed/session` (the pass exchange).
 * On a small machine the load generator shares the CPU with the server, so the ratio to the icon, measured in
 * the same run, is the figure that holds from run to run.
 *
 * Database: SQLite in a temporary folder by default; `DATABASE_URL=postgres://...` runs the same benchmark on
 * that PostgreSQL database, and `--postgres` starts a throwaway PostgreSQL cluster for the run.
 *
 * Besides requests/s and latency, the server's own CPU time per answered request is read from /proc: it depends
 * little on what else the machine is doing, so it is the steadiest figure on a busy machine.
 *
 * Flags: --duration S (default 30), --connections N (default 200), --warmup S (default 3), --postgres,
 *        --only widget,revalidate,exchange (the icon always runs), --profile DIR (the server writes a V8 CPU
 *        profile there on exit; a summary is printed), --json.
 * The last line is always one JSON object with every figure.
 */
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import autocannon from 'autocannon';
import { startStack, type Stack } from '@/lib/dev/stack';
import { demoPass } from '../support/demo-pass';
import { startThrowawayPostgres, type ThrowawayPostgres } from '@/lib/dev/pg-cluster';
import { summariseCpuProfile } from './cpu-profile';

interface Args {
  duration: number;
  connections: number;
  warmup: number;
  postgres: boolean;
  profile: string | null;
  json: boolean;
  only: string[] | null;
}

function parseArgs(argv: string[]): Args {
  const a: Args = { duration: 30, connections: 200, warmup: 3, postgres: false, profile: null, json: false, only: null };
  for (let i = 0; i < argv.length; i++) {
    const f = argv[i]!;
    const num = (name: string) => {
      const v = Number(argv[++i]);
      if (!Number.isFinite(v) || v <= 0) throw new Error(`${name} needs a positive number (got '${argv[i] ?? ''}').`);
      return v;
    };
    if (f === '--duration') a.duration = num(f);
    else if (f === '--connections') a.connections = Math.round(num(f));
    else if (f === '--warmup') a.warmup = Number(argv[++i] ?? 'x');
    else if (f === '--postgres') a.postgres = true;
    else if (f === '--profile') a.profile = path.resolve(argv[++i] ?? '');
    else if (f === '--json') a.json = true;
    else if (f === '--only') a.only = (argv[++i] ?? '').split(',').filter(Boolean);
    else throw new Error(`Unknown flag '${f}'. Flags: --duration S, --connections N, --warmup S, --postgres, --only LIST, --profile DIR, --json.`);
  }
  if (!Number.isFinite(a.warmup) || a.warmup < 0) throw new Error('--warmup needs a number of seconds (0 for none).');
  return a;
}

interface Scenario {
  key: 'icon' | 'widget' | 'revalidate' | 'exchange';
  name: string;
  method: 'GET' | 'POST';
  path: string;
  headers?: Record<string, string>;
  body?: string;
  /** The status every answer should have; any other counts as an error in the table. */
  expect: number;
}

interface Figures {
  name: string;
  requestsPerSec: number;
  p50Ms: number;
  p99Ms: number;
  requests: number;
  errors: number;
  timeouts: number;
  unexpectedStatus: number;
  /** Server CPU time (user + system) per request sent, in microseconds; null where /proc is not there. */
  serverCpuUsPerRequest: number | null;
  ratioToIcon: number;
}

const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);

async function measure(url: string, s: Scenario, connections: number, duration: number): Promise<autocannon.Result> {
  return autocannon({
    url: url + s.path,
    method: s.method,
    headers: s.headers,
    body: s.body,
    connections,
    duration,
    timeout: 10,
  });
}

/** CPU ticks (user + system) of a process so far, from /proc/PID/stat (Linux; 100 ticks per second). */
function cpuTicks(pid: number | undefined): number | null {
  if (!pid) return null;
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    const fields = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return Number(fields[11]) + Number(fields[12]);
  } catch {
    return null;
  }
}

function figuresOf(s: Scenario, r: autocannon.Result, cpuTicksUsed: number | null): Omit<Figures, 'ratioToIcon'> {
  const stats = r.statusCodeStats ?? {};
  let expected = 0;
  let total = 0;
  for (const [code, v] of Object.entries(stats)) {
    total += v.count ?? 0;
    if (Number(code) === s.expect) expected += v.count ?? 0;
  }
  return {
    name: s.name,
    requestsPerSec: Math.round(r.requests.average),
    p50Ms: r.latency.p50,
    p99Ms: r.latency.p99,
    requests: total,
    errors: r.errors,
    timeouts: r.timeouts,
    unexpectedStatus: total - expected,
    // Per request sent: the server works on those the client gave up on (timeouts) too.
    serverCpuUsPerRequest: cpuTicksUsed !== null && Math.max(total, r.requests.sent) > 0 ? Math.round((cpuTicksUsed * 10_000) / Math.max(total, r.requests.sent)) : null,
  };
}

/** A build without PostgreSQL support would silently fall back to SQLite: check that the app's tables are there. */
async function assertAppUsesPostgres(url: string): Promise<void> {
  const { Client: PgClient } = await import('pg');
  const c = new PgClient({ connectionString: url });
  await c.connect();
  try {
    const r = await c.query("select count(*)::int as n from information_schema.tables where table_name = 'pass_events'");
    if (r.rows[0].n !== 1) throw new Error('DATABASE_URL points at PostgreSQL, but the app did not create its tables there: this build does not use DATABASE_URL.');
  } finally {
    await c.end();
  }
}

function table(rows: Figures[]): string {
  const head = ['scenario', 'req/s', 'p50 ms', 'p99 ms', 'requests', 'errors', 'timeouts', 'bad status', 'ratio to icon', 'server CPU µs/req'];
  const body = rows.map((f) => [
    f.name,
    String(f.requestsPerSec),
    String(f.p50Ms),
    String(f.p99Ms),
    String(f.requests),
    String(f.errors),
    String(f.timeouts),
    String(f.unexpectedStatus),
    f.ratioToIcon.toFixed(2),
    f.serverCpuUsPerRequest === null ? '-' : String(f.serverCpuUsPerRequest),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...body.map((b) => b[i]!.length)));
  const line = (cells: string[]) => '| ' + cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join(' | ') + ' |';
  return [line(head), '|' + widths.map((w, i) => (i === 0 ? '-' : '') + '-'.repeat(w + 1) + (i === 0 ? '' : ':')).join('|') + '|', ...body.map(line)].join('\n');
}

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  if (!fs.existsSync('.next/BUILD_ID')) throw new Error('No production build: run `npm run build` first.');
  const log = (s: string) => (args.json ? process.stderr : process.stdout).write(s + '\n');

  let pg: ThrowawayPostgres | null = null;
  let stack: Stack | null = null;
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-load-'));
  try {
    if (args.postgres) {
      pg = await startThrowawayPostgres({ port: 55_432 + OFF });
      log(`PostgreSQL: throwaway cluster on 127.0.0.1:${pg.port}`);
    }
    const databaseUrl = pg?.url ?? process.env.DATABASE_URL ?? '';
    const database = databaseUrl.startsWith('postgres') ? 'postgresql' : 'sqlite';
    if (args.profile) fs.mkdirSync(args.profile, { recursive: true });
    stack = await startStack({
      dataDir,
      appPort: 3300 + OFF,
      smtpPort: 2725 + OFF,
      mailboxPort: 2726 + OFF,
      stripePort: 12_311 + OFF,
      seed: true,
      quiet: true,
      // Logs at the production level (info, one line per API request); the stack sends them to /dev/null.
      extraEnv: { ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}), ...(process.env.LOG_LEVEL ? { LOG_LEVEL: process.env.LOG_LEVEL } : {}) },
      nodeArgs: args.profile ? ['--cpu-prof', `--cpu-prof-dir=${args.profile}`] : [],
    });
    if (database === 'postgresql') await assertAppUsesPostgres(databaseUrl);
    const { passId, token } = await demoPass(stack.appUrl);
    const ex = await fetch(`${stack.appUrl}/api/embed/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ passId, pass: token }) });
    if (ex.status !== 200) throw new Error(`The pass exchange answered ${ex.status}: ${await ex.text()}`);
    const bearer = ((await ex.json()) as { token: string }).token;
    const widgetPath = `/api/embed/passes/${passId}/widget`;
    const w = await fetch(stack.appUrl + widgetPath, { headers: { authorization: `Bearer ${bearer}` } });
    if (w.status !== 200) throw new Error(`The widget read answered ${w.status}: ${await w.text()}`);
    const etag = w.headers.get('etag');
    const payloadBytes = (await w.arrayBuffer()).byteLength;

    const scenarios: Scenario[] = [
      { key: 'icon', name: 'static /icon.svg', method: 'GET', path: '/icon.svg', expect: 200 },
      { key: 'widget', name: 'widget read (200)', method: 'GET', path: widgetPath, headers: { authorization: `Bearer ${bearer}` }, expect: 200 },
      ...(etag ? [{ key: 'revalidate' as const, name: 'widget revalidate (304)', method: 'GET' as const, path: widgetPath, headers: { authorization: `Bearer ${bearer}`, 'if-none-match': etag }, expect: 304 }] : []),
      { key: 'exchange', name: 'pass exchange', method: 'POST', path: '/api/embed/session', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ passId, pass: token }), expect: 200 },
    ];
    const chosen = scenarios.filter((s) => s.key === 'icon' || !args.only || args.only.includes(s.key));
    log(`Load: ${args.connections} connections, ${args.duration} s per scenario (after ${args.warmup} s warm-up), ${database}, ${os.cpus().length} cores; widget payload ${payloadBytes} bytes, ETag ${etag ?? 'none'}`);
    const rows: Omit<Figures, 'ratioToIcon'>[] = [];
    for (const s of chosen) {
      if (args.warmup > 0) await measure(stack.appUrl, s, Math.min(50, args.connections), args.warmup);
      const t0 = cpuTicks(stack.appPid);
      const r = await measure(stack.appUrl, s, args.connections, args.duration);
      const t1 = cpuTicks(stack.appPid);
      const f = figuresOf(s, r, t0 !== null && t1 !== null ? t1 - t0 : null);
      log(`  ${s.name}: ${f.requestsPerSec} req/s, p99 ${f.p99Ms} ms, server CPU ${f.serverCpuUsPerRequest ?? '-'} µs/request`);
      rows.push(f);
    }
    const icon = rows[0]!.requestsPerSec || 1;
    const figures: Figures[] = rows.map((r) => ({ ...r, ratioToIcon: Math.round((r.requestsPerSec / icon) * 100) / 100 }));
    log('');
    log(table(figures));
    await stack.stop();
    stack = null;
    let profile: ReturnType<typeof summariseCpuProfile> | null = null;
    if (args.profile) {
      const file = fs
        .readdirSync(args.profile)
        .filter((f) => f.endsWith('.cpuprofile'))
        .map((f) => path.join(args.profile!, f))
        .sort((a, b) => fs.statSync(b).mtimeMs - fs.statSync(a).mtimeMs)[0];
      if (file) {
        profile = summariseCpuProfile(file, 25);
        log(`\nCPU profile of the server: ${file}\nTop functions by self time:`);
        for (const p of profile.top) log(`  ${p.selfPct.toFixed(1).padStart(5)}%  ${p.name}  ${p.where}`);
      } else log(`\nNo CPU profile was written to ${args.profile}.`);
    }
    const widget = figures.find((f) => f.name.startsWith('widget read'));
    const exchange = figures.find((f) => f.name === 'pass exchange');
    const iconRow = figures[0]!;
    const targets = {
      widgetAtLeast07: widget ? widget.ratioToIcon >= 0.7 : null,
      exchangeAtLeast05: exchange ? exchange.ratioToIcon >= 0.5 : null,
      noMoreErrorsThanIcon: figures.every((f) => f.errors + f.timeouts <= iconRow.errors + iconRow.timeouts && f.unexpectedStatus === 0),
    };
    const said = (v: boolean | null) => (v === null ? 'not run' : v ? 'met' : 'NOT met');
    log(`\nTargets: widget ≥ 0.7× icon ${said(targets.widgetAtLeast07)}; exchange ≥ 0.5× icon ${said(targets.exchangeAtLeast05)}; no more errors or timeouts than the icon ${said(targets.noMoreErrorsThanIcon)}.`);
    console.log(JSON.stringify({ database, connections: args.connections, durationSeconds: args.duration, cores: os.cpus().length, payloadBytes, figures, targets, profileTop: profile?.top.slice(0, 10) ?? null }));
  } finally {
    await stack?.stop();
    await pg?.stop();
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
