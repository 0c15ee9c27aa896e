import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import type Database from 'better-sqlite3';
import { decodeJwt, decodeProtectedHeader } from 'jose';
import { Client } from '../../support/http-client';
import { newFirm, addMember } from '../../support/firms';
import { openTestDb, firmIdOf } from '../../support/db-direct';
import { insertEmbedWidget } from './matrix/embed.rows';
import { mintPassToken } from '@/lib/server/embed/tokens';

// Clients, passes, tokens and the embed API against the production build.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');

let db: Database.Database;
let owner: Client;
let author: Client;
let checker: Client;
let firmId: string;
let otherOwner: Client;
let otherFirmId: string;
const anon = new Client(appUrl);

beforeAll(async () => {
  const a = await newFirm(appUrl, 'embed');
  owner = a.owner;
  author = (await addMember(appUrl, mailboxUrl, owner, 'author')).client;
  checker = (await addMember(appUrl, mailboxUrl, owner, 'checker')).client;
  const b = await newFirm(appUrl, 'embed-other');
  otherOwner = b.owner;
  db = openTestDb(inject('dataDir'));
  firmId = firmIdOf(db, a.email);
  otherFirmId = firmIdOf(db, b.email);
});
afterAll(() => db?.close());

interface ClientJson {
  id: string;
  name: string;
  allowedOrigins: string[];
  allowedEmailDomains: string[];
  keyVersion: number;
  archivedAt: string | null;
}
interface PassJson {
  id: string;
  status: string;
  snippet: string | null;
  expiresAt: string;
  counts: { load: number; dial: number; snapshot: number };
  lastViewAt: string | null;
  olderSnippetsLive: number;
}

const count = (table: string) => (db.prepare(`select count(*) as n from ${table}`).get() as { n: number }).n;
const tokenOf = (snippet: string) => /data-stochos-token="([^"]+)"/.exec(snippet)![1]!;
const HOST = 'http://localhost:4200';

async function newClient(c: Client = author, origins = [HOST]): Promise<ClientJson> {
  const r = await c.json<{ client: ClientJson }>('POST', '/api/clients', { name: `Client ${randomUUID().slice(0, 8)}`, allowedOrigins: origins, allowedEmailDomains: ['client.example'] });
  expect(r.status).toBe(201);
  return r.body.client;
}

async function grant(clientId: string, widgetId = insertEmbedWidget(db, firmId), days?: number): Promise<{ pass: PassJson; token: string; widgetId: string }> {
  const r = await author.json<{ pass: PassJson }>('POST', '/api/passes', { clientId, widgetId, ...(days ? { days } : {}) });
  expect(r.status, JSON.stringify(r.body)).toBe(201);
  return { pass: r.body.pass, token: tokenOf(r.body.pass.snippet!), widgetId };
}

async function exchange(passId: string, pass: string, origin?: string | null) {
  return anon.json<{ token: string; expiresAt: number; error?: { message: string } }>('POST', '/api/embed/session', { passId, pass, ...(origin !== undefined ? { origin } : {}) });
}

/** Whether the worker process has stored the first figures of the widget's version. */
const storedFirstFigures = (widgetId: string) =>
  Boolean(db.prepare("select f.id from first_figures f join widgets w on w.version_id = f.version_id where w.id = ? and f.state = 'done'").get(widgetId));

const bearer = (token: string) => ({ authorization: `Bearer ${token}` });
async function widgetCall(passId: string, token: string) {
  return anon.request('GET', `/api/embed/passes/${passId}/widget`, undefined, bearer(token));
}
async function dialCall(passId: string, token: string, body: unknown) {
  return anon.request('POST', `/api/embed/passes/${passId}/events`, body, bearer(token));
}

