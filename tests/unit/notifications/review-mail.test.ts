// The review loop told by e-mail, inside one process: the events queue mails in their own transaction, the worker
// sends them through the local SMTP fake once, survives an outage, and honours each person's choices.
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import { randomUUID } from 'node:crypto';
import { useFreshDb } from '../../support/test-db';
import { getDb, writeTransaction } from '@/db/knex';
import { resetEnvCache } from '@/lib/server/env';
import { resetMailTransport } from '@/lib/server/mail/send';
import { startFakeSmtp, type FakeSmtpHandle } from '@/lib/fakes/smtp/server';
import { checkVersion, publish, saveVersion } from '@/lib/server/models/service';
import { getMailJob, listVersionsAwaitingCheck, setNotificationPrefs } from '@/db/notifications';
import { startMailWorker } from '@/lib/server/notifications/worker';
import { UNCERTAIN_MESSAGE } from '@/lib/server/snapshots/worker';
import type { Member } from '@/lib/server/auth/guard';
import type { Role } from '@/db/users';
import { STACK_MODEL } from '../snapshots/fixture';

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
const quiet = () => undefined;
const startSmtp = async () => {
  smtp = await startFakeSmtp({ smtpPort, httpPort: 0, dir: mailDir, log: false });
};

beforeAll(async () => {
  smtpPort = await freePort();
  mailDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-review-mail-'));
  process.env.SMTP_PORT = String(smtpPort);
  process.env.SMTP_HOST = '127.0.0.1';
  process.env.APP_URL = 'http://localhost:3998';
  process.env.NEXTAUTH_URL = 'http://localhost:3998';
  await useFreshDb();
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
  // The queue is shared by every firm: each test starts with an empty one.
  await getDb()('mail_jobs').delete();
});

type Firm = { firmId: string; modelId: string; members: Record<string, Member> };

/** A firm with an owner, an author, two checkers and a removed checker, and one linear-stack model. */
async function seedFirm(): Promise<Firm> {
  const db = getDb();
  const now = new Date().toISOString();
  const firmId = randomUUID();
  const tag = firmId.slice(0, 8);
  await db('firms').insert({ id: firmId, name: 'Orrinvale Test Engineering', created_at: now });
  const members: Record<string, Member> = {};
  const people: [string, Role, 'active' | 'removed'][] = [
    ['owner', 'owner', 'active'],
    ['author', 'author', 'active'],
    ['checkerA', 'checker', 'active'],
    ['checkerB', 'checker', 'active'],
    ['gone', 'checker', 'removed'],
  ];
  for (const [key, role, status] of people) {
    const userId = randomUUID();
    const membershipId = randomUUID();
    const email = `${key.toLowerCase()}-${tag}@firm.example`;
    await db('users').insert({ id: userId, email, name: `Test ${key}`, created_at: now });
    await db('memberships').insert({ id: membershipId, firm_id: firmId, user_id: userId, role, status, created_at: now, updated_at: now });
    members[key] = { userId, email, name: `Test ${key}`, sessionVersion: 1, membershipId, firmId, firmName: 'Orrinvale Test Engineering', role };
  }
  const modelId = randomUUID();
  await db('models').insert({ id: modelId, firm_id: firmId, title: 'Shaft float', template: 'linear-stack', draft_json: JSON.stringify(STACK_MODEL), created_at: now, updated_at: now });
  return { firmId, modelId, members };
}

const jobs = (firmId: string) => getDb()('mail_jobs').where({ firm_id: firmId }).select('id', 'kind', 'recipient', 'state', 'subject', 'text_body').orderBy('recipient');

async function drain(worker: ReturnType<typeof startMailWorker>): Promise<number> {
  let n = 0;
  while (await worker.runOnce()) n++;
  return n;
}

