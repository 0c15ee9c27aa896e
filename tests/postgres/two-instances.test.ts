// Two instances, one database: two production servers (`next start` on two ports) and two snapshot worker processes
// over one PostgreSQL database, as behind a load balancer. Whatever one instance changes, the other sees on its next
// call: nothing lives only in one process's memory. Runs under `npm run test:postgres` (needs `npm run build`).
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import { spawn, type ChildProcess } from 'node:child_process';
import type Database from 'better-sqlite3';
import { startAppProcess, startStack, stopChild, type Stack } from '@/lib/dev/stack';
import { createTestDatabase, testPgAdminUrl } from '../support/pg-databases';
import { openTestDb, firmIdOf } from '../support/db-direct';
import { Client } from '../support/http-client';
import { newFirm, PASSWORD } from '../support/firms';
import { listMessages } from '../support/mailbox';
import { insertEmbedWidget } from '../integration/api/matrix/embed.rows';

const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);
const HOST = 'http://localhost:4200';

let stack: Stack;
let appB: ChildProcess;
let workerB: ChildProcess;
let workerBLog = '';
let urlA = '';
let urlB = '';
let db: Database.Database;

beforeAll(async () => {
  const admin = testPgAdminUrl();
  if (!admin) throw new Error('Run through `npm run test:postgres`: STOCHOS_TEST_PG_URL names the PostgreSQL cluster.');
  if (!fs.existsSync('.next/BUILD_ID')) throw new Error('No production build: run `npm run build` first.');
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-two-'));
  const databaseUrl = await createTestDatabase(admin, 'two');
  fs.writeFileSync(path.join(dataDir, 'database-url'), databaseUrl);
  // Instance A with the local fakes and snapshot worker 1 …
  stack = await startStack({ dataDir, appPort: 3300 + OFF, smtpPort: 2725 + OFF, mailboxPort: 2726 + OFF, stripePort: 12311 + OFF, seed: false, quiet: true, databaseUrl,
    // Loopback stands for the load balancer, so each simulated viewer can have its own address in X-Forwarded-For;
    // every sign-up here comes from one address, so the per-client e-mail limit is lifted.
    extraEnv: { TRUSTED_PROXIES: '127.0.0.1, ::1', MAIL_LIMIT_PER_CLIENT_HOUR: '1000000' },
  });
  urlA = stack.appUrl;
  // … and instance B with snapshot worker 2, on the same database and the same secrets.
  const envB = { ...process.env, ...stack.env };
  appB = await startAppProcess(envB, 3301 + OFF, true);
  urlB = `http://localhost:${3301 + OFF}`;
  // Worker 2's log tells which jobs it sent, to show both workers shared the queue.
  workerB = spawn(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'lib/server/snapshots/worker-main.ts'], {
    env: { ...envB, NODE_OPTIONS: '' },
    stdio: ['ignore', 'pipe', 'inherit'],
  });
  workerB.stdout!.on('data', (d: Buffer) => (workerBLog += d.toString()));
  db = openTestDb(dataDir);
}, 240_000);

afterAll(async () => {
  db?.close();
  await Promise.allSettled([appB && stopChild(appB), workerB && stopChild(workerB)]);
  await stack?.stop();
});

const tokenOf = (snippet: string) => /data-stochos-token="([^"]+)"/.exec(snippet)![1]!;
const tag = () => randomUUID().slice(0, 8);

/** A client of the owner's firm (through instance A), a published widget and a pass for it. */
async function grant(owner: Client, firmId: string) {
  const c = await owner.json<{ client: { id: string } }>('POST', '/api/clients', { name: `Client ${tag()}`, allowedOrigins: [HOST], allowedEmailDomains: ['client.example'] });
  expect(c.status, JSON.stringify(c.body)).toBe(201);
  const widgetId = insertEmbedWidget(db, firmId, `Shaft float ${tag()}`);
  const p = await owner.json<{ pass: { id: string; snippet: string } }>('POST', '/api/passes', { clientId: c.body.client.id, widgetId });
  expect(p.status, JSON.stringify(p.body)).toBe(201);
  return { passId: p.body.pass.id, passToken: tokenOf(p.body.pass.snippet) };
}

async function exchange(base: string, passId: string, pass: string) {
  return new Client(base).json<{ token: string; error?: { message: string } }>('POST', '/api/embed/session', { passId, pass, origin: HOST });
}

const widgetCall = (base: string, passId: string, bearer: string) =>
  fetch(`${base}/api/embed/passes/${passId}/widget`, { headers: { authorization: `Bearer ${bearer}` } }).then((r) => r.status);