describe('clients', () => {
  it('creates a client with normalised origins and domains, lists and edits it', async () => {
    const r = await author.json<{ client: ClientJson }>('POST', '/api/clients', {
      name: 'Brindlecote Water Board',
      allowedOrigins: ['HTTPS://Portal.Brindlecote.example/', 'https://intranet.brindlecote.example:8443'],
      allowedEmailDomains: ['Brindlecote.example'],
    });
    expect(r.status).toBe(201);
    expect(r.body.client.allowedOrigins).toEqual(['https://portal.brindlecote.example', 'https://intranet.brindlecote.example:8443']);
    expect(r.body.client.allowedEmailDomains).toEqual(['brindlecote.example']);
    const list = await checker.json<{ clients: ClientJson[] }>('GET', '/api/clients');
    expect(list.body.clients.map((c) => c.name)).toContain('Brindlecote Water Board');
    const edit = await owner.json<{ client: ClientJson }>('PATCH', `/api/clients/${r.body.client.id}`, { allowedOrigins: ['https://portal.brindlecote.example'] });
    expect(edit.status).toBe(200);
    expect(edit.body.client.allowedOrigins).toEqual(['https://portal.brindlecote.example']);
  });

  it('refuses a malformed origin or e-mail domain with a message per item, storing nothing', async () => {
    const before = count('clients');
    const r = await author.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/clients', {
      name: 'Malformed Origins Ltd',
      allowedOrigins: ['https://ok.example', 'https://ok.example/portal/page', 'https://*.wild.example'],
      allowedEmailDomains: ['person@client.example'],
    });
    expect(r.status).toBe(422);
    expect(Object.keys(r.body.error.fields).sort()).toEqual(['allowedEmailDomains.0', 'allowedOrigins.1', 'allowedOrigins.2']);
    expect(r.body.error.fields['allowedOrigins.1']![0]).toMatch(/origin only/);
    expect(count('clients')).toBe(before);
    const c = await newClient();
    const p = await author.json('PATCH', `/api/clients/${c.id}`, { allowedOrigins: ['ftp://files.example'] });
    expect(p.status).toBe(422);
    expect((db.prepare('select allowed_origins from clients where id = ?').get(c.id) as { allowed_origins: string }).allowed_origins).toBe(JSON.stringify([HOST]));
  });

  it('archives and restores; archived clients leave the default list', async () => {
    const c = await newClient();
    expect((await author.json<{ client: ClientJson }>('PATCH', `/api/clients/${c.id}`, { archived: true })).body.client.archivedAt).not.toBeNull();
    expect((await author.json<{ clients: ClientJson[] }>('GET', '/api/clients')).body.clients.map((x) => x.id)).not.toContain(c.id);
    expect((await author.json<{ clients: ClientJson[] }>('GET', '/api/clients?archived=1')).body.clients.map((x) => x.id)).toContain(c.id);
    expect((await author.json<{ client: ClientJson }>('PATCH', `/api/clients/${c.id}`, { archived: false })).body.client.archivedAt).toBeNull();
  });

  it('keeps firms apart', async () => {
    const c = await newClient();
    expect((await otherOwner.json('GET', `/api/clients/${c.id}`)).status).toBe(404);
    expect((await otherOwner.json('PATCH', `/api/clients/${c.id}`, { name: 'Taken over' })).status).toBe(404);
    expect((await otherOwner.json<{ clients: ClientJson[] }>('GET', '/api/clients')).body.clients.map((x) => x.id)).not.toContain(c.id);
  });
});

