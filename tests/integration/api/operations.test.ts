import { describe, it, expect, inject } from 'vitest';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import Database from 'better-sqlite3';
import { startStack } from '@/lib/dev/stack';
import { demoPass } from '../../support/demo-pass';

// Readiness, request ids, and a clean stop that loses no batched event, against the production build.
const appUrl = inject('appUrl');
const OFF = Number(process.env.TEST_PORT_OFFSET ?? 0);

describe('readiness and request ids', () => {
  it('GET /api/ready answers 200 with every check passed, never cached', async () => {
    const res = await fetch(`${appUrl}/api/ready`);
    expect(res.status).toBe(200);
    expect(res.headers.get('cache-control')).toBe('no-store');
    expect(await res.json()).toMatchObject({ ready: true, reason: null, checks: { database: true, migrations: true, accepting: true }, pendingMigrations: 0 });
  });

  it('returns the X-Request-Id it was given, or a new one, on answers and errors alike', async () => {
    const given = await fetch(`${appUrl}/api/me`, { headers: { 'x-request-id': 'edge-7f3a-0042' } });
    expect(given.status).toBe(401);
    expect(given.headers.get('x-request-id')).toBe('edge-7f3a-0042');
    const fresh = await fetch(`${appUrl}/api/ready`);
    expect(fresh.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
  });
});

describe('a clean stop (SIGTERM)', () => {
  it('writes every page load and dial move counted before it, though they are batched after the response', async () => {
    const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-stop-'));
    // A long flush interval: only the shutdown itself can have written these events.
    const stack = await startStack({ dataDir, appPort: 3360 + OFF, smtpPort: 2765 + OFF, mailboxPort: 2766 + OFF, stripePort: 12_361 + OFF, seed: true, quiet: true, extraEnv: { EVENT_FLUSH_MS: '60000' } });
    let stopped = false;
    try {
      const { passId, token } = await demoPass(stack.appUrl);
      const db = new Database(path.join(dataDir, 'stochos.sqlite'), { readonly: true });
      const count = (kind: string) => (db.prepare('select count(*) as n from pass_events where pass_id = ? and kind = ?').get(passId, kind) as { n: number }).n;
      const loads0 = count('load');
      const dials0 = count('dial');
      const exchange = () => fetch(`${stack.appUrl}/api/embed/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ passId, pass: token }) });
      const bearer = ((await (await exchange()).json()) as { token: string }).token;
      const auth = { authorization: `Bearer ${bearer}` };
      const w = (await (await fetch(`${stack.appUrl}/api/embed/passes/${passId}/widget`, { headers: auth })).json()) as { widget: { dialIds: string[] }; model: { dials: { id: string; min: number }[] } };
      const dial = w.model.dials.find((d) => d.id === w.widget.dialIds[0])!;
      for (let i = 0; i < 20; i++) expect((await exchange()).status).toBe(200);
      for (let i = 0; i < 20; i++) {
        const r = await fetch(`${stack.appUrl}/api/embed/passes/${passId}/events`, { method: 'POST', headers: { ...auth, 'content-type': 'application/json' }, body: JSON.stringify({ kind: 'dial', dialId: dial.id, value: dial.min }) });
        expect(r.status).toBe(204);
      }
      // Batched: nothing written yet.
      expect(count('load')).toBe(loads0);
      expect(count('dial')).toBe(dials0);
      await stack.stop();
      stopped = true;
      expect(count('load') - loads0).toBe(21);
      expect(count('dial') - dials0).toBe(20);
      db.close();
    } finally {
      if (!stopped) await stack.stop();
      fs.rmSync(dataDir, { recursive: true, force: true });
    }
  });
});
