import { describe, it, expect, inject, beforeAll, afterAll } from 'vitest';
import fs from 'node:fs';
import path from 'node:path';
import type Database from 'better-sqlite3';
import { Client } from '../../support/http-client';
import { newFirm, addMember } from '../../support/firms';
import { openTestDb, firmIdOf } from '../../support/db-direct';
import { PERSONAS, type MatrixRow, type Persona, type MatrixCtx } from './matrix/types';

// Every route handler × {anonymous, owner, author, checker, member of another firm} → expected status.
const appUrl = inject('appUrl');
const mailboxUrl = inject('mailboxUrl');

const modules = import.meta.glob<{ rows: MatrixRow[] }>('./matrix/*.rows.ts', { eager: true });
const rows = Object.values(modules).flatMap((m) => m.rows);

function discoverRoutes(): string[] {
  const found: string[] = [];
  const walk = (dir: string) => {
    for (const entry of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, entry.name);
      if (entry.isDirectory()) walk(p);
      else if (entry.name === 'route.ts') {
        const src = fs.readFileSync(p, 'utf8');
        const route = '/' + path.relative('app', path.dirname(p)).split(path.sep).join('/');
        const methods = new Set<string>();
        for (const m of src.matchAll(/export const (GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(m[1]!);
        for (const m of src.matchAll(/export \{([^}]+)\}/g)) for (const x of m[1]!.matchAll(/as (GET|POST|PUT|PATCH|DELETE)\b/g)) methods.add(x[1]!);
        for (const method of methods) found.push(`${method} ${route}`);
      }
    }
  };
  walk('app/api');
  return found.sort();
}

function serverActionFiles(): string[] {
  const out: string[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (/\.(ts|tsx)$/.test(e.name) && /^\s*['"]use server['"]/m.test(fs.readFileSync(p, 'utf8'))) out.push(p);
    }
  };
  for (const d of ['app', 'components', 'lib']) walk(d);
  return out;
}

describe('authorization matrix', () => {
  it('has a row for every route handler and method, and no unknown rows', () => {
    const routes = discoverRoutes();
    const covered = new Set(rows.map((r) => `${r.method} ${r.route}`));
    expect(routes.filter((r) => !covered.has(r)), 'routes without a matrix row').toEqual([]);
    expect([...covered].filter((r) => !routes.includes(r)), 'rows for routes that do not exist').toEqual([]);
  });

  it('uses route handlers only: no server actions escape the matrix', () => {
    expect(serverActionFiles()).toEqual([]);
  });

  let ctx: MatrixCtx;
  let db: Database.Database;
  const clients = {} as Record<Persona, Client>;

  beforeAll(async () => {
    const a = await newFirm(appUrl, 'matrix');
    clients.owner = a.owner;
    clients.author = (await addMember(appUrl, mailboxUrl, a.owner, 'author')).client;
    clients.checker = (await addMember(appUrl, mailboxUrl, a.owner, 'checker')).client;
    clients.outsider = (await newFirm(appUrl, 'matrix-outsider')).owner;
    clients.anonymous = new Client(appUrl);
    db = openTestDb(inject('dataDir'));
    ctx = { db, firmId: firmIdOf(db, a.email), appUrl };
  });
  afterAll(() => db?.close());

  for (const row of rows) {
    it(`${row.method} ${row.route}`, async () => {
      const got: Record<string, number> = {};
      for (const persona of PERSONAS) {
        const { path: p, body, headers } = await row.prepare(ctx, persona);
        const res = await clients[persona].request(row.method, p, body, headers);
        got[persona] = res.status;
      }
      const want = Object.fromEntries(PERSONAS.map((p) => [p, row.expect[p]]));
      for (const p of PERSONAS) {
        const w = want[p];
        if (Array.isArray(w)) expect(w, `${p}: got ${got[p]}`).toContain(got[p]);
      }
      const scalarWant = Object.fromEntries(PERSONAS.filter((p) => !Array.isArray(want[p])).map((p) => [p, want[p]]));
      const scalarGot = Object.fromEntries(Object.keys(scalarWant).map((p) => [p, got[p]]));
      expect(scalarGot).toEqual(scalarWant);
    });
  }
});