describe('passes', () => {
  it('issues a pass with a snippet, a 90-day signed token and an active status', async () => {
    const c = await newClient();
    const { pass, token } = await grant(c.id);
    expect(pass.status).toBe('active');
    expect(pass.snippet).toContain(`data-stochos-pass="${pass.id}"`);
    expect(pass.snippet).toContain(`<script async src="${appUrl}/embed/stochos-embed.js"></script>`);
    expect(decodeProtectedHeader(token)).toMatchObject({ alg: 'HS256', kid: `${c.id}.1` });
    const claims = decodeJwt(token);
    expect(claims).toMatchObject({ aud: 'stochos-embed', sub: pass.id });
    expect(typeof claims.jti).toBe('string');
    expect((claims.exp! * 1000 - Date.now()) / 86_400_000).toBeCloseTo(90, 1);
  });

  it('refuses a pass for a widget of another firm, storing nothing', async () => {
    const c = await newClient();
    const foreign = insertEmbedWidget(db, otherFirmId, 'Foreign widget');
    const before = count('passes');
    const r = await author.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/passes', { clientId: c.id, widgetId: foreign });
    expect(r.status).toBe(422);
    expect(r.body.error.fields.widgetId![0]).toMatch(/No widget of your firm/);
    expect(count('passes')).toBe(before);
  });

  it('refuses a pass for an unpublished widget or an archived client', async () => {
    const c = await newClient();
    const w = insertEmbedWidget(db, firmId);
    db.prepare('update widgets set unpublished_at = ? where id = ?').run(new Date().toISOString(), w);
    expect((await author.json('POST', '/api/passes', { clientId: c.id, widgetId: w })).status).toBe(422);
    await author.json('PATCH', `/api/clients/${c.id}`, { archived: true });
    expect((await author.json('POST', '/api/passes', { clientId: c.id, widgetId: insertEmbedWidget(db, firmId) })).status).toBe(422);
  });

  it('lets checkers see passes but not issue, renew or revoke them', async () => {
    const c = await newClient();
    const { pass } = await grant(c.id);
    expect((await checker.json('GET', `/api/passes/${pass.id}`)).status).toBe(200);
    expect((await checker.json('POST', '/api/passes', { clientId: c.id, widgetId: insertEmbedWidget(db, firmId) })).status).toBe(403);
    expect((await checker.json('POST', `/api/passes/${pass.id}/revoke`)).status).toBe(403);
    expect((await checker.json('POST', `/api/passes/${pass.id}/renew`, {})).status).toBe(403);
  });
});

