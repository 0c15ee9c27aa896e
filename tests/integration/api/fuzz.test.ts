import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import { createHash } from 'node:crypto';
import fc from 'fast-check';
import type Database from 'better-sqlite3';
import { openTestDb } from '../../support/db-direct';
import { newFirm } from '../../support/firms';
import type { Client } from '../../support/http-client';

// Property-based probes of every route handler (each app/api/**/route.ts and each method it exports), against
// the production build: random and hostile path parameters, query strings, headers and bodies. No answer may be
// a 5xx or carry a stack trace, and anonymous probes may change no data. Seeded, with a fixed number of runs
// per route and method, so a failure replays and the run time stays modest.

const appUrl = inject('appUrl');
const dataDir = inject('dataDir');
const SEED = 20261203;
const RUNS_ANONYMOUS = 8;
const RUNS_SIGNED_IN = 3;

interface RouteSpec {
  file: string;
  pattern: string;
  methods: string[];
}

/** Every route handler file and the methods it exports. */
function enumerateRoutes(): RouteSpec[] {
  const root = path.resolve('app/api');
  const out: RouteSpec[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (e.name === 'route.ts') {
        const src = fs.readFileSync(p, 'utf8');
        const methods = new Set<string>();
        for (const m of src.matchAll(/export\s+const\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]!);
        for (const m of src.matchAll(/\bas\s+(GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]!);
        out.push({ file: path.relative(process.cwd(), p), pattern: '/' + path.relative(path.resolve('app'), dir).split(path.sep).join('/'), methods: [...methods] });
      }
    }
  };
  walk(root);
  return out.sort((a, b) => a.pattern.localeCompare(b.pattern));
}

const hostileText = fc.constantFrom(
  '',
  ' ',
  '..',
  '../../etc/passwd',
  "' OR 1=1 --",
  '<script>alert(1)</script>',
  '%00',
  '\u0000',
  '\ud800',
  'ＡＢＣ',
  '1e309',
  '-0',
  'NaN',
  'Infinity',
  '__proto__',
  'constructor',
  'x'.repeat(3000),
  '00000000-0000-0000-0000-000000000000',
  'ffffffff-ffff-ffff-ffff-ffffffffffff',
);
const segment = fc.oneof(fc.uuid(), hostileText, fc.string({ maxLength: 40 }), fc.integer().map(String));

const hostileJson = fc.constantFrom(
  '{"__proto__":{"polluted":true},"constructor":{"prototype":{"polluted":true}}}',
  '{"a":1e309}',
  '[' + '['.repeat(5000) + ']'.repeat(5000) + ']',
  '{"email":"a@b.c","password":"' + 'p'.repeat(5000) + '"}',
  '{"model":{"schema":"stochos.model/1","template":"formula","inputs":[],"outputs":[{"id":"y","formula":"constructor.constructor(\\"return process\\")()"}]}}',
  '"just a string"',
  'null',
  'true',
  '{',
  '{"passId":"00000000-0000-0000-0000-000000000000","pass":"a.b.c"}',
  '\ufeff{}',
);
const body = fc.oneof(
  fc.jsonValue().map((v) => JSON.stringify(v)),
  hostileJson,
  fc.string({ maxLength: 300 }),
  fc.uint8Array({ maxLength: 300 }).map((a) => Buffer.from(a).toString('latin1')),
);
const contentType = fc.constantFrom(
  'application/json',
  'application/json; charset=utf-8',
  'text/plain',
  'application/x-www-form-urlencoded',
  'multipart/form-data; boundary=zz',
  'multipart/form-data',
  'application/xml',
  '',
);
// Printable ASCII header values: anything else is refused by the client before it is sent.
const headerValue = fc.oneof(hostileText.filter((s) => /^[\x20-\x7e]*$/.test(s)), fc.string({ maxLength: 60, unit: fc.integer({ min: 0x20, max: 0x7e }).map((c) => String.fromCharCode(c)) }));
const headers = fc.record(
  {
    authorization: fc.oneof(headerValue.map((v) => `Bearer ${v}`), headerValue.map((v) => `Basic ${v}`), headerValue),
    cookie: fc.oneof(headerValue.map((v) => `next-auth.session-token=${v}`), headerValue.map((v) => `next-auth.csrf-token=${v}`)),
    'x-forwarded-for': headerValue,
    forwarded: headerValue,
    'x-stochos-peer': headerValue,
    origin: fc.constantFrom(appUrl, 'https://evil.example', 'null', ''),
    'stripe-signature': headerValue,
    'if-none-match': headerValue,
    range: headerValue,
    accept: headerValue,
  },
  { requiredKeys: [] },
);
const query = fc.dictionary(fc.oneof(fc.constantFrom('before', 'clientId', 'next', 'pass', 'origin', 'to', 'limit', 'callbackUrl'), fc.string({ maxLength: 12 })), fc.oneof(hostileText, fc.string({ maxLength: 40 })), { maxKeys: 4 });

