// The snapshot queue end to end inside one process (and, for the restart, a separate worker process): request,
// render, send through the local SMTP fake, outage and restart. Fresh database and fake per file.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { spawn } from 'node:child_process';
import { PDFParse } from 'pdf-parse';
import { useFreshDb } from '../../support/test-db';
import { getDb } from '@/db/knex';
import { resetEnvCache } from '@/lib/server/env';
import { startFakeSmtp, type FakeSmtpHandle } from '@/lib/fakes/smtp/server';
import { runModelSync } from '@/lib/core/engine';
import { headlineFigure } from '@/lib/core/results/headline';
import { getSnapshotJob } from '@/db/snapshots';
import { requestSnapshot } from '@/lib/server/snapshots/request';
import { resetMailTransport } from '@/lib/server/mail/send';
import { startSnapshotWorker, UNCERTAIN_MESSAGE } from '@/lib/server/snapshots/worker';
import { seedWidget, STACK_MODEL, viewerFor } from './fixture';

const freePort = () =>
  new Promise<number>((resolve) => {
    const s = net.createServer();
    s.listen(0, '127.0.0.1', () => {
      const p = (s.address() as net.AddressInfo).port;
      s.close(() => resolve(p));
    });
  });

let smtpPort = 0;
let smtp: FakeSmtpHandle | null = null;
let mailDir = '';
let dbFile = '';
const quiet = () => undefined;

async function startSmtp() {
  smtp = await startFakeSmtp({ smtpPort, httpPort: 0, dir: mailDir, log: false });
}

beforeAll(async () => {
  smtpPort = await freePort();
  mailDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-snap-mail-'));
  process.env.SMTP_PORT = String(smtpPort);
  process.env.SMTP_HOST = '127.0.0.1';
  process.env.APP_URL = 'http://localhost:3999';
  process.env.NEXTAUTH_URL = 'http://localhost:3999';
  dbFile = await useFreshDb();
  resetEnvCache();
  resetMailTransport();
});

afterAll(async () => {
  await smtp?.close();
});

beforeEach(async () => {
  await smtp?.close();
  smtp = null;
  fs.rmSync(mailDir, { recursive: true, force: true });
  fs.mkdirSync(mailDir, { recursive: true });
});

async function attachmentText(msgId: string): Promise<string> {
  const bytes = Buffer.from(await (await fetch(`${smtp!.httpUrl}/messages/${msgId}/attachments/0`)).arrayBuffer());
  const parser = new PDFParse({ data: bytes });
  return norm((await parser.getText()).text);
}

/** The PDF's text layer gives a plain space where the figures use no-break spaces. */
const norm = (s: string) => s.replace(/[\u00a0\u202f]/g, ' ');

const dials = { spacer_length: 24.2, float_max: 0.45 };