describe('pass exchange and the embed API', () => {
  it('exchanges a pass for a bearer token that loads the widget with its version and sign-off', async () => {
    const c = await newClient();
    const { pass, token, widgetId } = await grant(c.id);
    const s = await exchange(pass.id, token, HOST);
    expect(s.status).toBe(200);
    expect(decodeJwt(s.body.token)).toMatchObject({ aud: 'stochos-embed-session', sub: pass.id });
    const res = await widgetCall(pass.id, s.body.token);
    expect(res.status).toBe(200);
    const w = (await res.json()) as { widget: { id: string; dialIds: string[] }; model: { template: string }; versionInfo: { number: number; checkState: string }; branding: { firmName: string } };
    expect(w.widget.id).toBe(widgetId);
    expect(w.widget.dialIds).toEqual(['spacer_length', 'float_max']);
    expect(w.model.template).toBe('linear-stack');
    expect(w.versionInfo).toMatchObject({ number: 1, checkState: 'signed_off' });
    expect(w.branding.firmName).toBe('Test firm embed');
  });

  it('sends the widget with a strong ETag: a matching If-None-Match gets 304 without a body, while the pass is still checked on every call', async () => {
    const c = await newClient();
    const { pass, token, widgetId } = await grant(c.id);
    const s = await exchange(pass.id, token);
    // A version published without first figures: the first load queues them (the worker process computes them), and
    // once stored they are a new representation with a new validator.
    const before = await widgetCall(pass.id, s.body.token);
    expect(before.status).toBe(200);
    expect(await before.json()).not.toHaveProperty('firstFigures');
    const beforeTag = before.headers.get('etag')!;
    await expect.poll(() => storedFirstFigures(widgetId), { timeout: 30_000 }).toBe(true);
    const first = await anon.request('GET', `/api/embed/passes/${pass.id}/widget`, undefined, { ...bearer(s.body.token), 'if-none-match': beforeTag });
    expect(first.status).toBe(200);
    const etag = first.headers.get('etag')!;
    expect(etag).not.toBe(beforeTag);
    expect(etag).toMatch(/^"[A-Za-z0-9_-]{32}"$/);
    expect(first.headers.get('cache-control')).toMatch(/no-cache/);
    const body = await first.text();
    expect(JSON.parse(body)).toHaveProperty('firstFigures.computedAt');
    // The same representation twice gives the same validator and the same bytes.
    const again = await widgetCall(pass.id, s.body.token);
    expect(again.headers.get('etag')).toBe(etag);
    expect(await again.text()).toBe(body);
    const cond = (tag: string) => anon.request('GET', `/api/embed/passes/${pass.id}/widget`, undefined, { ...bearer(s.body.token), 'if-none-match': tag });
    const notModified = await cond(etag);
    expect(notModified.status).toBe(304);
    expect(notModified.headers.get('etag')).toBe(etag);
    expect(await notModified.text()).toBe('');
    expect((await cond(`W/${etag}, "other"`)).status).toBe(304);
    expect((await cond('"something-else"')).status).toBe(200);
    // A presentation change is a new representation: a new ETag and a full answer to the old one.
    db.prepare('update widgets set title = ? where id = ?').run('Shaft float (revised)', widgetId);
    const changed = await cond(etag);
    expect(changed.status).toBe(200);
    expect(changed.headers.get('etag')).not.toBe(etag);
    expect(((await changed.json()) as { widget: { title: string } }).widget.title).toBe('Shaft float (revised)');
    // Revoked: refused even when the client holds the current ETag.
    expect((await author.json('POST', `/api/passes/${pass.id}/revoke`)).status).toBe(200);
    expect((await cond(changed.headers.get('etag')!)).status).toBe(401);
  });

  it('brings the widget with the exchange when asked (the embed page’s one request): the same body as GET …/widget', async () => {
    const c = await newClient();
    const { pass, token, widgetId } = await grant(c.id);
    const res = await anon.request('POST', '/api/embed/session', { passId: pass.id, pass: token, origin: HOST, widget: true });
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
    const s = { body: (await res.json()) as { token: string; widget: { widget: { id: string } } } };
    expect(decodeJwt(s.body.token)).toMatchObject({ aud: 'stochos-embed-session', sub: pass.id });
    expect(s.body.widget.widget.id).toBe(widgetId);
    const get = await widgetCall(pass.id, s.body.token);
    expect(await get.json()).toEqual(s.body.widget);
    // Refused passes get the refusal alone, with no widget data.
    const wrong = await anon.json<{ widget?: unknown; error?: { message: string } }>('POST', '/api/embed/session', { passId: pass.id, pass: token, origin: 'https://elsewhere.example', widget: true });
    expect(wrong.status).toBe(403);
    expect(wrong.body.widget).toBeUndefined();
    expect((await author.json('POST', `/api/passes/${pass.id}/revoke`)).status).toBe(200);
    const revoked = await anon.json<{ widget?: unknown }>('POST', '/api/embed/session', { passId: pass.id, pass: token, widget: true });
    expect(revoked.status).toBe(401);
    expect(revoked.body.widget).toBeUndefined();
  });

  it('answers a tampered token 401, a snippet with a wrong id 403, a host not allowed 403', async () => {
    const c = await newClient();
    const { pass, token } = await grant(c.id);
    const [h, p, sig] = token.split('.');
    const claims = JSON.parse(Buffer.from(p!, 'base64url').toString());
    claims.exp += 365 * 86_400;
    const tampered = `${h}.${Buffer.from(JSON.stringify(claims)).toString('base64url')}.${sig}`;
    const t = await exchange(pass.id, tampered);
    expect(t.status).toBe(401);
    expect(t.body.error!.message).toMatch(/not valid/);
    const wrong = await exchange(randomUUID(), token);
    expect(wrong.status).toBe(403);
    expect(wrong.body.error!.message).toMatch(/does not match/);
    const host = await exchange(pass.id, token, 'https://elsewhere.example');
    expect(host.status).toBe(403);
    expect(host.body.error!.message).toMatch(/not allowed on this site/);
  });

  it('answers an expired token 401', async () => {
    const c = await newClient();
    const { pass } = await grant(c.id);
    const row = db.prepare('select jti, issued_at from pass_tokens where pass_id = ?').get(pass.id) as { jti: string; issued_at: string };
    const expired = await mintPassToken({ passId: pass.id, clientId: c.id, keyVersion: 1, jti: row.jti, issuedAt: row.issued_at, expiresAt: new Date(Date.now() - 60_000).toISOString() });
    const r = await exchange(pass.id, expired);
    expect(r.status).toBe(401);
    expect(r.body.error!.message).toMatch(/expired/);
  });

  it('answers a bearer token of another client’s pass 403', async () => {
    const a = await grant((await newClient()).id);
    const b = await grant((await newClient()).id);
    const s = await exchange(a.pass.id, a.token);
    expect((await widgetCall(b.pass.id, s.body.token)).status).toBe(403);
    expect((await dialCall(b.pass.id, s.body.token, { kind: 'dial', dialId: 'spacer_length', value: 24.1 })).status).toBe(403);
  });

  it('refuses a pass token used as a bearer and a bearer used as a pass', async () => {
    const { pass, token } = await grant((await newClient()).id);
    expect((await widgetCall(pass.id, token)).status).toBe(401);
    const s = await exchange(pass.id, token);
    expect((await exchange(pass.id, s.body.token)).status).toBe(401);
  });

  it('stops a revoked pass on the very next call, with the bearer it already holds', async () => {
    const { pass, token } = await grant((await newClient()).id);
    const s = await exchange(pass.id, token);
    expect((await widgetCall(pass.id, s.body.token)).status).toBe(200);
    expect((await author.json<{ pass: PassJson }>('POST', `/api/passes/${pass.id}/revoke`)).body.pass.status).toBe('revoked');
    expect((await widgetCall(pass.id, s.body.token)).status).toBe(401);
    expect((await dialCall(pass.id, s.body.token, { kind: 'dial', dialId: 'spacer_length', value: 24.1 })).status).toBe(401);
    const again = await exchange(pass.id, token);
    expect(again.status).toBe(401);
    expect(again.body.error!.message).toMatch(/withdrawn/);
  });

  it('revokes every pass of a client when its key is rotated', async () => {
    const c = await newClient();
    const a = await grant(c.id);
    const b = await grant(c.id);
    const s = await exchange(a.pass.id, a.token);
    const r = await author.json<{ client: ClientJson; revokedPasses: number }>('POST', `/api/clients/${c.id}/rotate-key`);
    expect(r.body).toMatchObject({ revokedPasses: 2, client: { keyVersion: 2 } });
    expect((await widgetCall(a.pass.id, s.body.token)).status).toBe(401);
    expect((await exchange(b.pass.id, b.token)).status).toBe(401);
    const detail = await author.json<{ passes: PassJson[] }>('GET', `/api/clients/${c.id}`);
    expect(detail.body.passes.map((p) => p.status)).toEqual(['key_rotated', 'key_rotated']);
    const fresh = await grant(c.id, a.widgetId);
    expect(decodeProtectedHeader(fresh.token).kid).toBe(`${c.id}.2`);
    expect((await exchange(fresh.pass.id, fresh.token)).status).toBe(200);
  });

  it('renews with a new snippet; the old one works until retired', async () => {
    const { pass, token } = await grant((await newClient()).id, undefined, 20);
    const r = await author.json<{ pass: PassJson }>('POST', `/api/passes/${pass.id}/renew`, {});
    expect(r.status).toBe(200);
    expect((Date.parse(r.body.pass.expiresAt) - Date.now()) / 86_400_000).toBeCloseTo(90, 1);
    expect(r.body.pass.olderSnippetsLive).toBe(1);
    const newToken = tokenOf(r.body.pass.snippet!);
    expect(newToken).not.toBe(token);
    expect((await exchange(pass.id, token)).status).toBe(200);
    await author.json('POST', `/api/passes/${pass.id}/renew`, { days: 30, retirePrevious: true });
    expect((await exchange(pass.id, token)).status).toBe(401);
    expect((await exchange(pass.id, newToken)).status).toBe(401);
  });

  it('suspends the passes of an archived client and lets them work again on restore', async () => {
    const c = await newClient();
    const { pass, token } = await grant(c.id);
    await author.json('PATCH', `/api/clients/${c.id}`, { archived: true });
    const r = await exchange(pass.id, token);
    expect(r.status).toBe(401);
    expect(r.body.error!.message).toMatch(/suspended/);
    await author.json('PATCH', `/api/clients/${c.id}`, { archived: false });
    expect((await exchange(pass.id, token)).status).toBe(200);
  });
});

