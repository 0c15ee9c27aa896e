import { describe, it, expect, inject, beforeAll } from 'vitest';
import type Database from 'better-sqlite3';
import { Client, uniqueEmail } from '../../support/http-client';
import { newFirm, addMember, PASSWORD } from '../../support/firms';
import { waitForMessage, firstLink, listMessages } from '../../support/mailbox';
import { openTestDb } from '../../support/db-direct';

const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');
function withDb<T>(fn: (db: Database.Database) => T): T {
  const db = openTestDb(inject('dataDir'));
  try {
    return fn(db);
  } finally {
    db.close();
  }
}

describe('sign-up', () => {
  it('creates a firm whose creator is the owner', async () => {
    const { owner, email } = await newFirm(appUrl, 'signup');
    const me = await owner.json<{ role: string; user: { email: string }; firm: { name: string } }>('GET', '/api/me');
    expect(me.status).toBe(200);
    expect(me.body.role).toBe('owner');
    expect(me.body.user.email).toBe(email);
  });

  it('answers a sign-up for a taken address like any other, and writes nothing', async () => {
    const { email } = await newFirm(appUrl, 'dup');
    const firmsBefore = withDb((db) => (db.prepare('select count(*) n from firms').get() as { n: number }).n);
    const res = await new Client(appUrl).json<{ email: string }>('POST', '/api/sign-up', { firmName: 'Another', name: 'X', email, password: PASSWORD });
    expect(res.status).toBe(202);
    expect(res.body).toEqual({ email });
    expect(withDb((db) => (db.prepare('select count(*) n from firms').get() as { n: number }).n)).toBe(firmsBefore);
  });

  it('names every bad field', async () => {
    const res = await new Client(appUrl).json<{ error: { code: string; fields: Record<string, string[]> } }>('POST', '/api/sign-up', { firmName: 'A', name: '', email: 'not-an-email', password: 'short' });
    expect(res.status).toBe(422);
    expect(res.body.error.code).toBe('validation_failed');
    expect(Object.keys(res.body.error.fields).sort()).toEqual(['email', 'firmName', 'name', 'password']);
  });

  it('refuses malformed JSON, a wrong content type and a cross-site post', async () => {
    const c = new Client(appUrl);
    expect((await c.request('POST', '/api/sign-up', '{"firmName":', { 'content-type': 'application/json' })).status).toBe(400);
    expect((await c.request('POST', '/api/sign-up', 'firmName=x', { 'content-type': 'application/x-www-form-urlencoded' })).status).toBe(415);
    const email = uniqueEmail('csrf');
    const res = await c.request('POST', '/api/sign-up', { firmName: 'Evil', name: 'E', email, password: PASSWORD }, { origin: 'https://attacker.example' });
    expect(res.status).toBe(403);
    expect(withDb((db) => db.prepare('select id from users where email = ?').get(email))).toBeUndefined();
  });
});

describe('sign-in', () => {
  it('rate-limits failed sign-ins per account with a clear message', async () => {
    const { email } = await newFirm(appUrl, 'ratelimit');
    const c = new Client(appUrl);
    for (let i = 0; i < 5; i++) expect((await c.signIn(email, 'wrong password!')).error).toBe('CredentialsSignin');
    const blocked = await c.signIn(email, PASSWORD);
    expect(blocked.ok).toBe(false);
    expect(decodeURIComponent(blocked.error ?? '')).toMatch(/Too many failed sign-ins for this account/);
  });

  it('signs in once with an e-mailed link, and the link does not work twice', async () => {
    const { email } = await newFirm(appUrl, 'link');
    const c = new Client(appUrl);
    const csrf = (await (await c.get('/api/auth/csrf')).json()) as { csrfToken: string };
    const form = new URLSearchParams({ csrfToken: csrf.csrfToken, email, json: 'true', callbackUrl: `${appUrl}/app` });
    const req = await c.request('POST', '/api/auth/signin/email', form.toString(), { 'content-type': 'application/x-www-form-urlencoded' });
    expect(req.status).toBe(200);
    const msg = await waitForMessage(mailboxUrl, email, /sign-in link/);
    const link = firstLink(msg.text, /http:\/\/localhost:\d+\/api\/auth\/callback\/email\S+/);
    const first = await c.get(link.replace(appUrl, ''));
    expect(first.headers.get('location')).toMatch(/\/app$/);
    expect(c.hasSession()).toBe(true);
    expect((await c.get('/api/me')).status).toBe(200);
    const again = await new Client(appUrl).get(link.replace(appUrl, ''));
    expect(again.headers.get('location')).toMatch(/error=Verification/);
  });

  it('sends no link to an unknown address but answers the same', async () => {
    const c = new Client(appUrl);
    const email = uniqueEmail('nobody');
    const csrf = (await (await c.get('/api/auth/csrf')).json()) as { csrfToken: string };
    const form = new URLSearchParams({ csrfToken: csrf.csrfToken, email, json: 'true' });
    const res = await c.request('POST', '/api/auth/signin/email', form.toString(), { 'content-type': 'application/x-www-form-urlencoded' });
    expect(res.status).toBe(200);
    await new Promise((r) => setTimeout(r, 500));
    expect(await listMessages(mailboxUrl, email)).toHaveLength(0);
  });

  it('sign-out ends the session, even for a copied cookie', async () => {
    const { owner } = await newFirm(appUrl, 'signout');
    const copy = owner.clone();
    const csrf = (await (await owner.get('/api/auth/csrf')).json()) as { csrfToken: string };
    await owner.request('POST', '/api/auth/signout', new URLSearchParams({ csrfToken: csrf.csrfToken, json: 'true' }).toString(), { 'content-type': 'application/x-www-form-urlencoded' });
    expect((await owner.get('/api/me')).status).toBe(401);
    expect((await copy.get('/api/me')).status).toBe(401);
  });
});

