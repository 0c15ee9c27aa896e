import { describe, it, expect, inject } from 'vitest';
import http from 'node:http';
import { randomUUID } from 'node:crypto';
import bcrypt from 'bcryptjs';
import Database from 'better-sqlite3';
import fs from 'node:fs';
import path from 'node:path';
import { Client, uniqueEmail } from '../../support/http-client';
import { newFirm, addMember, PASSWORD } from '../../support/firms';
import { waitForMessage, firstLink, listMessages } from '../../support/mailbox';

// Issue 13: sign-up proves the address, password reset and change, the e-mail limits, the redirect after sign-in
// and the development mailbox.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');
const dbFile = () => path.join(inject('dataDir'), 'stochos.sqlite');
// These tests reach into the SQLite file; under `npm run test:postgres` the same routes are covered by the others.
const onPostgres = fs.existsSync(path.join(inject('dataDir'), 'database-url'));

function withDb<T>(fn: (db: Database.Database) => T): T {
  const db = new Database(dbFile());
  try {
    db.pragma('busy_timeout = 5000');
    return fn(db);
  } finally {
    db.close();
  }
}
const userRow = (email: string) => withDb((db) => db.prepare('select id, email_verified_at from users where email = ?').get(email) as { id: string; email_verified_at: string | null } | undefined);
const signUpBody = (email: string, password = PASSWORD) => ({ firmName: 'Harrowgate Gauging', name: 'Ines Quarry', email, password });

async function confirmToken(email: string): Promise<string> {
  const msg = await waitForMessage(mailboxUrl, email, /Confirm your e-mail address/);
  return firstLink(msg.text, /\/sign-up\/confirm\/[A-Za-z0-9_-]+/).split('/').pop()!;
}

