import { describe, it, expect, beforeAll } from 'vitest';
import { resetEnvCache } from '@/lib/server/env';
import { randomUUID } from 'node:crypto';
import { useFreshDb } from '../../support/test-db';
import { getDb } from '@/db/knex';
import { writeBehind } from '@/lib/server/ops/write-behind';
import { createClient, createPass } from '@/lib/server/embed/service';
import { noteDial, noteLoad } from '@/lib/server/embed/events';
import { seedFirmWithWidget, memberOf } from './fixtures';

// Loads, dial moves and API key use are written in batches, off the read path (lib/server/ops/write-behind.ts over db/write-behind.ts).
let firm: Awaited<ReturnType<typeof seedFirmWithWidget>>;

beforeAll(async () => {
  await useFreshDb();
  firm = await seedFirmWithWidget();
});

async function newPass() {
  const m = memberOf(firm.firmId, firm.userId);
  const client = await createClient(m, { name: `Client ${randomUUID().slice(0, 8)}`, allowedOrigins: ['http://localhost:4100'], allowedEmailDomains: ['client.example'] });
  return createPass(m, { clientId: client.id, widgetId: firm.widgetId, days: 30 });
}

const stored = async (passId: string, kind: string) => Number((await getDb()('pass_events').where({ pass_id: passId, kind }).count({ n: '*' }).first())?.n ?? 0);

describe('batched pass events', () => {
  it('writes nothing until the batch is flushed, then every event in one go, with the last view time', async () => {
    const pass = await newPass();
    for (let i = 0; i < 5; i++) noteLoad(pass);
    await noteDial(pass, 'bore');
    expect(await stored(pass.id, 'load')).toBe(0);
    expect(writeBehind().pendingCount(pass.id, 'load')).toBe(5);
    await writeBehind().flush();
    expect(await stored(pass.id, 'load')).toBe(5);
    expect(await stored(pass.id, 'dial')).toBe(1);
    expect(writeBehind().pendingCount(pass.id, 'load')).toBe(0);
    const row = await getDb()('passes').where({ id: pass.id }).first('last_view_at');
    expect(row.last_view_at).not.toBeNull();
  });

  it('flushes by itself within EVENT_FLUSH_MS', async () => {
    const pass = await newPass();
    noteLoad(pass);
    await expect.poll(() => stored(pass.id, 'load'), { timeout: 3000, interval: 50 }).toBe(1);
  });

  it('stops counting loads at the cap of 300 in ten minutes, across batches', async () => {
    const pass = await newPass();
    for (let i = 0; i < 250; i++) noteLoad(pass);
    await writeBehind().flush();
    for (let i = 0; i < 100; i++) noteLoad(pass);
    await writeBehind().flush();
    expect(await stored(pass.id, 'load')).toBe(300);
  });

  it('refuses dial moves past the cap, counting those still waiting in the buffer', async () => {
    // No timed flush during the 605 calls (on PostgreSQL they take longer than the default 250 ms): all wait here.
    process.env.EVENT_FLUSH_MS = '60000';
    resetEnvCache();
    try {
      const pass = await newPass();
      let refused = 0;
      for (let i = 0; i < 605; i++) await noteDial(pass, 'bore').catch(() => refused++);
      expect(refused).toBe(5);
      expect(await stored(pass.id, 'dial')).toBe(0);
      await writeBehind().flush();
      expect(await stored(pass.id, 'dial')).toBe(600);
    } finally {
      delete process.env.EVENT_FLUSH_MS;
      resetEnvCache();
    }
  });

  it('writes an API key’s last use, keeping the latest time', async () => {
    const id = randomUUID();
    await getDb()('api_keys').insert({ id, firm_id: firm.firmId, name: 'k', prefix: 'stk_abc', key_hash: randomUUID(), created_by: firm.userId, created_at: new Date().toISOString() });
    const a = writeBehind().touchApiKey(id, '2026-12-03T08:00:00.000Z');
    const b = writeBehind().touchApiKey(id, '2026-12-03T08:00:01.000Z');
    await writeBehind().flush();
    await Promise.all([a, b]);
    expect((await getDb()('api_keys').where({ id }).first('last_used_at')).last_used_at).toBe('2026-12-03T08:00:01.000Z');
  });
});
