import { spawn, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import fs from 'node:fs';
import { randomBytes } from 'node:crypto';
import { startFakeSmtp } from '@/lib/fakes/smtp/server';
import { startFakeStripe } from '@/lib/fakes/stripe/server';
import { startHostPage } from '@/lib/dev/host-page';

/**
 * Starts everything the product needs on one machine: the local SMTP fake, the local Stripe fake,
 * a migrated (and optionally seeded) database and `next start`. Used by `npm run demo` and the tests.
 * The database is a SQLite file in `dataDir`, or the PostgreSQL database named by `databaseUrl`.
 */
export interface StackOptions {
  dataDir: string;
  appPort: number;
  smtpPort: number;
  mailboxPort: number;
  stripePort: number;
  hostPagePort?: number;
  seed: boolean;
  /** postgres://… to run on PostgreSQL instead of SQLite (an empty database gets migrated). */
  databaseUrl?: string;
  extraEnv?: Record<string, string>;
  quiet?: boolean;
  /** Extra Node.js flags for the `next start` process (e.g. --cpu-prof for a load benchmark). */
  nodeArgs?: string[];
}

export interface Stack {
  appUrl: string;
  /** The `next start` process (a load benchmark reads its CPU time). */
  appPid: number | undefined;
  /** The demo host page (an invented client portal on a second origin), when hostPagePort was given. */
  hostPageUrl: string | null;
  mailboxUrl: string;
  stripeUrl: string;
  env: Record<string, string>;
  seedMessage: string;
  stop(): Promise<void>;
}

const WEBHOOK_SECRET = 'whsec_stochos_local_fake_secret';

export async function startStack(o: StackOptions): Promise<Stack> {
  fs.mkdirSync(o.dataDir, { recursive: true });
  const appUrl = `http://localhost:${o.appPort}`;
  const env: Record<string, string> = {
    DATABASE_FILE: path.join(o.dataDir, 'stochos.sqlite'),
    // Always set, so a DATABASE_URL in the caller's environment never leaks into a SQLite stack.
    DATABASE_URL: o.databaseUrl ?? '',
    APP_URL: appUrl,
    NEXTAUTH_URL: appUrl,
    AUTH_SECRET: dataFolderSecret(o.dataDir),
    STOCHOS_DEMO: '1',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(o.smtpPort),
    FAKE_MAILBOX_URL: `http://127.0.0.1:${o.mailboxPort}`,
    FAKE_STRIPE_URL: `http://127.0.0.1:${o.stripePort}`,
    STRIPE_WEBHOOK_SECRET: WEBHOOK_SECRET,
    NEXT_TELEMETRY_DISABLED: '1',
    ...(o.hostPagePort ? { DEMO_HOST_PAGE_URL: `http://localhost:${o.hostPagePort}` } : {}),
    ...o.extraEnv,
  };
  Object.assign(process.env, env);

  // Migrations are TypeScript files that Knex loads with require(): run them under tsx in a child process.
  const seedMessage = await runCli([o.seed ? 'seed' : 'migrate'], { ...process.env, ...env });

  const smtp = await startFakeSmtp({ smtpPort: o.smtpPort, httpPort: o.mailboxPort, dir: path.join(o.dataDir, 'mailbox') });
  const stripe = await startFakeStripe({
    port: o.stripePort,
    stateFile: path.join(o.dataDir, 'fake-stripe.json'),
    webhookUrl: `${appUrl}/api/webhooks/stripe`,
    webhookSecret: WEBHOOK_SECRET,
    publicUrl: `http://localhost:${o.stripePort}`,
  });

  let next: ChildProcess;
  try {
    next = await startAppProcess({ ...process.env, ...env }, o.appPort, o.quiet, o.nodeArgs);
  } catch (err) {
    // Leave nothing behind holding the ports when start-up fails.
    await Promise.allSettled([smtp.close(), stripe.close()]);
    throw err;
  }
  const hostPage = o.hostPagePort ? await startHostPage({ port: o.hostPagePort, appUrl }) : null;
  // The snapshot worker starts with the app, as its own process (a restart or crash of one leaves the other running).
  const worker = startSnapshotWorkerProcess({ ...process.env, ...env }, o.quiet);

  return {
    appUrl,
    appPid: next.pid,
    hostPageUrl: hostPage?.url ?? null,
    mailboxUrl: `http://127.0.0.1:${o.mailboxPort}`,
    stripeUrl: `http://127.0.0.1:${o.stripePort}`,
    env,
    async stop() {
      const exited = next.exitCode !== null ? Promise.resolve() : new Promise<void>((r) => next.once('exit', () => r()));
      next.kill('SIGTERM');
      // Wait (briefly) until the port is free for the next run.
      await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
      await stopChild(worker);
      await Promise.allSettled([smtp.close(), stripe.close(), hostPage?.close()]);
    },
    seedMessage,
  };
}

/** The demo's own AUTH_SECRET: random, made once per data folder and kept there (readable by its owner only). */
export function dataFolderSecret(dataDir: string): string {
  const file = path.join(dataDir, 'auth-secret');
  try {
    const existing = fs.readFileSync(file, 'utf8').trim();
    if (existing.length >= 32) return existing;
  } catch {
    // first start of this data folder
  }
  const secret = randomBytes(32).toString('base64url');
  fs.writeFileSync(file, `${secret}\n`, { mode: 0o600 });
  return secret;
}

function runCli(args: string[], childEnv: NodeJS.ProcessEnv): Promise<string> {
  return new Promise((resolve, reject) => {
    const child = spawn(process.execPath, [path.resolve('node_modules/tsx/dist/cli.mjs'), '--conditions=react-server', args[0] === 'seed' ? 'lib/dev/seed/cli.ts' : 'db/cli.ts', ...(args[0] === 'seed' ? args.slice(1) : args)], {
      env: { ...childEnv, NODE_OPTIONS: '' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    child.stdout.on('data', (d) => (out += d));
    child.stderr.on('data', (d) => (out += d));
    child.on('exit', (code) => (code === 0 ? resolve(out.trim()) : reject(new Error(`${args[0] === 'seed' ? 'lib/dev/seed/cli.ts' : 'db/cli.ts'} ${args.join(' ')} failed:\n${out}`))));
  });
}

/**
 * One `next start` of the production build on `port`, answered once it serves. Several of them over one PostgreSQL
 * database are the scale-out setup (tests/postgres/two-instances.test.ts starts a second one this way).
 */
export async function startAppProcess(childEnv: NodeJS.ProcessEnv, port: number, quiet?: boolean, nodeArgs: string[] = []): Promise<ChildProcess> {
  // Loopback only: the demo's mailbox and fakes are for the person at this machine. The preload stamps each
  // request's socket address (lib/server/http/socket-peer.mjs), as `npm start` does.
  const child = spawn(process.execPath, [...nodeArgs, '--import', pathToFileURL(path.resolve('lib/server/http/socket-peer.mjs')).href, path.resolve('node_modules/next/dist/bin/next'), 'start', '-H', '127.0.0.1', '-p', String(port)], {
    env: { ...childEnv, NODE_ENV: 'production', NODE_OPTIONS: '' },
    stdio: quiet ? ['ignore', 'ignore', 'inherit'] : 'inherit',
  });
  try {
    await waitForHttp(`http://localhost:${port}/`, child);
  } catch (err) {
    child.kill('SIGTERM');
    throw err;
  }
  return child;
}

async function waitForHttp(url: string, child: ChildProcess, timeoutMs = 60_000): Promise<void> {
  const start = Date.now();
  while (Date.now() - start < timeoutMs) {
    if (child.exitCode !== null) throw new Error(`next start exited with code ${child.exitCode}. Did \`npm run build\` run?`);
    try {
      const res = await fetch(url, { redirect: 'manual' });
      if (res.status < 500) return;
    } catch {
      // not listening yet
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  throw new Error(`${url} did not answer within ${timeoutMs / 1000} s`);
}

/** The snapshot worker (lib/server/snapshots/worker-main.ts) as a child process; node loads TypeScript through tsx directly so a signal reaches it. */
export function startSnapshotWorkerProcess(childEnv: NodeJS.ProcessEnv, quiet?: boolean): ChildProcess {
  return spawn(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'lib/server/snapshots/worker-main.ts'], {
    env: { ...childEnv, NODE_OPTIONS: '' },
    stdio: quiet ? ['ignore', 'ignore', 'inherit'] : 'inherit',
  });
}

export async function stopChild(child: ChildProcess): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise<void>((r) => child.once('exit', () => r()));
  child.kill('SIGTERM');
  await Promise.race([exited, new Promise((r) => setTimeout(r, 5000))]);
}
