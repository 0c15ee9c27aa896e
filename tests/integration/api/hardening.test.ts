import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import type Database from 'better-sqlite3';
import { Client, uniqueEmail } from '../../support/http-client';
import { newFirm, addMember } from '../../support/firms';
import { openTestDb, firmIdOf } from '../../support/db-direct';
import { startExtraApp } from '../../support/extra-app';
import { insertEmbedWidget } from './matrix/embed.rows';
import { SNAPSHOT_LIMITS } from '@/lib/server/snapshots/limits';

// Body limits and the client address, over HTTP against the production build. The shared stack trusts
// loopback as a reverse proxy (TRUSTED_PROXIES in tests/support/api-global-setup.ts); a second app on the same
// data, trusting nobody, stands for a server that clients reach directly.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');
const dataDir = inject('dataDir');
const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);
const HOST = 'http://localhost:4200';
const MiB = 1024 * 1024;

interface ErrorBody {
  error: { code: string; message: string; fields?: Record<string, string[]> };
}

let db: Database.Database;
let owner: Client;
let author: Client;
let firmId: string;

beforeAll(async () => {
  const a = await newFirm(appUrl, 'harden');
  owner = a.owner;
  author = (await addMember(appUrl, mailboxUrl, owner, 'author')).client;
  db = openTestDb(dataDir);
  firmId = firmIdOf(db, a.email);
});
afterAll(() => db?.close());

/** A body sent chunked (no Content-Length), `total` bytes of one long JSON string, produced as it is read. */
function chunkedJson(total: number): { body: ReadableStream<Uint8Array>; sent: () => number } {
  const piece = new Uint8Array(64 * 1024).fill(0x61);
  let sent = 0;
  const body = new ReadableStream<Uint8Array>({
    pull(c) {
      if (sent === 0) {
        c.enqueue(new TextEncoder().encode('{"pass":"'));
        sent += 9;
      } else if (sent + piece.length < total) {
        c.enqueue(piece);
        sent += piece.length;
      } else {
        c.enqueue(new TextEncoder().encode('"}'));
        sent += 2;
        c.close();
      }
    },
  });
  return { body, sent: () => sent };
}

async function post(base: string, path: string, body: BodyInit | ReadableStream<Uint8Array>, headers: Record<string, string> = {}): Promise<{ status: number; body: ErrorBody }> {
  const res = await fetch(base + path, { method: 'POST', body, headers: { 'content-type': 'application/json', ...headers }, duplex: 'half' } as RequestInit);
  const text = await res.text();
  return { status: res.status, body: text ? (JSON.parse(text) as ErrorBody) : ({} as ErrorBody) };
}

describe('request body limits', () => {
  it('answers 413 to an 8 MiB chunked JSON body on the sign-up and the embed exchange, which need no sign-in', async () => {
    const users = () => (db.prepare('select count(*) as n from users').get() as { n: number }).n;
    const before = users();
    for (const path of ['/api/sign-up', '/api/embed/session']) {
      const b = chunkedJson(8 * MiB);
      const r = await post(appUrl, path, b.body);
      expect(r.status, path).toBe(413);
      expect(r.body.error.code).toBe('payload_too_large');
      expect(r.body.error.message).toMatch(/JSON body is larger than 1 MiB, the most this endpoint accepts/);
    }
    expect(users()).toBe(before);
  });

  it('answers 413 to an 8 MiB chunked sign-in form, which next-auth would otherwise read whole', async () => {
    const b = chunkedJson(8 * MiB);
    const r = await post(appUrl, '/api/auth/callback/credentials', b.body, { 'content-type': 'application/x-www-form-urlencoded' });
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/sign-in form is larger than 64 KiB/);
  });

  it('refuses a declared Content-Length over 1 MiB at once, and still reads a body just under it', async () => {
    const big = await post(appUrl, '/api/sign-up', JSON.stringify({ firmName: 'x'.repeat(MiB) }));
    expect(big.status).toBe(413);
    // Just under the cap: read and validated as usual (422 names the fields), not refused for its size.
    const under = await post(appUrl, '/api/sign-up', JSON.stringify({ firmName: 'x'.repeat(MiB - 100) }));
    expect(under.status).toBe(422);
  });

  it('lets the simulate API take up to 4 MiB, and no more', async () => {
    const pad = (n: number) => JSON.stringify({ model: { padding: 'x'.repeat(n) } });
    const cookie = owner.cookie();
    const ok = await post(appUrl, '/api/v1/simulate', pad(2 * MiB), { cookie });
    expect(ok.status).toBe(422);
    const over = await post(appUrl, '/api/v1/simulate', chunkedJson(5 * MiB).body, { cookie });
    expect(over.status).toBe(413);
    expect(over.body.error.message).toMatch(/larger than 4 MiB/);
  });

  it('caps a dataset upload sent chunked, and stores nothing', async () => {
    const count = () => (db.prepare('select count(*) as n from datasets where firm_id = ?').get(firmId) as { n: number }).n;
    const before = count();
    const boundary = 'stochos-harden';
    const head = new TextEncoder().encode(`--${boundary}\r\nContent-Disposition: form-data; name="name"\r\n\r\nBig\r\n--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="big.csv"\r\nContent-Type: text/csv\r\n\r\n`);
    let sent = 0;
    const line = new TextEncoder().encode('1.25\n'.repeat(10_000));
    const body = new ReadableStream<Uint8Array>({
      pull(c) {
        if (sent === 0) c.enqueue(head);
        else if (sent < 8 * MiB) c.enqueue(line);
        else return c.close();
        sent += sent === 0 ? head.length : line.length;
      },
    });
    const r = await post(appUrl, '/api/datasets', body, { cookie: author.cookie(), 'content-type': `multipart/form-data; boundary=${boundary}` });
    expect(r.status).toBe(413);
    expect(r.body.error.message).toMatch(/upload is larger than 5\.1 MiB/);
    expect(count()).toBe(before);
  });
});

