import { describe, it, expect, beforeAll } from 'vitest';
import { randomUUID } from 'node:crypto';
import { SignJWT, decodeJwt, decodeProtectedHeader } from 'jose';
import { useFreshDb } from '../../support/test-db';
import { getDb } from '@/db/knex';
import { createClient, createPass, renewPass, revokePass, rotateKey, editClient, passView } from '@/lib/server/embed/service';
import { checkPass, requireViewer } from '@/lib/server/embed/access';
import { mintPassToken, mintSessionToken, verifyPassToken, PASS_AUDIENCE } from '@/lib/server/embed/tokens';
import { getPass } from '@/db/passes';
import { seedFirmWithWidget, memberOf } from './fixtures';
import { AppError } from '@/lib/server/http/errors';

let firm: Awaited<ReturnType<typeof seedFirmWithWidget>>;
let other: Awaited<ReturnType<typeof seedFirmWithWidget>>;
const m = () => memberOf(firm.firmId, firm.userId);

beforeAll(async () => {
  await useFreshDb();
  firm = await seedFirmWithWidget();
  other = await seedFirmWithWidget('Other firm');
});

async function newPass(origins = ['http://localhost:4100']) {
  const client = await createClient(m(), { name: `Client ${randomUUID().slice(0, 8)}`, allowedOrigins: origins, allowedEmailDomains: ['client.example'] });
  const pass = await createPass(m(), { clientId: client.id, widgetId: firm.widgetId, days: 90 });
  const token = tokenFromSnippet((await passView(pass)).snippet!);
  return { client, pass, token };
}

const tokenFromSnippet = (s: string) => /data-stochos-token="([^"]+)"/.exec(s)![1]!;

describe('pass tokens', () => {
  it('carry the audience, subject, id and expiry, with HS256 and the client key version in kid', async () => {
    const { client, pass, token } = await newPass();
    const h = decodeProtectedHeader(token);
    const c = decodeJwt(token);
    expect(h).toMatchObject({ alg: 'HS256', kid: `${client.id}.1` });
    expect(c).toMatchObject({ aud: PASS_AUDIENCE, sub: pass.id, jti: pass.current!.jti });
    expect(c.exp).toBe(Math.floor(Date.parse(pass.expiresAt) / 1000));
    // About 90 days from now (the default).
    expect((c.exp! * 1000 - Date.now()) / 86_400_000).toBeCloseTo(90, 1);
  });

  it('are re-minted identically from the stored fields (the snippet is never stored)', async () => {
    const { pass, token } = await newPass();
    const again = tokenFromSnippet((await passView((await getPass(firm.firmId, pass.id))!)).snippet!);
    expect(again).toBe(token);
  });

  it('refuse a token whose header names another algorithm, even when signed correctly for it', async () => {
    const { client, pass } = await newPass();
    // Same claims, signed HS512 with the same derived key would need the secret; an attacker's best try is alg "none".
    const header = Buffer.from(JSON.stringify({ alg: 'none', kid: `${client.id}.1` })).toString('base64url');
    const payload = Buffer.from(JSON.stringify({ aud: PASS_AUDIENCE, iss: 'stochos', sub: pass.id, jti: pass.current!.jti, iat: 1, exp: 4_000_000_000 })).toString('base64url');
    expect(await verifyPassToken(`${header}.${payload}.`)).toEqual({ ok: false, failure: 'invalid' });
    // HS512 with a guessed key is refused by the allow-list before any key is tried.
    const hs512 = await new SignJWT({}).setProtectedHeader({ alg: 'HS512', kid: `${client.id}.1` }).setAudience(PASS_AUDIENCE).setSubject(pass.id).setJti(pass.current!.jti).setIssuedAt().setExpirationTime('1h').sign(new Uint8Array(64));
    expect((await verifyPassToken(hs512)).ok).toBe(false);
  });

  it('refuse a tampered payload', async () => {
    const { token } = await newPass();
    const [h, p, s] = token.split('.');
    const claims = JSON.parse(Buffer.from(p!, 'base64url').toString());
    claims.exp += 86_400 * 365;
    const forged = `${h}.${Buffer.from(JSON.stringify(claims)).toString('base64url')}.${s}`;
    expect(await verifyPassToken(forged)).toEqual({ ok: false, failure: 'invalid' });
    const r = await checkPass(claims.sub, forged);
    expect(r).toMatchObject({ ok: false, failure: 'invalid' });
  });

  it('refuse a token signed for another audience (a session token is not a pass)', async () => {
    const { pass } = await newPass();
    const session = await mintSessionToken({ passId: pass.id, passJti: pass.current!.jti, keyVersion: 1, origin: null }, 4_000_000_000);
    expect((await verifyPassToken(session.token)).ok).toBe(false);
  });
});