function fillPath(pattern: string, values: string[]): string {
  let i = 0;
  return pattern.replace(/\[(\.\.\.)?[^\]]+\]/g, (_m, rest: string | undefined) => {
    const v = values[i++ % values.length] ?? 'x';
    return rest ? [v, values[(i + 1) % values.length] ?? 'y'].map(encodeURIComponent).join('/') : encodeURIComponent(v);
  });
}

const STACK = /\n\s+at\s+\S+.*:\d+:\d+|node_modules\/|\.next\/server|webpack-internal|turbopack:\/\/|\bError: [^"]*\n/;

async function probe(method: string, url: string, h: Record<string, string>, payload: string | undefined, type: string, cookie?: string): Promise<{ status: number; text: string }> {
  const hh: Record<string, string> = { ...h };
  if (cookie) hh.cookie = cookie;
  if (payload !== undefined && type) hh['content-type'] = type;
  for (const [k, v] of Object.entries(hh)) if (v === '') delete hh[k];
  const res = await fetch(url, { method, headers: hh, body: payload, redirect: 'manual' });
  return { status: res.status, text: await res.text() };
}

/** A digest per table (the snapshot worker's queue changes on its own; failed sign-ins are counted by design). */
function fingerprint(db: Database.Database): Record<string, string> {
  // write_lock is the row writeTransaction touches to take SQLite's lock: a mechanism, not data.
  const skip = new Set(['knex_migrations', 'knex_migrations_lock', 'snapshot_jobs', 'sign_in_attempts', 'write_lock']);
  const tables = (db.prepare("select name from sqlite_master where type = 'table' and name not like 'sqlite_%' order by name").all() as { name: string }[]).map((t) => t.name).filter((t) => !skip.has(t));
  const out: Record<string, string> = {};
  for (const t of tables) {
    const h = createHash('sha256');
    for (const row of db.prepare(`select * from "${t}" order by rowid`).iterate()) h.update(JSON.stringify(row));
    out[t] = h.digest('hex');
  }
  return out;
}

const routes = enumerateRoutes();
let db: Database.Database;
let member: Client;

beforeAll(async () => {
  db = openTestDb(dataDir);
  member = (await newFirm(appUrl, 'fuzz')).owner;
});
afterAll(() => db?.close());

describe('fuzzing every route handler', () => {
  it('finds every route file and its methods', () => {
    expect(routes.length).toBeGreaterThan(40);
    for (const r of routes) expect(r.methods.length, r.file).toBeGreaterThan(0);
  });

  it('answers anonymous hostile requests without a 5xx or a stack trace, and changes no data', async () => {
    // The digest reads SQLite's own catalogue; on PostgreSQL (npm run test:postgres) only the answers are checked.
    const onPostgres = fs.existsSync(path.join(inject('dataDir'), 'database-url'));
    const before = onPostgres ? null : fingerprint(db);
    const failures: string[] = [];
    for (const r of routes) {
      for (const method of r.methods) {
        await fc.assert(
          fc.asyncProperty(fc.array(segment, { minLength: 2, maxLength: 2 }), query, headers, body, contentType, async (segs, q, h, b, type) => {
            const qs = new URLSearchParams(q).toString();
            const url = `${appUrl}${fillPath(r.pattern, segs)}${qs ? `?${qs}` : ''}`;
            const payload = method === 'GET' || method === 'HEAD' ? undefined : b;
            const res = await probe(method, url, h, payload, type);
            if (res.status >= 500 || STACK.test(res.text)) {
              failures.push(`${method} ${url} → ${res.status}: ${res.text.slice(0, 200)}`);
              return false;
            }
            return true;
          }),
          { numRuns: RUNS_ANONYMOUS, seed: SEED, endOnFailure: true },
        ).catch(() => undefined);
      }
    }
    expect(failures).toEqual([]);
    if (before) expect(fingerprint(db)).toEqual(before);
  });

  it('answers a signed-in member’s hostile requests without a 5xx or a stack trace', async () => {
    const cookie = member.cookie();
    const failures: string[] = [];
    for (const r of routes) {
      for (const method of r.methods) {
        // Signing out would end the session the other probes use.
        if (r.pattern.startsWith('/api/auth')) continue;
        await fc.assert(
          fc.asyncProperty(fc.array(segment, { minLength: 2, maxLength: 2 }), query, body, contentType, async (segs, q, b, type) => {
            const qs = new URLSearchParams(q).toString();
            const url = `${appUrl}${fillPath(r.pattern, segs)}${qs ? `?${qs}` : ''}`;
            const res = await probe(method, url, {}, method === 'GET' ? undefined : b, type, cookie);
            if (res.status >= 500 || STACK.test(res.text)) {
              failures.push(`${method} ${url} → ${res.status}: ${res.text.slice(0, 200)}`);
              return false;
            }
            return true;
          }),
          { numRuns: RUNS_SIGNED_IN, seed: SEED + 1, endOnFailure: true },
        ).catch(() => undefined);
      }
    }
    expect(failures).toEqual([]);
  });
});