describe('review-loop e-mails', () => {
  it('a saved version asks every active checker but never its author; the author hears the decision; owners hear of publishing', async () => {
    await startSmtp();
    const f = await seedFirm();
    const { author, checkerA, checkerB, owner, gone } = f.members;
    const v1 = await saveVersion(author!, f.modelId, { model: { ...STACK_MODEL, title: 'Shaft float' }, baseVersion: 0, note: 'Tightened the spacer to ±0.02' });
    let rows = await jobs(f.firmId);
    expect(rows.map((r) => [r.kind, r.recipient])).toEqual([
      ['check_requested', checkerA!.email],
      ['check_requested', checkerB!.email],
    ]);
    expect(rows.map((r) => r.recipient)).not.toContain(author!.email);
    expect(rows.map((r) => r.recipient)).not.toContain(gone!.email);
    expect(rows[0]!.text_body).toContain('Tightened the spacer to ±0.02');
    expect(rows[0]!.text_body).toContain(`http://localhost:3998/app/models/${f.modelId}/versions/1/check`);
    expect(await listVersionsAwaitingCheck(f.firmId, checkerA!.userId)).toHaveLength(1);
    expect(await listVersionsAwaitingCheck(f.firmId, author!.userId)).toHaveLength(0);

    const worker = startMailWorker({ pollMs: 60_000, log: quiet });
    await worker.stop();
    expect(await drain(worker)).toBe(2);
    expect(smtp!.messages().map((m) => m.to).flat().sort()).toEqual([checkerA!.email, checkerB!.email].sort());
    expect(await drain(worker)).toBe(0);

    await checkVersion(checkerA!, v1.id, { decision: 'send_back', note: 'Spacer tolerance is below the supplier’s capability.', comments: [] });
    rows = (await jobs(f.firmId)).filter((r) => r.kind === 'check_decided');
    expect(rows).toHaveLength(1);
    expect(rows[0]!.recipient).toBe(author!.email);
    expect(rows[0]!.subject).toBe('Version 1 of Shaft float was sent back');
    expect(rows[0]!.text_body).toContain('Spacer tolerance is below the supplier’s capability.');
    expect(await listVersionsAwaitingCheck(f.firmId, checkerB!.userId)).toHaveLength(0);

    const v2 = await saveVersion(author!, f.modelId, { model: { ...STACK_MODEL, title: 'Shaft float' }, baseVersion: 1, note: '' });
    await checkVersion(checkerB!, v2.id, { decision: 'sign_off', note: '', comments: [] });
    await publish(author!, { modelId: f.modelId, versionId: v2.id, title: 'Pump shaft float', panels: ['headline', 'spread'], headline: 'mean', dialIds: [], showLogo: false });
    rows = await jobs(f.firmId);
    const published = rows.filter((r) => r.kind === 'widget_published');
    expect(published.map((r) => r.recipient)).toEqual([owner!.email]);
    expect(published[0]!.text_body).toContain('Test author published the widget “Pump shaft float” from version 2 of “Shaft float”');
    expect(await drain(worker)).toBe(rows.length - 2);
    const inbox = smtp!.messages();
    expect(inbox.filter((m) => m.to.includes(author!.email)).map((m) => m.subject).sort()).toEqual(['Version 1 of Shaft float was sent back', 'Version 2 of Shaft float was signed off']);
    expect(inbox.filter((m) => m.to.includes(owner!.email))).toHaveLength(1);
  });

  it('each person can turn each kind off for themselves', async () => {
    const f = await seedFirm();
    const { author, checkerA, checkerB } = f.members;
    await writeTransaction((trx) => setNotificationPrefs(checkerB!.userId, { check_requested: false }, trx));
    await writeTransaction((trx) => setNotificationPrefs(author!.userId, { check_decided: false }, trx));
    const v1 = await saveVersion(author!, f.modelId, { model: { ...STACK_MODEL, title: 'Shaft float' }, baseVersion: 0, note: '' });
    expect((await jobs(f.firmId)).map((r) => r.recipient)).toEqual([checkerA!.email]);
    await checkVersion(checkerA!, v1.id, { decision: 'sign_off', note: 'ok', comments: [] });
    expect((await jobs(f.firmId)).filter((r) => r.kind === 'check_decided')).toHaveLength(0);
    // The count in the header is not an e-mail: it still shows for the checker who turned mails off.
    const v2 = await saveVersion(author!, f.modelId, { model: { ...STACK_MODEL, title: 'Shaft float' }, baseVersion: 1, note: '' });
    expect((await listVersionsAwaitingCheck(f.firmId, checkerB!.userId)).map((v) => v.number)).toEqual([v2.number]);
  });

  it('survives a mail-server outage and delivers each mail exactly once', async () => {
    const f = await seedFirm();
    await saveVersion(f.members.author!, f.modelId, { model: { ...STACK_MODEL, title: 'Shaft float' }, baseVersion: 0, note: '' });
    const [first] = await jobs(f.firmId);
    const worker = startMailWorker({ pollMs: 60_000, retryBaseMs: 300, log: quiet });
    await worker.stop();
    expect(await drain(worker)).toBe(2); // both attempts fail: no server
    let job = (await getMailJob(first!.id))!;
    expect(job.state).toBe('queued');
    expect(job.attempts).toBe(1);
    expect(job.lastError).toMatch(/Mail server/);
    await startSmtp();
    await new Promise((r) => setTimeout(r, 350));
    expect(await drain(worker)).toBe(2);
    job = (await getMailJob(first!.id))!;
    expect(job.state).toBe('sent');
    expect(job.attempts).toBe(2);
    expect(smtp!.messages()).toHaveLength(2);
    expect(smtp!.messages().map((m) => m.messageId)).toContain(job.messageId);
    expect(await drain(worker)).toBe(0);
  });

  it('a mail found in sending after its worker stopped is not sent again', async () => {
    await startSmtp();
    const f = await seedFirm();
    await saveVersion(f.members.author!, f.modelId, { model: { ...STACK_MODEL, title: 'Shaft float' }, baseVersion: 0, note: '' });
    const [a, b] = await jobs(f.firmId);
    await getDb()('mail_jobs').where({ id: a!.id }).update({ state: 'sending', attempts: 1, locked_by: 'gone', locked_until: new Date(Date.now() - 1000).toISOString() });
    // A claim whose worker stopped before the hand-over is simply taken again.
    await getDb()('mail_jobs').where({ id: b!.id }).update({ state: 'claimed', attempts: 1, locked_by: 'gone', locked_until: new Date(Date.now() - 1000).toISOString() });
    const worker = startMailWorker({ pollMs: 60_000, log: quiet });
    await worker.stop();
    expect(await drain(worker)).toBe(2);
    expect((await getMailJob(a!.id))!.state).toBe('failed');
    expect((await getMailJob(a!.id))!.lastError).toBe(UNCERTAIN_MESSAGE);
    expect((await getMailJob(b!.id))!).toMatchObject({ state: 'sent', attempts: 2 });
    expect(smtp!.messages().map((m) => m.to).flat()).toEqual([b!.recipient]);
  });
});
