import fs from 'node:fs';
import http from 'node:http';
import path from 'node:path';
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { pathToFileURL } from 'node:url';
import { dataFolderSecret, startStack, startSnapshotWorkerProcess } from '@/lib/dev/stack';
import { startThrowawayPostgres, type ThrowawayPostgres } from '@/lib/dev/pg-cluster';
import { DEMO_PASSWORD } from '@/lib/dev/seed/demo';

// `npm run demo:scale -- --instances N --workers M [--postgres]`: the scale-out layout on one machine. N app
// instances (`next start` on ports 3001..) over one database, M snapshot workers, the local fakes, and a small
// round-robin balancer on :3000 that polls each instance's /api/ready and sends traffic only to ready ones.
// For trying the layout; in production use a real load balancer.

interface Args {
  instances: number;
  workers: number;
  postgres: boolean;
}

function parseArgs(argv: string[]): Args {
  const a: Args = { instances: 2, workers: 2, postgres: false };
  for (let i = 0; i < argv.length; i++) {
    const f = argv[i]!;
    const count = () => {
      const v = Number(argv[++i]);
      if (!Number.isInteger(v) || v < 1 || v > 16) throw new Error(`${f} needs a whole number from 1 to 16 (got '${argv[i] ?? ''}').`);
      return v;
    };
    if (f === '--instances') a.instances = count();
    else if (f === '--workers') a.workers = count();
    else if (f === '--postgres') a.postgres = true;
    else throw new Error(`Unknown flag '${f}'. Flags: --instances N, --workers M, --postgres.`);
  }
  return a;
}

interface Backend {
  port: number;
  ready: boolean;
  child: ChildProcess | null;
}

function startBalancer(port: number, backends: Backend[]): http.Server {
  let next = 0;
  const server = http.createServer((req, res) => {
    const ready = backends.filter((b) => b.ready);
    if (!ready.length) {
      res.writeHead(503, { 'content-type': 'text/plain' }).end('No app instance is ready.\n');
      return;
    }
    const b = ready[next++ % ready.length]!;
    const headers = { ...req.headers, 'x-forwarded-for': req.socket.remoteAddress ?? '', 'x-request-id': (req.headers['x-request-id'] as string | undefined) ?? randomUUID() };
    const up = http.request({ host: '127.0.0.1', port: b.port, method: req.method, path: req.url, headers }, (r) => {
      res.writeHead(r.statusCode ?? 502, { ...r.headers, 'x-served-by': `instance:${b.port}` });
      r.pipe(res);
    });
    up.on('error', () => {
      b.ready = false;
      if (!res.headersSent) res.writeHead(502, { 'content-type': 'text/plain' }).end(`Instance on port ${b.port} did not answer.\n`);
      else res.destroy();
    });
    req.pipe(up);
  });
  server.listen(port, '127.0.0.1');
  // Health checks, as a load balancer would do them.
  const poll = async () => {
    for (const b of backends) {
      try {
        b.ready = (await fetch(`http://127.0.0.1:${b.port}/api/ready`, { signal: AbortSignal.timeout(2000) })).status === 200;
      } catch {
        b.ready = false;
      }
    }
  };
  const timer = setInterval(() => void poll(), 2000);
  server.on('close', () => clearInterval(timer));
  void poll();
  return server;
}

async function main(): Promise<void> {
  const args = parseArgs(process.argv.slice(2));
  const port = (name: string, fallback: number) => Number(process.env[name] ?? fallback);
  const lbPort = port('PORT', 3000);
  const publicUrl = `http://localhost:${lbPort}`;
  let pg: ThrowawayPostgres | null = null;
  if (args.postgres) pg = await startThrowawayPostgres({ port: port('DEMO_PG_PORT', 55_400) });
  const databaseUrl = pg?.url ?? process.env.DATABASE_URL ?? '';
  const dataDir = path.resolve(process.env.STOCHOS_DATA_DIR ?? '.data/scale');
  fs.mkdirSync(dataDir, { recursive: true });
  const shared = {
    APP_URL: publicUrl,
    NEXTAUTH_URL: publicUrl,
    // Every instance must sign and check with the same secrets.
    AUTH_SECRET: process.env.AUTH_SECRET ?? dataFolderSecret(dataDir),
    // The balancer on this machine is the one proxy whose X-Forwarded-For is believed.
    TRUSTED_PROXIES: '127.0.0.1, ::1',
    ...(databaseUrl ? { DATABASE_URL: databaseUrl } : {}),
  };
  // The first instance comes with the fakes, the migrated and seeded database, and the first worker.
  const first = await startStack({
    dataDir,
    appPort: lbPort + 1,
    smtpPort: port('DEMO_SMTP_PORT', 2525),
    mailboxPort: port('DEMO_MAILBOX_PORT', 2526),
    stripePort: port('DEMO_STRIPE_PORT', 12111),
    seed: true,
    quiet: true,
    extraEnv: shared,
  });
  const env: NodeJS.ProcessEnv = { ...process.env, ...first.env, NODE_ENV: 'production', NODE_OPTIONS: '' };
  const backends: Backend[] = [{ port: lbPort + 1, ready: false, child: null }];
  for (let i = 1; i < args.instances; i++) {
    const p = lbPort + 1 + i;
    const child = spawn(process.execPath, ['--import', pathToFileURL(path.resolve('lib/server/http/socket-peer.mjs')).href, path.resolve('node_modules/next/dist/bin/next'), 'start', '-H', '127.0.0.1', '-p', String(p)], { env, stdio: ['ignore', 'ignore', 'inherit'] });
    backends.push({ port: p, ready: false, child });
  }
  const workers = Array.from({ length: args.workers - 1 }, () => startSnapshotWorkerProcess(env, true));
  const lb = startBalancer(lbPort, backends);

  // Wait until every instance answers ready.
  const deadline = Date.now() + 90_000;
  while (backends.some((b) => !b.ready) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 500));
  console.log(
    [
      '',
      `  Stochos at scale on one machine: ${args.instances} app instance(s), ${args.workers} snapshot worker(s), ${databaseUrl.startsWith('postgres') ? 'PostgreSQL' : 'one SQLite file'}.`,
      '',
      `  Open            ${publicUrl}   (round-robin over the ready instances; X-Served-By names the one that answered)`,
      `  Sign in         owner@orrinvale.example and the other demo people, password ${DEMO_PASSWORD}`,
      ...backends.map((b, i) => `  instance ${i + 1}      http://127.0.0.1:${b.port}   ${b.ready ? 'ready' : 'NOT ready'}${b.child ? `   pid ${b.child.pid}` : `   pid ${first.appPid}`}`),
      `  Mailbox         ${publicUrl}/dev/mailbox`,
      '',
      '  Stop an instance with kill -TERM <pid>: the balancer stops sending to it. Press Ctrl+C to stop everything.',
      '',
    ].join('\n'),
  );
  const stop = async () => {
    lb.close();
    for (const c of [...backends.map((b) => b.child), ...workers]) c?.kill('SIGTERM');
    await first.stop();
    await pg?.stop();
    process.exit(0);
  };
  process.on('SIGINT', () => void stop());
  process.on('SIGTERM', () => void stop());
}

main().catch((err) => {
  console.error(err instanceof Error ? err.message : err);
  process.exit(1);
});