describe('two app instances over one PostgreSQL database', () => {
  it('refuses on one instance a pass revoked through the other, on its very next call', async () => {
    const { owner, email } = await newFirm(urlA, 'two-revoke', stack.mailboxUrl);
    const firmId = firmIdOf(db, email);
    const { passId, passToken } = await grant(owner, firmId);
    const s = await exchange(urlB, passId, passToken);
    expect(s.status).toBe(200);
    expect(await widgetCall(urlB, passId, s.body.token)).toBe(200);
    expect(await widgetCall(urlA, passId, s.body.token)).toBe(200);

    const r = await owner.json<{ pass: { status: string } }>('POST', `/api/passes/${passId}/revoke`);
    expect(r.body.pass.status).toBe('revoked');
    expect(await widgetCall(urlB, passId, s.body.token)).toBe(401);
    const again = await exchange(urlB, passId, passToken);
    expect(again.status).toBe(401);
    expect(again.body.error!.message).toMatch(/withdrawn/);
  });

  it('holds a sign-in limit reached through one instance on the other', async () => {
    const { email } = await newFirm(urlA, 'two-limit', stack.mailboxUrl);
    // Five failures, spread over both instances (the limit is five per account in 15 minutes).
    for (const base of [urlA, urlB, urlA, urlB, urlA]) expect((await new Client(base).signIn(email, 'wrong password!')).error).toBe('CredentialsSignin');
    for (const base of [urlB, urlA]) {
      const blocked = await new Client(base).signIn(email, PASSWORD);
      expect(blocked.ok).toBe(false);
      expect(decodeURIComponent(blocked.error ?? '')).toMatch(/Too many failed sign-ins for this account/);
    }
  });

  it('delivers each of 50 snapshot requests spread over both instances exactly once, with two workers', async () => {
    const { owner, email } = await newFirm(urlA, 'two-snap', stack.mailboxUrl);
    const firmId = firmIdOf(db, email);
    // Two passes (30 per pass per hour), five network addresses (10 each) and ten recipients (5 each) keep all 50
    // requests inside the snapshot limits.
    const viewers: { passId: string; bearer: string }[] = [];
    for (let i = 0; i < 2; i++) {
      const g = await grant(owner, firmId);
      const s = await exchange(i === 0 ? urlA : urlB, g.passId, g.passToken);
      expect(s.status).toBe(200);
      viewers.push({ passId: g.passId, bearer: s.body.token });
    }
    const run = tag();
    const requests = Array.from({ length: 50 }, (_, i) => ({
      base: i % 2 === 0 ? urlA : urlB,
      viewer: viewers[Math.floor(i / 2) % 2]!,
      ip: `198.51.100.${1 + (i % 5)}`,
      to: `reader-${run}-${i % 10}@client.example`,
    }));
    const answers = await Promise.all(
      requests.map(async (q) => {
        const res = await fetch(`${q.base}/api/embed/passes/${q.viewer.passId}/snapshots`, {
          method: 'POST',
          headers: { authorization: `Bearer ${q.viewer.bearer}`, 'content-type': 'application/json', 'x-forwarded-for': q.ip },
          body: JSON.stringify({ email: q.to, dialValues: {} }),
        });
        return { status: res.status, body: (await res.json()) as { id?: string; error?: { message: string } } };
      }),
    );
    for (const a of answers) expect(a.status, JSON.stringify(a.body)).toBe(202);
    const ids = answers.map((a) => a.body.id!);
    expect(new Set(ids).size).toBe(50);

    // Wait until both workers have worked the queue empty.
    const deadline = Date.now() + 240_000;
    let states: { state: string; n: number }[] = [];
    for (;;) {
      states = db.prepare('select state, count(*) as n from snapshot_jobs where firm_id = ? group by state order by state').all(firmId) as typeof states;
      if (states.length === 1 && states[0]!.state === 'sent') break;
      if (states.some((s) => s.state === 'failed') || Date.now() > deadline) break;
      await new Promise((r) => setTimeout(r, 500));
    }
    expect(states).toEqual([{ state: 'sent', n: 50 }]);

    // The SMTP fake's mailbox: one message per job, named by the job's Message-ID, and nothing else.
    const jobs = db.prepare('select id, recipient, message_id from snapshot_jobs where firm_id = ?').all(firmId) as { id: string; recipient: string; message_id: string }[];
    const received: string[] = [];
    for (let i = 0; i < 10; i++) {
      const to = `reader-${run}-${i}@client.example`;
      const msgs = (await listMessages(stack.mailboxUrl, to)) as { messageId?: string | null }[];
      received.push(...msgs.map((m) => m.messageId ?? 'no message id'));
    }
    expect(received).toHaveLength(50);
    expect([...received].sort()).toEqual(jobs.map((j) => j.message_id).sort());
    // Both workers took jobs: worker 2 sent some of them, not all (worker 1 runs beside instance A).
    const byB = jobs.filter((j) => workerBLog.includes(`job ${j.id} sent`)).length;
    expect(byB).toBeGreaterThan(0);
    expect(byB).toBeLessThan(50);
  });
});