describe('snapshot delivery', () => {
  it('renders the same numbers as the browser engine and sends one message with the PDF', async () => {
    await startSmtp();
    const s = await seedWidget();
    const v = await viewerFor(s);
    const accepted = await requestSnapshot(v, { email: 'Reviewer@Client.example', dialValues: dials }, 'requester-a');
    expect(accepted).toMatchObject({ state: 'queued', recipient: 'reviewer@client.example' });
    const worker = startSnapshotWorker({ pollMs: 60_000, log: quiet });
    await worker.stop(); // no background loop: drive it by hand
    expect(await worker.runOnce()).toBe(true);
    const job = (await getSnapshotJob(accepted.id))!;
    expect(job.state).toBe('sent');
    expect(job.attempts).toBe(1);
    expect(job.pdfBytes).toBeGreaterThan(10_000);

    const msgs = smtp!.messages();
    expect(msgs).toHaveLength(1);
    expect(msgs[0]!.messageId).toBe(job.messageId);
    expect(msgs[0]!.attachments[0]).toMatchObject({ contentType: 'application/pdf' });
    // The browser's worker runs the same engine with the same options: its headline is this text.
    const screen = headlineFigure(runModelSync(STACK_MODEL, { dialValues: { ...dials }, samples: 'none' }), 'mean');
    expect(norm(msgs[0]!.subject)).toContain(norm(screen.value));
    const text = await attachmentText(msgs[0]!.id);
    expect(text).toContain(norm(screen.value));
    expect(text).toContain(norm(screen.sub!));
    expect(text).toContain('24.20 mm');
    expect(text).toContain('0.45 mm');
    expect(text).toContain('Harbour Pumps Ltd');
    expect(text).toMatch(/Version 2 · checked and signed off/);
    expect(text).toContain('Hyndman & Fan (1996)');
    expect(text).toContain('ASME Y14.5');
    expect(await worker.runOnce()).toBe(false);
  });

  it('a pinned view goes into the same PDF beside the current one, each figure re-run with the same seed', async () => {
    await startSmtp();
    const s = await seedWidget();
    const pinnedDials = { spacer_length: 24.08, float_max: 0.5 };
    const accepted = await requestSnapshot(await viewerFor(s), { email: 'two-views@client.example', dialValues: dials, pinnedDialValues: pinnedDials }, 'requester-pin');
    expect((await getSnapshotJob(accepted.id))!.pinnedDialValues).toMatchObject(pinnedDials);
    const worker = startSnapshotWorker({ pollMs: 60_000, log: quiet });
    await worker.stop();
    expect(await worker.runOnce()).toBe(true);
    const msg = smtp!.messages().find((m) => m.to.includes('two-views@client.example'))!;
    expect(msg.text).toContain('both views side by side');
    const text = await attachmentText(msg.id);
    // What the browser shows for each view: the same engine, options and seed.
    const current = runModelSync(STACK_MODEL, { dialValues: { ...dials }, samples: 'none' });
    const pinned = runModelSync(STACK_MODEL, { dialValues: { ...pinnedDials }, samples: 'none' });
    const { compareFigures } = await import('@/lib/core/results/compare');
    const rows = compareFigures(pinned, current, 'mean');
    expect(text).toContain('Two views side by side');
    for (const r of rows) {
      expect(text).toContain(norm(r.pinned));
      expect(text).toContain(norm(r.current));
      if (r.difference !== '—') expect(text).toContain(norm(r.difference));
    }
    expect(text).toContain('24.08 mm');
    expect(text).toContain('24.20 mm');
    expect(text).toContain('Pinned view (dashed line)');
    expect(text).toContain('Current view (solid line)');
  });

  it('refuses a pinned view with a dial outside its range, naming the field', async () => {
    const s = await seedWidget();
    await expect(requestSnapshot(await viewerFor(s), { email: 'x@client.example', dialValues: dials, pinnedDialValues: { spacer_length: 999 } }, 'requester-bad-pin')).rejects.toMatchObject({
      fields: { 'pinnedDialValues.spacer_length': [expect.stringMatching(/outside the dial's range/)] },
    });
  });

  it('retries with backoff while the mail server is down and delivers once when it is back', async () => {
    const s = await seedWidget();
    const accepted = await requestSnapshot(await viewerFor(s), { email: 'outage@client.example', dialValues: dials }, 'requester-b');
    const worker = startSnapshotWorker({ pollMs: 60_000, retryBaseMs: 300, log: quiet });
    await worker.stop();
    expect(await worker.runOnce()).toBe(true);
    let job = (await getSnapshotJob(accepted.id))!;
    expect(job.state).toBe('queued');
    expect(job.attempts).toBe(1);
    expect(job.lastError).toMatch(/Mail server/);
    expect(Date.parse(job.nextAttemptAt)).toBeGreaterThan(Date.now() - 50);
    // Not due yet: nothing to take.
    expect(await worker.runOnce()).toBe(false);
    await startSmtp();
    await new Promise((r) => setTimeout(r, 350));
    expect(await worker.runOnce()).toBe(true);
    job = (await getSnapshotJob(accepted.id))!;
    expect(job.state).toBe('sent');
    expect(job.attempts).toBe(2);
    expect(smtp!.messages().filter((m) => m.to.includes('outage@client.example'))).toHaveLength(1);
    expect(await worker.runOnce()).toBe(false);
  });

  it('a job found in sending after its worker stopped is settled as uncertain and not sent again', async () => {
    await startSmtp();
    const s = await seedWidget();
    const accepted = await requestSnapshot(await viewerFor(s), { email: 'ambiguous@client.example', dialValues: {} }, 'requester-c');
    await getDb()('snapshot_jobs').where({ id: accepted.id }).update({ state: 'sending', attempts: 1, locked_by: 'gone', locked_until: new Date(Date.now() - 1000).toISOString() });
    const worker = startSnapshotWorker({ pollMs: 60_000, log: quiet });
    await worker.stop();
    expect(await worker.runOnce()).toBe(true);
    const job = (await getSnapshotJob(accepted.id))!;
    expect(job.state).toBe('failed');
    expect(job.lastError).toBe(UNCERTAIN_MESSAGE);
    expect(smtp!.messages()).toHaveLength(0);
  });

  it('a worker process killed mid-job: another picks the job up after the lease and the mail arrives once', async () => {
    await startSmtp();
    const s = await seedWidget();
    const accepted = await requestSnapshot(await viewerFor(s), { email: 'restart@client.example', dialValues: dials }, 'requester-d');
    const spawnWorker = () =>
      spawn(process.execPath, ['--conditions=react-server', '--import', 'tsx', 'lib/server/snapshots/worker-main.ts'], {
        env: { ...process.env, NODE_OPTIONS: '', DATABASE_FILE: dbFile, SMTP_PORT: String(smtpPort), SNAPSHOT_POLL_MS: '100', SNAPSHOT_LEASE_MS: '1500' },
        stdio: 'ignore',
      });
    const first = spawnWorker();
    // Wait until the first worker holds the job, then kill it without warning.
    const t0 = Date.now();
    let seen = '';
    while (Date.now() - t0 < 30_000) {
      seen = (await getSnapshotJob(accepted.id))!.state;
      if (seen !== 'queued') break;
      await new Promise((r) => setTimeout(r, 10));
    }
    first.kill('SIGKILL');
    await new Promise((r) => first.once('exit', r));
    const mid = (await getSnapshotJob(accepted.id))!;
    expect(['rendering', 'sending', 'sent']).toContain(mid.state);
    const second = spawnWorker();
    try {
      const t1 = Date.now();
      let job = mid;
      while (Date.now() - t1 < 40_000 && job.state !== 'sent' && job.state !== 'failed') {
        await new Promise((r) => setTimeout(r, 100));
        job = (await getSnapshotJob(accepted.id))!;
      }
      // Killed while rendering (the usual case: rendering is most of the work) → re-rendered and sent once.
      if (mid.state === 'rendering') {
        expect(job.state).toBe('sent');
        expect(job.attempts).toBe(2);
      }
      await new Promise((r) => setTimeout(r, 500));
      expect(smtp!.messages().filter((m) => m.to.includes('restart@client.example')).length).toBe(job.state === 'sent' ? 1 : 0);
    } finally {
      second.kill('SIGTERM');
      await new Promise((r) => second.once('exit', r));
    }
  });
});
