import { describe, it, expect } from 'vitest';
import { captureLog } from '../../support/captured-log';
import { NextRequest } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { AppError } from '@/lib/server/http/errors';
import { useFreshDb } from '../../support/test-db';
import { getDb } from '@/db/knex';
import { readiness } from '@/lib/server/ops/readiness';

// Structured logs with a request id: every answer carries X-Request-Id, a 500 quotes it in its body, and the
// log line of the error carries the same id.
const lines = captureLog();

const ctx = { params: Promise.resolve({}) };
const req = (headers: Record<string, string> = {}) => new NextRequest('http://localhost:3000/api/things', { headers });
const logged = async (reqId: string) => {
  await new Promise((r) => setImmediate(r));
  return lines.filter((l) => l.reqId === reqId);
};

describe('request ids and logs', () => {
  it('a 500 answer quotes the request id it returns in X-Request-Id, and the error is logged with it', async () => {
    const handler = route(async () => {
      throw new Error('database exploded');
    });
    const res = await handler(req(), ctx);
    expect(res.status).toBe(500);
    const id = res.headers.get('x-request-id')!;
    expect(id).toMatch(/^[0-9a-f-]{36}$/);
    const body = (await res.json()) as { error: { id: string; message: string } };
    expect(body.error.id).toBe(id);
    expect(body.error.message).toContain(id);
    expect(body.error.message).not.toContain('exploded');
    const mine = await logged(id);
    const err = mine.find((l) => l.level === 'error')!;
    expect(err.msg).toBe('unhandled error');
    expect((err.err as { message: string }).message).toBe('database exploded');
    expect(mine.find((l) => l.msg === 'request')).toMatchObject({ level: 'info', method: 'GET', path: '/api/things', status: 500 });
  });

  it('keeps a well-formed X-Request-Id from a proxy and replaces a malformed one', async () => {
    const handler = route(async () => new Response('{}', { headers: { 'content-type': 'application/json' } }));
    const kept = await handler(req({ 'x-request-id': 'lb-2f9c1e77-0001' }), ctx);
    expect(kept.headers.get('x-request-id')).toBe('lb-2f9c1e77-0001');
    expect(await logged('lb-2f9c1e77-0001')).toEqual([expect.objectContaining({ msg: 'request', status: 200 })]);
    const replaced = await handler(req({ 'x-request-id': 'bad id with spaces\n' }), ctx);
    expect(replaced.headers.get('x-request-id')).toMatch(/^[0-9a-f-]{36}$/);
  });

  it('known errors keep their status and carry the request id header too', async () => {
    const handler = route(async () => {
      throw new AppError('not_found', 'That record was not found.');
    });
    const res = await handler(req({ 'x-request-id': 'req-abcdef12' }), ctx);
    expect(res.status).toBe(404);
    expect(res.headers.get('x-request-id')).toBe('req-abcdef12');
  });
});

describe('readiness', () => {
  it('is ready on a migrated database and says so; a missing migration makes it not ready with the reason', async () => {
    await useFreshDb();
    const ok = await readiness();
    expect(ok).toMatchObject({ ready: true, reason: null, checks: { database: true, migrations: true, accepting: true }, pendingMigrations: 0 });
    const last = await getDb()('knex_migrations').orderBy('id', 'desc').first('id', 'name');
    await getDb()('knex_migrations').where({ id: last.id }).delete();
    const behind = await readiness();
    expect(behind).toMatchObject({ ready: false, checks: { database: true, migrations: false }, pendingMigrations: 1 });
    expect(behind.reason).toMatch(/1 database migration is not applied yet: run npm run db:migrate/);
  });
});