describe('team', () => {
  let owner: Client;
  beforeAll(async () => {
    owner = (await newFirm(appUrl, 'team')).owner;
  });

  it('invites an author who accepts, signs in, and whose role change applies on the next request', async () => {
    const author = await addMember(appUrl, mailboxUrl, owner, 'author');
    expect((await author.client.json<{ role: string }>('GET', '/api/me')).body.role).toBe('author');
    expect((await owner.patch(`/api/team/members/${author.membershipId}`, { role: 'checker' })).status).toBe(200);
    expect((await author.client.json<{ role: string }>('GET', '/api/me')).body.role).toBe('checker');
    // The audit log recorded both steps.
    const audit = await owner.json<{ entries: { action: string }[] }>('GET', '/api/audit');
    expect(audit.body.entries.map((e) => e.action)).toEqual(expect.arrayContaining(['member.invited', 'member.joined', 'member.role_changed']));
  });

  it('a removed member’s old session is refused at once', async () => {
    const checker = await addMember(appUrl, mailboxUrl, owner, 'checker');
    expect((await checker.client.get('/api/me')).status).toBe(200);
    expect((await owner.del(`/api/team/members/${checker.membershipId}`)).status).toBe(204);
    expect((await checker.client.get('/api/me')).status).toBe(401);
    expect((await new Client(appUrl).signIn(checker.email, PASSWORD)).ok).toBe(false);
  });

  it('refuses a reused or expired invitation with 410', async () => {
    const email = uniqueEmail('expiry');
    await owner.post('/api/team/invitations', { email, role: 'author' });
    const token = firstLink((await waitForMessage(mailboxUrl, email, /invited you/)).text, /\/invite\/[A-Za-z0-9_-]+/).split('/').pop()!;
    withDb((db) => db.prepare('update invitations set expires_at = ? where email = ?').run('2020-01-01T00:00:00.000Z', email));
    const expired = await new Client(appUrl).json<{ error: { message: string } }>('POST', '/api/invitations/accept', { token, name: 'Late', password: PASSWORD });
    expect(expired.status).toBe(410);
    expect(expired.body.error.message).toMatch(/expired/);
    expect(withDb((db) => db.prepare('select id from users where email = ?').get(email))).toBeUndefined();
  });

  it('accepts an invitation once only', async () => {
    const email = uniqueEmail('once');
    await owner.post('/api/team/invitations', { email, role: 'checker' });
    const token = firstLink((await waitForMessage(mailboxUrl, email, /invited you/)).text, /\/invite\/[A-Za-z0-9_-]+/).split('/').pop()!;
    const c = new Client(appUrl);
    expect((await c.post('/api/invitations/accept', { token, name: 'Once', password: PASSWORD })).status).toBe(201);
    const again = await c.json<{ error: { message: string } }>('POST', '/api/invitations/accept', { token, name: 'Once', password: PASSWORD });
    expect(again.status).toBe(410);
    expect(again.body.error.message).toMatch(/already used/);
  });

  it('keeps at least one owner', async () => {
    const team = await owner.json<{ members: { id: string; role: string }[] }>('GET', '/api/team');
    const self = team.body.members.find((m) => m.role === 'owner')!;
    expect((await owner.patch(`/api/team/members/${self.id}`, { role: 'author' })).status).toBe(409);
    expect((await owner.del(`/api/team/members/${self.id}`)).status).toBe(409);
  });

  it('refuses an invitation beyond the trial’s seats with a message that says how many are in use', async () => {
    const { owner: o } = await newFirm(appUrl, 'seats');
    for (let i = 0; i < 3; i++) expect((await o.post('/api/team/invitations', { email: uniqueEmail('seat'), role: 'author' })).status).toBe(201);
    const res = await o.json<{ error: { message: string } }>('POST', '/api/team/invitations', { email: uniqueEmail('seat'), role: 'author' });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/0 of 3 in use and 3 invitations pending/);
  });
});

describe('tenant isolation', () => {
  it('a member of firm B asking for firm A’s records by id gets 404', async () => {
    const a = await newFirm(appUrl, 'iso-a');
    const member = await addMember(appUrl, mailboxUrl, a.owner, 'author');
    const b = await newFirm(appUrl, 'iso-b');
    expect((await b.owner.patch(`/api/team/members/${member.membershipId}`, { role: 'checker' })).status).toBe(404);
    expect((await b.owner.del(`/api/team/members/${member.membershipId}`)).status).toBe(404);
    expect((await b.owner.post(`/api/team/members/${member.membershipId}/reactivate`)).status).toBe(404);
    const inv = await a.owner.json<{ invitation: { id: string } }>('POST', '/api/team/invitations', { email: uniqueEmail('iso'), role: 'author' });
    expect((await b.owner.del(`/api/team/invitations/${inv.body.invitation.id}`)).status).toBe(404);
    expect((await a.owner.json<{ role: string }>('GET', '/api/me')).body.role).toBe('owner');
  });
});