describe('checkPass', () => {
  it('grants a live pass and names the client, widget and firm', async () => {
    const { client, pass, token } = await newPass();
    const r = await checkPass(pass.id, token);
    expect(r.ok).toBe(true);
    if (r.ok) {
      expect(r.client.id).toBe(client.id);
      expect(r.widget.id).toBe(firm.widgetId);
      expect(r.widget.firmName).toBe('Fixture firm');
    }
  });

  it('refuses a snippet whose id is not the pass of its token, but still knows the client for the message', async () => {
    const { client, token } = await newPass();
    const r = await checkPass(randomUUID(), token);
    expect(r).toMatchObject({ ok: false, failure: 'mismatch' });
    if (!r.ok) expect(r.client?.id).toBe(client.id);
    expect(await checkPass('not-a-uuid', token)).toMatchObject({ ok: false, failure: 'mismatch' });
  });

  it('refuses a missing or malformed pass', async () => {
    expect(await checkPass(randomUUID(), '')).toMatchObject({ ok: false, failure: 'missing' });
    expect(await checkPass(randomUUID(), 'abc')).toMatchObject({ ok: false, failure: 'malformed', client: null });
  });

  it('refuses an expired token (signature checked first)', async () => {
    const { client, pass } = await newPass();
    const past = new Date(Date.now() - 3_600_000).toISOString();
    const expired = await mintPassToken({ passId: pass.id, clientId: client.id, keyVersion: 1, jti: pass.current!.jti, issuedAt: pass.createdAt, expiresAt: past });
    const r = await checkPass(pass.id, expired);
    expect(r).toMatchObject({ ok: false, failure: 'expired' });
    if (!r.ok) expect(r.firmName).toBe('Fixture firm');
  });

  it('refuses a token whose stored expiry has passed', async () => {
    const { pass, token } = await newPass();
    await getDb()('pass_tokens').where({ jti: pass.current!.jti }).update({ expires_at: new Date(Date.now() - 1000).toISOString() });
    expect(await checkPass(pass.id, token)).toMatchObject({ ok: false, failure: 'expired' });
  });

  it('refuses a revoked pass at once', async () => {
    const { pass, token } = await newPass();
    await revokePass(m(), pass.id);
    expect(await checkPass(pass.id, token)).toMatchObject({ ok: false, failure: 'revoked' });
  });

  it('refuses every pass of a client whose key was rotated, and new passes work with the new key', async () => {
    const a = await newPass();
    const { revokedPasses, client } = await rotateKey(m(), a.client.id);
    expect(revokedPasses).toBe(1);
    expect(client.keyVersion).toBe(2);
    expect(await checkPass(a.pass.id, a.token)).toMatchObject({ ok: false, failure: 'rotated' });
    const fresh = await createPass(m(), { clientId: a.client.id, widgetId: firm.widgetId, days: 30 });
    const freshToken = tokenFromSnippet((await passView(fresh)).snippet!);
    expect(decodeProtectedHeader(freshToken).kid).toBe(`${a.client.id}.2`);
    expect((await checkPass(fresh.id, freshToken)).ok).toBe(true);
  });

  it('refuses a token issued before the client’s not-before time even with the current key version', async () => {
    const { client, pass, token } = await newPass();
    await getDb()('clients').where({ id: client.id }).update({ not_before: new Date(Date.now() + 5_000).toISOString() });
    expect(await checkPass(pass.id, token)).toMatchObject({ ok: false, failure: 'rotated' });
  });

  it('suspends passes of an archived client and restores them', async () => {
    const { client, pass, token } = await newPass();
    await editClient(m(), client.id, { archived: true });
    expect(await checkPass(pass.id, token)).toMatchObject({ ok: false, failure: 'archived' });
    await editClient(m(), client.id, { archived: false });
    expect((await checkPass(pass.id, token)).ok).toBe(true);
  });

  it('keeps an older snippet working after a renewal, unless it is retired', async () => {
    const { pass, token } = await newPass();
    const renewed = await renewPass(m(), pass.id, { days: 120, retirePrevious: false });
    const newToken = tokenFromSnippet((await passView(renewed)).snippet!);
    expect(newToken).not.toBe(token);
    expect((await checkPass(pass.id, token)).ok).toBe(true);
    expect((await checkPass(pass.id, newToken)).ok).toBe(true);
    expect((await passView(renewed)).olderSnippetsLive).toBe(1);
    const retired = await renewPass(m(), pass.id, { days: 120, retirePrevious: true });
    const newest = tokenFromSnippet((await passView(retired)).snippet!);
    expect(await checkPass(pass.id, token)).toMatchObject({ ok: false, failure: 'revoked' });
    expect(await checkPass(pass.id, newToken)).toMatchObject({ ok: false, failure: 'revoked' });
    expect((await checkPass(pass.id, newest)).ok).toBe(true);
  });

  it('refuses a pass whose widget was taken down', async () => {
    const { pass, token } = await newPass();
    await getDb()('widgets').where({ id: firm.widgetId }).update({ unpublished_at: new Date().toISOString() });
    try {
      expect(await checkPass(pass.id, token)).toMatchObject({ ok: false, failure: 'unpublished' });
    } finally {
      await getDb()('widgets').where({ id: firm.widgetId }).update({ unpublished_at: null });
    }
  });
});

