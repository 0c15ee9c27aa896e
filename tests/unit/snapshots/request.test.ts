// The viewer's request: every refusal is clear and queues nothing; the limits answer 429 with a retry time.
import { beforeAll, describe, expect, it } from 'vitest';
import { useFreshDb } from '../../support/test-db';
import { getDb } from '@/db/knex';
import { AppError } from '@/lib/server/http/errors';
import { requestSnapshot } from '@/lib/server/snapshots/request';
import { normaliseEmail } from '@/lib/server/snapshots/schemas';
import { SNAPSHOT_LIMITS, retryAfterSeconds, SNAPSHOT_WINDOW_MS } from '@/lib/server/snapshots/limits';
import { backoffMs } from '@/lib/server/snapshots/worker';
import { seedWidget, viewerFor } from './fixture';

beforeAll(async () => {
  await useFreshDb();
});

const jobs = async (passId: string) => Number(((await getDb()('snapshot_jobs').where({ pass_id: passId }).count({ n: '*' }).first()) as { n: number }).n);

async function refusal(p: Promise<unknown>): Promise<AppError> {
  const e = await p.then(
    () => null,
    (err: unknown) => err,
  );
  expect(e).toBeInstanceOf(AppError);
  return e as AppError;
}

describe('snapshot request', () => {
  it('refuses an address outside the allowed domains with 403 naming them', async () => {
    const s = await seedWidget({ domains: ['client.example', 'partner.example'] });
    const e = await refusal(requestSnapshot(await viewerFor(s), { email: 'someone@elsewhere.example', dialValues: {} }, 'r1'));
    expect(e.status).toBe(403);
    expect(e.message).toContain('@client.example, @partner.example');
    expect(e.message).toContain('elsewhere.example is not one of them');
    expect(await jobs(s.passId)).toBe(0);
  });

  it('refuses every address when the client lists no domains, naming the reason, and queues nothing', async () => {
    const s = await seedWidget({ domains: [] });
    const e = await refusal(requestSnapshot(await viewerFor(s), { email: 'a@anywhere.example', dialValues: {} }, 'r2'));
    expect(e.status).toBe(403);
    expect(e.message).toMatch(/cannot be e-mailed: .* has not named any e-mail domain of your organisation/);
    expect(await jobs(s.passId)).toBe(0);
  });

  it('accepts any domain only when the firm chose "any address" for the client', async () => {
    const s = await seedWidget({ domains: [], anyAddress: true });
    const r = await requestSnapshot(await viewerFor(s), { email: 'a@anywhere.example', dialValues: {} }, 'r2b');
    expect(r.state).toBe('queued');
    expect(await jobs(s.passId)).toBe(1);
  });

  it.each(['not-an-address', 'a@b', 'two@@client.example', '.dot@client.example', 'a..b@client.example', ''])('refuses the malformed address %j with 422', async (email) => {
    const s = await seedWidget();
    const e = await refusal(requestSnapshot(await viewerFor(s), { email, dialValues: {} }, 'r3'));
    expect(e.status).toBe(422);
    expect(e.fields?.email?.[0]).toBeTruthy();
    expect(await jobs(s.passId)).toBe(0);
  });

  it('refuses dial values out of range or for dials this widget does not have', async () => {
    const s = await seedWidget();
    const v = await viewerFor(s);
    const out = await refusal(requestSnapshot(v, { email: 'a@client.example', dialValues: { spacer_length: 999 } }, 'r4'));
    expect(out.status).toBe(422);
    expect(out.fields?.['dialValues.spacer_length']?.[0]).toMatch(/outside the dial's range/);
    const other = await refusal(requestSnapshot(v, { email: 'a@client.example', dialValues: { bore_diameter: 1 } }, 'r4'));
    expect(other.status).toBe(422);
    expect(other.fields?.['dialValues.bore_diameter']?.[0]).toMatch(/no dial 'bore_diameter'/);
    expect(await jobs(s.passId)).toBe(0);
  });

  it('refuses a request for a version the viewer no longer sees (409)', async () => {
    const s = await seedWidget();
    const e = await refusal(requestSnapshot(await viewerFor(s), { email: 'a@client.example', dialValues: {}, version: 1 }, 'r5'));
    expect(e.status).toBe(409);
    expect(await jobs(s.passId)).toBe(0);
  });

  it('a burst to one recipient: the first five are queued, the rest get 429 with a retry time and queue nothing', async () => {
    const s = await seedWidget();
    const v = await viewerFor(s);
    const results = [];
    for (let i = 0; i < SNAPSHOT_LIMITS.recipient + 3; i++) {
      results.push(await requestSnapshot(v, { email: 'burst@client.example', dialValues: {} }, `burst-${i}`).then(() => 202, (e: AppError) => e));
    }
    expect(results.slice(0, SNAPSHOT_LIMITS.recipient)).toEqual(Array(SNAPSHOT_LIMITS.recipient).fill(202));
    for (const r of results.slice(SNAPSHOT_LIMITS.recipient)) {
      expect(r).toBeInstanceOf(AppError);
      const e = r as AppError;
      expect(e.status).toBe(429);
      expect(e.retryAfter).toBeGreaterThan(3500);
      expect(e.retryAfter).toBeLessThanOrEqual(3600);
      expect(e.message).toMatch(/Try again in 60 minutes\./);
    }
    expect(await jobs(s.passId)).toBe(SNAPSHOT_LIMITS.recipient);
    const events = await getDb()('pass_events').where({ pass_id: s.passId, kind: 'snapshot' }).count({ n: '*' }).first();
    expect(Number((events as { n: number }).n)).toBe(SNAPSHOT_LIMITS.recipient);
  });

  it('a simultaneous burst to one recipient still queues exactly five (on PostgreSQL the requests really overlap)', async () => {
    const s = await seedWidget();
    const v = await viewerFor(s);
    const results = await Promise.all(
      Array.from({ length: SNAPSHOT_LIMITS.recipient + 7 }, (_, i) =>
        requestSnapshot(v, { email: 'together@client.example', dialValues: {} }, `together-${i}`).then(
          () => 202,
          (e: AppError) => e.status,
        ),
      ),
    );
    expect(results.filter((r) => r === 202)).toHaveLength(SNAPSHOT_LIMITS.recipient);
    expect(results.filter((r) => r === 429)).toHaveLength(7);
    expect(await jobs(s.passId)).toBe(SNAPSHOT_LIMITS.recipient);
  });

  it('limits one requester across recipients', async () => {
    const s = await seedWidget();
    const v = await viewerFor(s);
    for (let i = 0; i < SNAPSHOT_LIMITS.requester; i++) await requestSnapshot(v, { email: `p${i}@client.example`, dialValues: {} }, 'same-requester');
    const e = await refusal(requestSnapshot(v, { email: 'another@client.example', dialValues: {} }, 'same-requester'));
    expect(e.status).toBe(429);
    expect(e.message).toMatch(/You have asked for 10 snapshots/);
  });
});

describe('helpers', () => {
  it('normalises addresses: domain lower-cased, local part kept', () => {
    expect(normaliseEmail('  Ann.Lee@Client.Example ')).toEqual({ ok: true, address: 'Ann.Lee@client.example', domain: 'client.example' });
  });
  it('retry time counts from the oldest request in the window', () => {
    const now = Date.parse('2026-12-01T12:00:00Z');
    expect(retryAfterSeconds(new Date(now - SNAPSHOT_WINDOW_MS + 90_000).toISOString(), now)).toBe(90);
    expect(retryAfterSeconds(new Date(now - SNAPSHOT_WINDOW_MS - 5).toISOString(), now)).toBe(1);
  });
  it('backoff doubles per attempt up to its cap', () => {
    expect([1, 2, 3, 4, 10].map((a) => backoffMs(a, 5000, 60_000))).toEqual([5000, 10_000, 20_000, 40_000, 60_000]);
  });
});
