import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import type Database from 'better-sqlite3';
import { PDFParse } from 'pdf-parse';
import { Client } from '../../support/http-client';
import { newFirm, addMember } from '../../support/firms';
import { openTestDb, firmIdOf } from '../../support/db-direct';
import { listMessages, waitForMessage, type FakeMessage } from '../../support/mailbox';
import { insertEmbedWidget } from './matrix/embed.rows';
import { SNAPSHOT_LIMITS } from '@/lib/server/snapshots/limits';

// "E-mail this view" over HTTP against the production build, its snapshot worker process and the SMTP fake.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');
const HOST = 'http://localhost:4200';

let db: Database.Database;
let owner: Client;
let author: Client;
let checker: Client;
let firmId: string;
const anon = new Client(appUrl);

beforeAll(async () => {
  const a = await newFirm(appUrl, 'snapshots');
  owner = a.owner;
  author = (await addMember(appUrl, mailboxUrl, owner, 'author')).client;
  checker = (await addMember(appUrl, mailboxUrl, owner, 'checker')).client;
  db = openTestDb(inject('dataDir'));
  firmId = firmIdOf(db, a.email);
});
afterAll(() => db?.close());

interface Row {
  id: string;
  createdAt: string;
  clientId: string;
  clientName: string;
  widgetTitle: string;
  recipient: string;
  state: string;
  attempts: number;
  lastError: string | null;
  sentAt: string | null;
}
interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string[]>; retryAfter?: number };
}

const jobs = () => (db.prepare('select count(*) as n from snapshot_jobs where firm_id = ?').get(firmId) as { n: number }).n;
const tokenOf = (snippet: string) => /data-stochos-token="([^"]+)"/.exec(snippet)![1]!;
const tag = () => randomUUID().slice(0, 8);
let viewers = 0;

/** A client allowing @client.example, a pass for a fresh stack widget, and the bearer from the embed exchange. */
async function viewer(title = `Shaft float ${tag()}`) {
  const c = await author.json<{ client: { id: string; name: string } }>('POST', '/api/clients', {
    name: `Snapshot client ${tag()}`,
    allowedOrigins: [HOST],
    allowedEmailDomains: ['client.example'],
  });
  expect(c.status).toBe(201);
  const widgetId = insertEmbedWidget(db, firmId, title);
  const g = await author.json<{ pass: { id: string; snippet: string } }>('POST', '/api/passes', { clientId: c.body.client.id, widgetId });
  expect(g.status, JSON.stringify(g.body)).toBe(201);
  const s = await anon.json<{ token: string }>('POST', '/api/embed/session', { passId: g.body.pass.id, pass: tokenOf(g.body.pass.snippet), origin: HOST });
  expect(s.status).toBe(200);
  // A network address of its own per viewer, so the per-requester limit of one test never touches another.
  const ip = `198.51.100.${++viewers}`;
  return { clientId: c.body.client.id, clientName: c.body.client.name, passId: g.body.pass.id, bearer: s.body.token, ip, title };
}

type Viewer = Awaited<ReturnType<typeof viewer>>;

async function ask(v: Viewer, body: unknown, bearer = v.bearer) {
  const res = await anon.request('POST', `/api/embed/passes/${v.passId}/snapshots`, body, { authorization: `Bearer ${bearer}`, 'x-forwarded-for': v.ip });
  return { status: res.status, headers: res.headers, body: (await res.json()) as Record<string, unknown> & Partial<ErrorBody> };
}

async function waitForState(c: Client, id: string, state: string, timeoutMs = 60_000): Promise<Row> {
  const start = Date.now();
  for (;;) {
    const r = await c.json<{ snapshots: Row[] }>('GET', '/api/snapshots');
    const row = r.body.snapshots.find((s) => s.id === id);
    if (row?.state === state) return row;
    if (Date.now() - start > timeoutMs) throw new Error(`Snapshot ${id} is ${row?.state ?? 'missing'}, not ${state}, after ${timeoutMs} ms`);
    await new Promise((r) => setTimeout(r, 250));
  }
}

async function pdfText(m: FakeMessage): Promise<{ text: string; bytes: number; type: string | null }> {
  const res = await fetch(`${mailboxUrl}/messages/${m.id}/attachments/0`);
  const bytes = Buffer.from(await res.arrayBuffer());
  const parser = new PDFParse({ data: bytes });
  try {
    // The PDF's text layer gives plain spaces where the figures use no-break spaces.
    return { text: (await parser.getText()).text.replace(/[\u00a0\u202f]/g, ' '), bytes: bytes.length, type: res.headers.get('content-type') };
  } finally {
    await parser.destroy();
  }
}