describe('creating passes', () => {
  it('refuses a widget of another firm and stores nothing', async () => {
    const client = await createClient(m(), { name: 'Cross-firm test', allowedOrigins: ['https://x.example'], allowedEmailDomains: [] });
    const before = await getDb()('passes').count({ n: '*' }).first();
    await expect(createPass(m(), { clientId: client.id, widgetId: other.widgetId, days: 90 })).rejects.toMatchObject({ status: 422, fields: { widgetId: ['No widget of your firm has this id.'] } });
    const after = await getDb()('passes').count({ n: '*' }).first();
    expect(after!.n).toBe(before!.n);
  });

  it('refuses a second live pass for the same client and widget', async () => {
    const { client } = await newPass();
    await expect(createPass(m(), { clientId: client.id, widgetId: firm.widgetId, days: 90 })).rejects.toMatchObject({ status: 409 });
  });

  it('refuses a client name already used in the firm, whatever its case', async () => {
    await createClient(m(), { name: 'Harrowfield Mills', allowedOrigins: ['https://h.example'], allowedEmailDomains: [] });
    await expect(createClient(m(), { name: 'harrowfield mills', allowedOrigins: ['https://h.example'], allowedEmailDomains: [] })).rejects.toBeInstanceOf(AppError);
  });
});

describe('requireViewer (bearer tokens)', () => {
  const req = (token?: string) => new Request('http://localhost/api/embed/x', { headers: token ? { authorization: `Bearer ${token}` } : {} });

  it('accepts the exchanged token for its own pass and re-reads the pass on every call', async () => {
    const { pass } = await newPass();
    const s = await mintSessionToken({ passId: pass.id, passJti: pass.current!.jti, keyVersion: 1, origin: 'http://localhost:4100' }, Math.floor(Date.parse(pass.expiresAt) / 1000));
    const v = await requireViewer(req(s.token), pass.id);
    expect(v.session.origin).toBe('http://localhost:4100');
    await revokePass(m(), pass.id);
    await expect(requireViewer(req(s.token), pass.id)).rejects.toMatchObject({ status: 401 });
  });

  it('answers 401 without a token or with a forged one, 403 for another pass', async () => {
    const a = await newPass();
    const b = await newPass();
    const s = await mintSessionToken({ passId: a.pass.id, passJti: a.pass.current!.jti, keyVersion: 1, origin: null }, 4_000_000_000);
    await expect(requireViewer(req(), a.pass.id)).rejects.toMatchObject({ status: 401 });
    await expect(requireViewer(req(s.token.slice(0, -2) + 'xx'), a.pass.id)).rejects.toMatchObject({ status: 401 });
    await expect(requireViewer(req(a.token), a.pass.id)).rejects.toMatchObject({ status: 401 });
    await expect(requireViewer(req(s.token), b.pass.id)).rejects.toMatchObject({ status: 403 });
  });

  it('ends sessions of a rotated client', async () => {
    const { client, pass } = await newPass();
    const s = await mintSessionToken({ passId: pass.id, passJti: pass.current!.jti, keyVersion: 1, origin: null }, 4_000_000_000);
    await rotateKey(m(), client.id);
    await expect(requireViewer(req(s.token), pass.id)).rejects.toMatchObject({ status: 401 });
  });
});