describe('dial events and analytics', () => {
  it('counts loads and dial interactions; refuses values outside the dial’s range and dials the viewer may not move, storing nothing', async () => {
    const { pass, token } = await grant((await newClient()).id);
    const s = await exchange(pass.id, token);
    await exchange(pass.id, token);
    expect((await dialCall(pass.id, s.body.token, { kind: 'dial', dialId: 'spacer_length', value: 24.2 })).status).toBe(204);
    // Loads and dial moves are written in batches after the response (EVENT_FLUSH_MS, 250 ms by default).
    const passCounts = async () => (await checker.json<{ pass: PassJson }>('GET', `/api/passes/${pass.id}`)).body.pass.counts;
    await expect.poll(passCounts, { timeout: 5000 }).toEqual({ load: 2, dial: 1, snapshot: 0 });
    const before = count('pass_events');
    const out = await dialCall(pass.id, s.body.token, { kind: 'dial', dialId: 'spacer_length', value: 30 });
    expect(out.status).toBe(422);
    expect(JSON.stringify(await out.json())).toMatch(/outside the dial's range \(24.05 to 24.25\)/);
    // housing_k is a dial of the model but not one the widget lets viewers move.
    expect((await dialCall(pass.id, s.body.token, { kind: 'dial', dialId: 'housing_k', value: 3 })).status).toBe(422);
    expect((await dialCall(pass.id, s.body.token, { kind: 'dial', dialId: 'spacer_length', value: 'wide' })).status).toBe(422);
    expect((await dialCall(pass.id, s.body.token, { kind: 'snapshot', dialId: 'spacer_length', value: 24.1 })).status).toBe(422);
    // Give a wrongly queued event the time to be written before checking that nothing was stored.
    await new Promise((r) => setTimeout(r, 1000));
    expect(count('pass_events')).toBe(before);
    const detail = await checker.json<{ pass: PassJson & { daily: { day: string; load: number; dial: number }[] } }>('GET', `/api/passes/${pass.id}`);
    expect(detail.body.pass.counts).toEqual({ load: 2, dial: 1, snapshot: 0 });
    expect(detail.body.pass.lastViewAt).not.toBeNull();
    expect(detail.body.pass.daily).toHaveLength(30);
    expect(detail.body.pass.daily.at(-1)).toMatchObject({ day: new Date().toISOString().slice(0, 10), load: 2, dial: 1 });
  });
});

describe('headers', () => {
  it('sends frame-ancestors none on app pages and APIs', async () => {
    for (const path of ['/', '/sign-in', '/api/clients', '/api/embed/session']) {
      const res = await anon.request('GET', path);
      expect(res.headers.get('content-security-policy') ?? '', path).toMatch(/frame-ancestors 'none'/);
      expect(res.headers.get('x-content-type-options'), path).toBe('nosniff');
    }
  });

  it('sends exactly the client’s allowed origins and no-referrer on the embed page', async () => {
    const c = await newClient(author, [HOST, 'https://portal.second.example']);
    const { pass, token } = await grant(c.id);
    // The page's address carries no pass: the loader hands the token over by postMessage.
    const res = await anon.request('GET', `/embed/${pass.id}?origin=${encodeURIComponent(HOST)}`);
    expect(res.status).toBe(200);
    const csp = res.headers.get('content-security-policy') ?? '';
    expect(/frame-ancestors ([^;]*)/.exec(csp)![1]!.trim()).toBe(`${HOST} https://portal.second.example`);
    expect(res.headers.get('referrer-policy')).toBe('no-referrer');
    expect(res.headers.get('x-frame-options')).toBeNull();
    const html = await res.text();
    // The page carries no sign-in client code, and no widget data before the pass is exchanged.
    expect(html).not.toMatch(/next-auth|SessionProvider/);
    expect(html).not.toContain('Shaft float');
    expect(html).not.toContain(token);
  });

  it('shows a friendly message, framable by nobody, when the pass names no known client', async () => {
    const res = await anon.request('GET', `/embed/${randomUUID()}`);
    expect(res.status).toBe(200);
    expect(res.headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/);
    expect(await res.text()).toMatch(/This widget link is not valid/);
  });

  it('puts the response’s nonce on every script of the embed page (Next’s own and the inline early start)', async () => {
    const c = await newClient();
    const { pass } = await grant(c.id);
    const res = await anon.request('GET', `/embed/${pass.id}?origin=${encodeURIComponent(HOST)}`);
    const nonce = /'nonce-([^']+)'/.exec(res.headers.get('content-security-policy') ?? '')?.[1];
    expect(nonce).toBeTruthy();
    const html = await res.text();
    const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]).filter((t) => !/type="application\/json"/.test(t));
    expect(scripts.length).toBeGreaterThan(2);
    for (const tag of scripts) expect(tag, tag).toContain(`nonce="${nonce}"`);
    expect(html).toContain('__stochosStart');
  });

  it('ignores a pass-check verdict sent by the browser: the proxy replaces it with its own', async () => {
    const forged = encodeURIComponent(JSON.stringify({ kind: 'framable', passId: randomUUID(), firmName: 'Forged', allowedOrigins: ['https://forged.example'] }));
    const res = await anon.request('GET', `/embed/${randomUUID()}?origin=${encodeURIComponent('https://forged.example')}`, undefined, { 'x-stochos-embed-frame': forged });
    expect(res.headers.get('content-security-policy')).toMatch(/frame-ancestors 'none'/);
    const html = await res.text();
    expect(html).toMatch(/This widget link is not valid/);
    expect(html).not.toContain('__stochosStart');
    // The page's data route (what a client-side navigation would fetch) gets no forged verdict either.
    const buildId = fs.readFileSync(path.join(process.cwd(), '.next', 'BUILD_ID'), 'utf8').trim();
    const data = await anon.request('GET', `/_next/data/${buildId}/embed/${randomUUID()}.json`, undefined, { 'x-stochos-embed-frame': forged, 'x-nextjs-data': '1' });
    const body = await data.text();
    expect(body).not.toContain('Forged');
    expect(body).not.toContain('"view":"widget"');
  });

  it('shows the revoked message, framable by the client’s origins so its viewers can read it', async () => {
    const c = await newClient();
    const { pass } = await grant(c.id);
    await author.json('POST', `/api/passes/${pass.id}/revoke`);
    const res = await anon.request('GET', `/embed/${pass.id}`);
    expect(/frame-ancestors ([^;]*)/.exec(res.headers.get('content-security-policy') ?? '')?.[1]?.trim()).toBe(HOST);
    expect(await res.text()).toMatch(/Access to this widget was withdrawn/);
  });

  it('serves the loader as a cross-origin script', async () => {
    const res = await anon.request('GET', '/embed/stochos-embed.js');
    expect(res.status).toBe(200);
    expect(res.headers.get('content-type')).toMatch(/javascript/);
    expect(res.headers.get('cross-origin-resource-policy')).toBe('cross-origin');
    const js = await res.text();
    expect(js).toMatch(/iframe-resizer 4\.4\.5/);
    expect(js).toMatch(/data-stochos-pass/);
  });
});