async function resetToken(email: string, nth = 0): Promise<string> {
  const start = Date.now();
  for (;;) {
    const found = (await listMessages(mailboxUrl, email)).filter((m) => /Set a new Stochos password/.test(m.subject));
    if (found.length > nth) return firstLink(found[0]!.text, /\/reset-password\/[A-Za-z0-9_-]+/).split('/').pop()!;
    if (Date.now() - start > 15_000) throw new Error(`no reset message ${nth + 1} for ${email}`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

async function askSignInLink(c: Client, email: string): Promise<Response> {
  const csrf = (await (await c.get('/api/auth/csrf')).json()) as { csrfToken: string };
  const form = new URLSearchParams({ csrfToken: csrf.csrfToken, email, json: 'true', callbackUrl: `${appUrl}/app` });
  return c.request('POST', '/api/auth/signin/email', form.toString(), { 'content-type': 'application/x-www-form-urlencoded' });
}

describe('sign-up proves the address', () => {
  it.skipIf(onPostgres)('issues no session, creates nothing until the link is followed, then opens the account', async () => {
    const email = uniqueEmail('proof');
    const c = new Client(appUrl);
    const res = await c.json<{ email: string }>('POST', '/api/sign-up', signUpBody(email));
    expect(res.status).toBe(202);
    expect(c.hasSession()).toBe(false);
    expect(userRow(email)).toBeUndefined();
    // No password sign-in before the link.
    expect((await new Client(appUrl).signIn(email, PASSWORD)).ok).toBe(false);

    const token = await confirmToken(email);
    const wrong = await c.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/sign-up/confirm', { token, password: 'not the chosen one' });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.fields.password![0]).toMatch(/not the password chosen/);
    expect(userRow(email)).toBeUndefined();

    expect((await c.post('/api/sign-up/confirm', { token, password: PASSWORD })).status).toBe(201);
    expect(userRow(email)!.email_verified_at).not.toBeNull();
    const owner = new Client(appUrl);
    expect((await owner.signIn(email, PASSWORD)).ok).toBe(true);
    expect((await owner.json<{ role: string; firm: { name: string } }>('GET', '/api/me')).body).toMatchObject({ role: 'owner', firm: { name: 'Harrowgate Gauging' } });
    // The link works once.
    expect((await c.post('/api/sign-up/confirm', { token, password: PASSWORD })).status).toBe(404);
  });

  it('answers the same for an address that already has an account, and e-mails that person a notice', async () => {
    const { email } = await newFirm(appUrl, 'taken');
    const fresh = uniqueEmail('fresh');
    const a = await new Client(appUrl).request('POST', '/api/sign-up', signUpBody(email, 'someone else entirely'));
    const b = await new Client(appUrl).request('POST', '/api/sign-up', signUpBody(fresh, 'someone else entirely'));
    expect(a.status).toBe(b.status);
    expect(await a.json()).toEqual({ email });
    expect(await b.json()).toEqual({ email: fresh });
    const notice = await waitForMessage(mailboxUrl, email, /tried to sign up on Stochos with your address/);
    expect(notice.text).toMatch(/nothing was created or changed/);
    expect(notice.text).not.toMatch(/sign-up\/confirm/);
    // The existing password still works, the new one does not.
    expect((await new Client(appUrl).signIn(email, PASSWORD)).ok).toBe(true);
  });

  it('someone else’s sign-up for an address does not block an invitation to it', async () => {
    const victim = uniqueEmail('victim');
    expect((await new Client(appUrl).post('/api/sign-up', signUpBody(victim, 'attacker password 1'))).status).toBe(202);
    const { owner } = await newFirm(appUrl, 'inviter');
    expect((await owner.post('/api/team/invitations', { email: victim, role: 'author' })).status).toBe(201);
    const token = firstLink((await waitForMessage(mailboxUrl, victim, /invited you/)).text, /\/invite\/[A-Za-z0-9_-]+/).split('/').pop()!;
    expect((await new Client(appUrl).post('/api/invitations/accept', { token, name: 'Vera Victim', password: PASSWORD })).status).toBe(201);
    // The attacker's pending sign-up is void now: its link opens nothing and the attacker's password is useless.
    const pending = await confirmToken(victim);
    expect((await new Client(appUrl).post('/api/sign-up/confirm', { token: pending, password: 'attacker password 1' })).status).toBe(409);
    expect((await new Client(appUrl).signIn(victim, 'attacker password 1')).ok).toBe(false);
  });

  it.skipIf(onPostgres)('an older account whose address was never confirmed signs in by link first', async () => {
    const { email } = await newFirm(appUrl, 'legacy');
    withDb((db) => db.prepare('update users set email_verified_at = null where email = ?').run(email));
    const refused = await new Client(appUrl).signIn(email, PASSWORD);
    expect(refused.ok).toBe(false);
    expect(decodeURIComponent(refused.error ?? '')).toMatch(/Confirm your e-mail address first/);
    const c = new Client(appUrl);
    expect((await askSignInLink(c, email)).status).toBe(200);
    const link = firstLink((await waitForMessage(mailboxUrl, email, /sign-in link/)).text, /http:\/\/localhost:\d+\/api\/auth\/callback\/email\S+/);
    await c.get(link.replace(appUrl, ''));
    expect(c.hasSession()).toBe(true);
    expect((await new Client(appUrl).signIn(email, PASSWORD)).ok).toBe(true);
  });

  it.skipIf(onPostgres)('an invitation e-mailed to an unconfirmed account confirms its address', async () => {
    const email = uniqueEmail('unconfirmed');
    const hash = await bcrypt.hash(PASSWORD, 4);
    withDb((db) => db.prepare('insert into users (id, email, name, password_hash, created_at) values (?,?,?,?,?)').run(randomUUID(), email, 'Una Confirmed', hash, new Date().toISOString()));
    const { owner } = await newFirm(appUrl, 'inviter-2');
    expect((await owner.post('/api/team/invitations', { email, role: 'checker' })).status).toBe(201);
    const token = firstLink((await waitForMessage(mailboxUrl, email, /invited you/)).text, /\/invite\/[A-Za-z0-9_-]+/).split('/').pop()!;
    expect((await new Client(appUrl).post('/api/invitations/accept', { token, password: PASSWORD })).status).toBe(201);
    expect((await new Client(appUrl).signIn(email, PASSWORD)).ok).toBe(true);
  });

  it.skipIf(onPostgres)('a confirmation link expires', async () => {
    const email = uniqueEmail('late');
    await new Client(appUrl).post('/api/sign-up', signUpBody(email));
    const token = await confirmToken(email);
    withDb((db) => db.prepare('update pending_sign_ups set expires_at = ? where email = ?').run('2020-01-01T00:00:00.000Z', email));
    const res = await new Client(appUrl).json<{ error: { message: string } }>('POST', '/api/sign-up/confirm', { token, password: PASSWORD });
    expect(res.status).toBe(410);
    expect(res.body.error.message).toMatch(/expired/);
  });
});

describe('password reset', () => {
  it('answers the same for an unknown address and sends it nothing', async () => {
    const nobody = uniqueEmail('nobody-reset');
    const { email } = await newFirm(appUrl, 'reset-known');
    const a = await new Client(appUrl).request('POST', '/api/password-reset', { email: nobody });
    const b = await new Client(appUrl).request('POST', '/api/password-reset', { email });
    expect(a.status).toBe(202);
    expect(b.status).toBe(202);
    expect(await a.json()).toEqual({ email: nobody });
    await resetToken(email);
    expect(await listMessages(mailboxUrl, nobody)).toHaveLength(0);
  });

  it('sets a new password once, ends every other session, and the link then stops working', async () => {
    const { owner, email } = await newFirm(appUrl, 'reset');
    const other = owner.clone();
    expect((await other.get('/api/me')).status).toBe(200);
    await new Client(appUrl).post('/api/password-reset', { email });
    const token = await resetToken(email);
    const weak = await new Client(appUrl).json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/password-reset/confirm', { token, password: 'é'.repeat(40) });
    expect(weak.status).toBe(422);
    expect(weak.body.error.fields.password![0]).toMatch(/72 bytes/);
    const res = await new Client(appUrl).json<{ email: string; canSignIn: boolean }>('POST', '/api/password-reset/confirm', { token, password: 'a brand new passphrase' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ email, canSignIn: true });
    expect((await other.get('/api/me')).status).toBe(401);
    expect((await owner.get('/api/me')).status).toBe(401);
    expect((await new Client(appUrl).signIn(email, PASSWORD)).ok).toBe(false);
    expect((await new Client(appUrl).signIn(email, 'a brand new passphrase')).ok).toBe(true);
    const again = await new Client(appUrl).json<{ error: { message: string } }>('POST', '/api/password-reset/confirm', { token, password: 'yet another passphrase' });
    expect(again.status).toBe(410);
    expect(again.body.error.message).toMatch(/already used/);
    await waitForMessage(mailboxUrl, email, /password was changed/);
    const audit = await (await newSignedIn(email, 'a brand new passphrase')).json<{ entries: { action: string }[] }>('GET', '/api/audit');
    expect(audit.body.entries.map((e) => e.action)).toContain('user.password_reset');
  });

  it.skipIf(onPostgres)('a link expires after 30 minutes', async () => {
    const { email } = await newFirm(appUrl, 'reset-late');
    await new Client(appUrl).post('/api/password-reset', { email });
    const token = await resetToken(email);
    const id = userRow(email)!.id;
    const { minutes } = withDb((db) => db.prepare('select (julianday(expires_at) - julianday(created_at)) * 1440 as minutes from password_resets where user_id = ?').get(id) as { minutes: number });
    expect(minutes).toBeCloseTo(30, 1);
    withDb((db) => db.prepare('update password_resets set expires_at = ? where user_id = ?').run(new Date(Date.now() - 1000).toISOString(), id));
    const res = await new Client(appUrl).json<{ error: { message: string } }>('POST', '/api/password-reset/confirm', { token, password: 'a brand new passphrase' });
    expect(res.status).toBe(410);
    expect(res.body.error.message).toMatch(/expired/);
  });
});

async function newSignedIn(email: string, password: string): Promise<Client> {
  const c = new Client(appUrl);
  const s = await c.signIn(email, password);
  if (!s.ok) throw new Error(`sign-in failed: ${s.error}`);
  return c;
}

describe('password change', () => {
  it('needs the current password, ends the other sessions, and the new password signs in', async () => {
    const { owner, email } = await newFirm(appUrl, 'change');
    const other = owner.clone();
    const wrong = await owner.json<{ error: { fields: Record<string, string[]> } }>('POST', '/api/me/password', { currentPassword: 'not my password', newPassword: 'a fresh passphrase' });
    expect(wrong.status).toBe(422);
    expect(wrong.body.error.fields.currentPassword![0]).toMatch(/not your current password/);
    expect((await owner.post('/api/me/password', { currentPassword: PASSWORD, newPassword: 'a fresh passphrase' })).status).toBe(200);
    expect((await other.get('/api/me')).status).toBe(401);
    expect((await new Client(appUrl).signIn(email, PASSWORD)).ok).toBe(false);
    const again = await newSignedIn(email, 'a fresh passphrase');
    const audit = await again.json<{ entries: { action: string }[] }>('GET', '/api/audit');
    expect(audit.body.entries.map((e) => e.action)).toContain('user.password_changed');
  });

  it('works for authors and checkers too', async () => {
    const { owner } = await newFirm(appUrl, 'change-team');
    const author = await addMember(appUrl, mailboxUrl, owner, 'author');
    expect((await author.client.post('/api/me/password', { currentPassword: PASSWORD, newPassword: 'an author passphrase' })).status).toBe(200);
    expect((await new Client(appUrl).signIn(author.email, 'an author passphrase')).ok).toBe(true);
  });
});

describe('e-mail limits', () => {
  it('sign-in links: 5 per address per hour, then 429 with Retry-After and a message', async () => {
    const { email } = await newFirm(appUrl, 'link-limit');
    const c = new Client(appUrl);
    for (let i = 0; i < 5; i++) expect((await askSignInLink(c, email)).status).toBe(200);
    const res = await askSignInLink(c, email);
    expect(res.status).toBe(429);
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
    const body = (await res.json()) as { url: string; error: { message: string } };
    expect(body.error.message).toMatch(/Too many sign-in links were requested for this address/);
    // The browser's sign-in helper reads the message from the url.
    expect(new URL(body.url).searchParams.get('error')).toMatch(/Too many sign-in links/);
    // Unknown addresses count the same, so the limit reveals nothing.
    const nobody = uniqueEmail('nobody-link');
    for (let i = 0; i < 5; i++) expect((await askSignInLink(c, nobody)).status).toBe(200);
    expect((await askSignInLink(c, nobody.toUpperCase())).status).toBe(429);
  });

  it('password resets: 5 per address per hour', async () => {
    const email = uniqueEmail('reset-limit');
    for (let i = 0; i < 5; i++) expect((await new Client(appUrl).post('/api/password-reset', { email })).status).toBe(202);
    const res = await new Client(appUrl).json<{ error: { message: string; retryAfter: number } }>('POST', '/api/password-reset', { email });
    expect(res.status).toBe(429);
    expect(res.body.error.message).toMatch(/Too many password-reset links/);
    expect(res.body.error.retryAfter).toBeGreaterThan(0);
  });

  it('sign-ups: 5 per address per hour', async () => {
    const email = uniqueEmail('signup-limit');
    for (let i = 0; i < 5; i++) expect((await new Client(appUrl).post('/api/sign-up', signUpBody(email))).status).toBe(202);
    const res = await new Client(appUrl).request('POST', '/api/sign-up', signUpBody(email));
    expect(res.status).toBe(429);
    expect(res.headers.get('retry-after')).toMatch(/^\d+$/);
  });

  it('invitations: 50 per firm per 24 hours, even when each is withdrawn', async () => {
    const { owner } = await newFirm(appUrl, 'invite-limit');
    for (let i = 0; i < 50; i++) {
      const inv = await owner.json<{ invitation: { id: string } }>('POST', '/api/team/invitations', { email: uniqueEmail('spam'), role: 'author' });
      expect(inv.status).toBe(201);
      expect((await owner.del(`/api/team/invitations/${inv.body.invitation.id}`)).status).toBe(204);
    }
    const res = await owner.request('POST', '/api/team/invitations', { email: uniqueEmail('spam'), role: 'author' });
    expect(res.status).toBe(429);
    expect(Number(res.headers.get('retry-after'))).toBeGreaterThan(0);
    expect(((await res.json()) as { error: { message: string } }).error.message).toMatch(/50 invitations in the last 24 hours/);
  });
});

describe('redirect after sign-in', () => {
  it('does not carry a next path that the browser would read as another origin', async () => {
    for (const q of ['next=/%09/evil.example', 'next=/%5Cevil.example', 'callbackUrl=https://evil.example/app', 'next=/.//evil.example']) {
      const html = await (await fetch(`${appUrl}/sign-in?${q}`)).text();
      // The page echoes its own query string; what matters is the target handed to the sign-in forms.
      const target = /\\"next\\":\\"([^\\]*)\\"/.exec(html)?.[1];
      expect(target, q).toBe('/app');
    }
  });
});

// fetch() cannot set Host; node:http can.
function rawGet(url: string, headers: Record<string, string>): Promise<number> {
  return new Promise((resolve, reject) => {
    const req = http.request(url, { method: 'GET', headers }, (res) => {
      res.resume();
      res.on('end', () => resolve(res.statusCode ?? 0));
    });
    req.on('error', reject);
    req.end();
  });
}

describe('development mailbox', () => {
  it('answers on loopback only', async () => {
    expect(await rawGet(`${appUrl}/api/dev/mailbox`, {})).toBe(200);
    expect(await rawGet(`${appUrl}/api/dev/mailbox`, { host: 'stochos.example' })).toBe(404);
    expect(await rawGet(`${appUrl}/api/dev/mailbox`, { 'x-forwarded-for': '203.0.113.9' })).toBe(404);
    expect(await rawGet(`${appUrl}/dev/mailbox`, { host: 'stochos.example' })).toBe(404);
  });
});