describe('snapshots by e-mail', () => {
  it('queues a request, sends one message with the PDF of those dial values, and lists it as sent', async () => {
    const v = await viewer();
    const to = `reviewer-${tag()}@client.example`;
    const before = jobs();
    const r = await ask(v, { email: `  ${to.toUpperCase()} `, dialValues: { spacer_length: 24.2, float_max: 0.45 }, version: 1 });
    expect(r.status, JSON.stringify(r.body)).toBe(202);
    expect(r.body).toMatchObject({ state: 'queued', recipient: to });
    expect(String(r.body.message)).toContain(to);
    expect(jobs()).toBe(before + 1);

    const sent = await waitForState(owner, String(r.body.id), 'sent');
    expect(sent).toMatchObject({ clientId: v.clientId, clientName: v.clientName, widgetTitle: v.title, recipient: to, attempts: 1, lastError: null });
    expect(Date.parse(sent.sentAt!)).toBeGreaterThanOrEqual(Date.parse(sent.createdAt));

    const m = await waitForMessage(mailboxUrl, to, new RegExp(v.title));
    // Once: the worker marked the job sent after this message, and nothing else went to this address.
    expect(await listMessages(mailboxUrl, to)).toHaveLength(1);
    expect(m.attachments).toHaveLength(1);
    expect(m.attachments![0]).toMatchObject({ contentType: 'application/pdf' });
    expect(m.attachments![0]!.filename).toMatch(/\.pdf$/);
    const pdf = await pdfText(m);
    expect(pdf.type).toBe('application/pdf');
    expect(pdf.bytes).toBe(m.attachments![0]!.size);
    expect(pdf.text).toContain(v.title);
    expect(pdf.text).toContain(v.clientName);
    // The dial values as requested, in the dial table (exampleLinearStack: Spacer sleeve length, Maximum allowed float).
    expect(pdf.text).toMatch(/Spacer sleeve length\s+24\.20 mm/);
    expect(pdf.text).toMatch(/Maximum allowed float\s+0\.45 mm/);
    // The mail body names the same values as the PDF.
    expect(m.text).toMatch(/Spacer sleeve length: 24\.20 mm/);

    // The author sees it too; the client filter narrows the list to this client.
    const mine = await author.json<{ snapshots: Row[] }>('GET', `/api/snapshots?clientId=${v.clientId}`);
    expect(mine.status).toBe(200);
    expect(mine.body.snapshots.map((s) => s.id)).toEqual([r.body.id]);
    expect((await checker.json('GET', '/api/snapshots')).status).toBe(403);
    const bad = await owner.json<ErrorBody>('GET', '/api/snapshots?clientId=not-a-client');
    expect(bad.status).toBe(422);
  });

  it('refuses an address outside the allowed domains with 403 naming them, and queues nothing', async () => {
    const v = await viewer();
    const before = jobs();
    const r = await ask(v, { email: 'someone@elsewhere.example', dialValues: {} });
    expect(r.status).toBe(403);
    expect(r.body.error!.message).toContain('@client.example');
    expect(r.body.error!.message).toContain('elsewhere.example is not one of them');
    expect(r.body.error!.fields?.email?.[0]).toContain('@client.example');
    // A look-alike domain is not the allowed one.
    expect((await ask(v, { email: 'someone@client.example.evil.example', dialValues: {} })).status).toBe(403);
    expect((await ask(v, { email: 'someone@sub.client.example', dialValues: {} })).status).toBe(403);
    expect(jobs()).toBe(before);
  });

  it('refuses a malformed address and a dial out of range with 422 per field, and queues nothing', async () => {
    const v = await viewer();
    const before = jobs();
    for (const email of ['not-an-address', 'two@@client.example', 'dot.@client.example', '']) {
      const r = await ask(v, { email, dialValues: {} });
      expect(r.status, email).toBe(422);
      expect(r.body.error!.fields?.email?.[0], email).toBeTruthy();
    }
    const range = await ask(v, { email: 'viewer@client.example', dialValues: { spacer_length: 30 } });
    expect(range.status).toBe(422);
    // exampleLinearStack: spacer_length ranges 24.05 to 24.25 mm.
    expect(range.body.error!.fields?.['dialValues.spacer_length']?.[0]).toContain('24.05 to 24.25');
    const hidden = await ask(v, { email: 'viewer@client.example', dialValues: { housing_k: 3 } });
    expect(hidden.status).toBe(422);
    expect(hidden.body.error!.fields?.['dialValues.housing_k']?.[0]).toMatch(/no dial/);
    const extra = await ask(v, { email: 'viewer@client.example', dialValues: {}, attachment: 'x' });
    expect(extra.status).toBe(422);
    expect(jobs()).toBe(before);
  });

  it('refuses a revoked pass at once, with the bearer the page already holds', async () => {
    const v = await viewer();
    const before = jobs();
    const revoke = await author.json<{ pass: { status: string } }>('POST', `/api/passes/${v.passId}/revoke`);
    expect(revoke.body.pass.status).toBe('revoked');
    const r = await ask(v, { email: 'viewer@client.example', dialValues: {} });
    expect([401, 403]).toContain(r.status);
    expect(r.body.error!.message.length).toBeGreaterThan(10);
    // No bearer, or a bearer for another pass, opens nothing either.
    const none = await anon.request('POST', `/api/embed/passes/${v.passId}/snapshots`, { email: 'viewer@client.example', dialValues: {} });
    expect(none.status).toBe(401);
    const other = await viewer();
    expect((await ask({ ...v, ip: other.ip }, { email: 'viewer@client.example', dialValues: {} }, other.bearer)).status).toBe(403);
    expect(jobs()).toBe(before);
  });

  it('answers a burst to one address with 429, a retry time and no further jobs', async () => {
    const v = await viewer();
    const to = `burst-${tag()}@client.example`;
    const before = jobs();
    for (let i = 0; i < SNAPSHOT_LIMITS.recipient; i++) expect((await ask(v, { email: to, dialValues: {} })).status).toBe(202);
    const r = await ask(v, { email: to, dialValues: {} });
    expect(r.status).toBe(429);
    const retry = Number(r.headers.get('retry-after'));
    // The hour's window has just begun: the wait is close to an hour, never zero.
    expect(retry).toBeGreaterThan(50 * 60);
    expect(retry).toBeLessThanOrEqual(60 * 60);
    expect(r.body.error!.retryAfter).toBe(retry);
    expect(r.body.error!.message).toMatch(/Try again in \d+ minutes/);
    expect(jobs()).toBe(before + SNAPSHOT_LIMITS.recipient);
  });
});