/** A failed credentials sign-in with a chosen X-Forwarded-For; returns next-auth's error text. */
async function failedSignIn(base: string, xff: string): Promise<string> {
  const csrf = await fetch(`${base}/api/auth/csrf`, { headers: { 'x-forwarded-for': xff } });
  const { csrfToken } = (await csrf.json()) as { csrfToken: string };
  const cookie = csrf.headers.getSetCookie().map((c) => c.split(';')[0]).join('; ');
  const form = new URLSearchParams({ csrfToken, email: uniqueEmail('nobody'), password: 'wrong password', json: 'true', callbackUrl: `${base}/app` });
  const res = await fetch(`${base}/api/auth/callback/credentials`, {
    method: 'POST',
    body: form.toString(),
    headers: { 'content-type': 'application/x-www-form-urlencoded', cookie, 'x-forwarded-for': xff },
    redirect: 'manual',
  });
  const data = (res.headers.get('content-type') ?? '').includes('json') ? ((await res.json()) as { url?: string }) : null;
  const url = new URL(data?.url ?? res.headers.get('location') ?? base, base);
  return url.searchParams.get('error') ?? '';
}

const randomIp = () => `10.${Math.floor(Math.random() * 250)}.${Math.floor(Math.random() * 250)}.${1 + Math.floor(Math.random() * 250)}`;
const LIMITED = /Too many failed sign-ins for your network address/;
const clearAddress = (...a: string[]) => db.prepare(`delete from sign_in_attempts where key in (${a.map(() => '?').join(',')})`).run(...a.map((x) => `address:${x}`));

describe('client address', () => {
  let direct: Awaited<ReturnType<typeof startExtraApp>>;
  beforeAll(async () => {
    direct = await startExtraApp({ dataDir, port: 3400 + OFF, env: { TRUSTED_PROXIES: '' } });
  });
  afterAll(async () => {
    // Other test files sign in from loopback on the shared stack: leave no failures counted against it.
    clearAddress('127.0.0.1', '::1', '203.0.113.50');
    await direct?.stop();
  });

  it('limits 40 failed sign-ins from one client at 20, however it rotates X-Forwarded-For', async () => {
    clearAddress('127.0.0.1', '::1');
    const errors: string[] = [];
    for (let i = 0; i < 40; i++) errors.push(await failedSignIn(direct.url, randomIp()));
    expect(errors.slice(0, 20).filter((e) => LIMITED.test(e))).toEqual([]);
    expect(errors.slice(20).every((e) => LIMITED.test(e)), errors.slice(20).join(' | ')).toBe(true);
    clearAddress('127.0.0.1', '::1');
  });

  it('behind a trusted proxy, counts the address the proxy saw, not what the client wrote to the left of it', async () => {
    clearAddress('203.0.113.50');
    const errors: string[] = [];
    for (let i = 0; i < 22; i++) errors.push(await failedSignIn(appUrl, `${randomIp()}, 203.0.113.50`));
    expect(errors.slice(0, 20).filter((e) => LIMITED.test(e))).toEqual([]);
    expect(errors.slice(20).every((e) => LIMITED.test(e))).toBe(true);
    // Another client behind the same proxy is not affected.
    expect(await failedSignIn(appUrl, '203.0.113.51')).not.toMatch(LIMITED);
    clearAddress('203.0.113.50', '203.0.113.51');
  });

  it('keeps the per-requester snapshot limit however X-Forwarded-For rotates', async () => {
    const c = await author.json<{ client: { id: string } }>('POST', '/api/clients', { name: `Harden client ${randomUUID().slice(0, 8)}`, allowedOrigins: [HOST], allowedEmailDomains: ['client.example'] });
    expect(c.status).toBe(201);
    const widgetId = insertEmbedWidget(db, firmId, 'Rotating requester');
    const g = await author.json<{ pass: { id: string; snippet: string } }>('POST', '/api/passes', { clientId: c.body.client.id, widgetId });
    const token = /data-stochos-token="([^"]+)"/.exec(g.body.pass.snippet)![1]!;
    const s = await new Client(appUrl).json<{ token: string }>('POST', '/api/embed/session', { passId: g.body.pass.id, pass: token, origin: HOST });
    expect(s.status).toBe(200);
    const statuses: number[] = [];
    let last: ErrorBody | null = null;
    for (let i = 0; i <= SNAPSHOT_LIMITS.requester; i++) {
      const r = await post(direct.url, `/api/embed/passes/${g.body.pass.id}/snapshots`, JSON.stringify({ email: `rot-${i}-${randomUUID().slice(0, 6)}@client.example` }), {
        authorization: `Bearer ${s.body.token}`,
        'x-forwarded-for': randomIp(),
      });
      statuses.push(r.status);
      last = r.body;
    }
    expect(statuses.slice(0, SNAPSHOT_LIMITS.requester).every((x) => x === 202), statuses.join(',')).toBe(true);
    expect(statuses.at(-1)).toBe(429);
    expect(last!.error.message).toMatch(/You have asked for 10 snapshots in the last hour/);
  });
});
