import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';
import { utcDay } from '@/db/dialect';

// Passes (one client's access to one widget), the tokens issued for them, and their view events.

export type PassEventKind = 'load' | 'dial' | 'snapshot';
export type RevokeReason = 'revoked' | 'key_rotated';

export interface PassTokenRow {
  jti: string;
  passId: string;
  keyVersion: number;
  issuedAt: string;
  expiresAt: string;
  revokedAt: string | null;
}

export interface PassRecord {
  id: string;
  firmId: string;
  clientId: string;
  clientName: string;
  clientArchivedAt: string | null;
  clientKeyVersion: number;
  widgetId: string;
  widgetTitle: string;
  widgetUnpublishedAt: string | null;
  createdAt: string;
  createdByName: string | null;
  expiresAt: string;
  renewedAt: string | null;
  revokedAt: string | null;
  revokeReason: RevokeReason | null;
  lastViewAt: string | null;
  counts: Record<PassEventKind, number>;
  /** The newest token: the snippet the dashboard shows. */
  current: PassTokenRow | null;
  /** Older tokens still honoured until their own expiry. */
  olderLive: number;
}

const COLUMNS = [
  'p.id',
  'p.firm_id',
  'p.client_id',
  'c.name as client_name',
  'c.archived_at as client_archived_at',
  'c.key_version as client_key_version',
  'p.widget_id',
  'w.title as widget_title',
  'w.unpublished_at as widget_unpublished_at',
  'p.created_at',
  'u.name as created_by_name',
  'p.expires_at',
  'p.renewed_at',
  'p.revoked_at',
  'p.revoke_reason',
  'p.last_view_at',
];

function base(trx?: Knex.Transaction) {
  return (trx ?? getDb())('passes as p')
    .join('clients as c', 'c.id', 'p.client_id')
    .join('widgets as w', 'w.id', 'p.widget_id')
    .leftJoin('users as u', 'u.id', 'p.created_by');
}

const TOKEN_COLUMNS = ['jti', 'pass_id', 'key_version', 'issued_at', 'expires_at', 'revoked_at'];
const toToken = (r: Record<string, unknown>): PassTokenRow => ({
  jti: r.jti as string,
  passId: r.pass_id as string,
  keyVersion: Number(r.key_version),
  issuedAt: r.issued_at as string,
  expiresAt: r.expires_at as string,
  revokedAt: (r.revoked_at as string | null) ?? null,
});

async function decorate(rows: Record<string, unknown>[], trx?: Knex.Transaction): Promise<PassRecord[]> {
  if (!rows.length) return [];
  const db = trx ?? getDb();
  const ids = rows.map((r) => r.id as string);
  const counts = (await db('pass_events').whereIn('pass_id', ids).select('pass_id', 'kind').count({ n: '*' }).groupBy('pass_id', 'kind')) as unknown as {
    pass_id: string;
    kind: PassEventKind;
    n: number;
  }[];
  const tokens = (await db('pass_tokens').whereIn('pass_id', ids).select(TOKEN_COLUMNS).orderBy('issued_at', 'desc').orderBy('jti')).map(toToken);
  const now = nowIso();
  return rows.map((r) => {
    const id = r.id as string;
    const c: Record<PassEventKind, number> = { load: 0, dial: 0, snapshot: 0 };
    for (const x of counts) if (x.pass_id === id) c[x.kind as PassEventKind] = Number(x.n);
    const mine = tokens.filter((t) => t.passId === id);
    return {
      id,
      firmId: r.firm_id as string,
      clientId: r.client_id as string,
      clientName: r.client_name as string,
      clientArchivedAt: (r.client_archived_at as string | null) ?? null,
      clientKeyVersion: Number(r.client_key_version),
      widgetId: r.widget_id as string,
      widgetTitle: r.widget_title as string,
      widgetUnpublishedAt: (r.widget_unpublished_at as string | null) ?? null,
      createdAt: r.created_at as string,
      createdByName: (r.created_by_name as string | null) ?? null,
      expiresAt: r.expires_at as string,
      renewedAt: (r.renewed_at as string | null) ?? null,
      revokedAt: (r.revoked_at as string | null) ?? null,
      revokeReason: (r.revoke_reason as RevokeReason | null) ?? null,
      lastViewAt: (r.last_view_at as string | null) ?? null,
      counts: c,
      current: mine[0] ?? null,
      olderLive: mine.slice(1).filter((t) => !t.revokedAt && t.expiresAt > now).length,
    };
  });
}

export async function listPasses(firmId: string, opts: { clientId?: string; widgetId?: string } = {}): Promise<PassRecord[]> {
  const q = base().where('p.firm_id', firmId).select(COLUMNS).orderBy('p.created_at', 'desc').orderBy('p.id');
  if (opts.clientId) q.where('p.client_id', opts.clientId);
  if (opts.widgetId) q.where('p.widget_id', opts.widgetId);
  return decorate(await q);
}

export async function getPass(firmId: string, id: string, trx?: Knex.Transaction): Promise<PassRecord | null> {
  const r = await base(trx).where({ 'p.firm_id': firmId, 'p.id': id }).select(COLUMNS).first();
  return r ? ((await decorate([r], trx))[0] ?? null) : null;
}

/** The embed side knows a pass id from a verified token, not yet the firm. */
export async function getPassForEmbed(id: string): Promise<PassRecord | null> {
  const r = await base().where({ 'p.id': id }).select(COLUMNS).first();
  return r ? ((await decorate([r]))[0] ?? null) : null;
}

export async function getPassToken(jti: string): Promise<PassTokenRow | null> {
  const r = await getDb()('pass_tokens').where({ jti }).select(TOKEN_COLUMNS).first();
  return r ? toToken(r) : null;
}

/** A pass of this client for this widget that is neither revoked nor expired. */
export async function findLivePass(firmId: string, clientId: string, widgetId: string, trx: Knex.Transaction): Promise<string | null> {
  const r = await trx('passes')
    .where({ firm_id: firmId, client_id: clientId, widget_id: widgetId })
    .whereNull('revoked_at')
    .where('expires_at', '>', nowIso())
    .select('id')
    .first();
  return r ? (r.id as string) : null;
}

export async function insertPass(
  p: { firmId: string; clientId: string; widgetId: string; userId: string; expiresAt: string; keyVersion: number },
  trx: Knex.Transaction,
): Promise<{ passId: string; token: PassTokenRow }> {
  const passId = newId();
  const now = nowIso();
  await trx('passes').insert({
    id: passId,
    firm_id: p.firmId,
    client_id: p.clientId,
    widget_id: p.widgetId,
    created_by: p.userId,
    created_at: now,
    expires_at: p.expiresAt,
  });
  const token = await insertToken(p.firmId, passId, p.keyVersion, now, p.expiresAt, trx);
  return { passId, token };
}

async function insertToken(firmId: string, passId: string, keyVersion: number, issuedAt: string, expiresAt: string, trx: Knex.Transaction): Promise<PassTokenRow> {
  const jti = newId();
  await trx('pass_tokens').insert({ jti, pass_id: passId, firm_id: firmId, key_version: keyVersion, issued_at: issuedAt, expires_at: expiresAt });
  return { jti, passId, keyVersion, issuedAt, expiresAt, revokedAt: null };
}

/** A new token with a later expiry. The older tokens keep working to their own expiry unless retired now. */
export async function renewPass(
  firmId: string,
  passId: string,
  p: { expiresAt: string; keyVersion: number; retirePrevious: boolean },
  trx: Knex.Transaction,
): Promise<PassTokenRow> {
  const now = nowIso();
  if (p.retirePrevious) await trx('pass_tokens').where({ firm_id: firmId, pass_id: passId }).whereNull('revoked_at').update({ revoked_at: now });
  const token = await insertToken(firmId, passId, p.keyVersion, now, p.expiresAt, trx);
  await trx('passes').where({ firm_id: firmId, id: passId }).update({ expires_at: p.expiresAt, renewed_at: now });
  return token;
}

/** Revokes a pass and denylists every token issued for it. */
export async function revokePass(firmId: string, passId: string, userId: string, reason: RevokeReason, trx: Knex.Transaction): Promise<boolean> {
  const now = nowIso();
  const n = await trx('passes').where({ firm_id: firmId, id: passId }).whereNull('revoked_at').update({ revoked_at: now, revoked_by: userId, revoke_reason: reason });
  await trx('pass_tokens').where({ firm_id: firmId, pass_id: passId }).whereNull('revoked_at').update({ revoked_at: now });
  return n === 1;
}

export async function revokeClientPasses(firmId: string, clientId: string, userId: string, reason: RevokeReason, trx: Knex.Transaction): Promise<number> {
  const ids = (await trx('passes').where({ firm_id: firmId, client_id: clientId }).whereNull('revoked_at').select('id')).map((r: { id: string }) => r.id);
  for (const id of ids) await revokePass(firmId, id, userId, reason, trx);
  return ids.length;
}

export async function recordPassEvent(e: { passId: string; firmId: string; kind: PassEventKind; detail?: string | null }, trx?: Knex.Transaction): Promise<void> {
  const db = trx ?? getDb();
  const at = nowIso();
  await db('pass_events').insert({ pass_id: e.passId, firm_id: e.firmId, kind: e.kind, at, detail: e.detail ? e.detail.slice(0, 200) : null });
  if (e.kind === 'load') await db('passes').where({ id: e.passId, firm_id: e.firmId }).update({ last_view_at: at });
}

export async function countPassEventsSince(passId: string, kind: PassEventKind, sinceIso: string): Promise<number> {
  const r = await getDb()('pass_events').where({ pass_id: passId, kind }).where('at', '>=', sinceIso).count({ n: '*' }).first();
  return Number(r?.n ?? 0);
}

export interface DailyCounts {
  day: string; // YYYY-MM-DD (UTC)
  load: number;
  dial: number;
  snapshot: number;
}

/** Events per UTC day over the last `days` days, oldest first, with empty days filled in. */
export async function passDailyCounts(firmId: string, passId: string, days: number, now = new Date()): Promise<DailyCounts[]> {
  const start = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate() - (days - 1)));
  const db = getDb();
  const day = utcDay(db, 'at');
  const rows = await db('pass_events')
    .where({ firm_id: firmId, pass_id: passId })
    .where('at', '>=', start.toISOString())
    .select(db.raw('? as day', [day]), 'kind')
    .count({ n: '*' })
    .groupBy(day)
    .groupBy('kind');
  const out: DailyCounts[] = [];
  for (let i = 0; i < days; i++) {
    const d = new Date(start.getTime() + i * 86_400_000).toISOString().slice(0, 10);
    out.push({ day: d, load: 0, dial: 0, snapshot: 0 });
  }
  for (const r of rows as { day: string; kind: PassEventKind; n: number }[]) {
    const slot = out.find((o) => o.day === r.day);
    if (slot) slot[r.kind] = Number(r.n);
  }
  return out;
}

export interface HostPass {
  passId: string;
  clientId: string;
  clientName: string;
  firmName: string;
  widgetTitle: string;
  token: PassTokenRow;
}

/**
 * Development only (the demo host page): live passes of clients that allow this origin, across firms, with
 * each pass's newest live token.
 */
export async function listLivePassesForOrigin(origin: string): Promise<HostPass[]> {
  const now = nowIso();
  const rows = await getDb()('passes as p')
    .join('clients as c', 'c.id', 'p.client_id')
    .join('widgets as w', 'w.id', 'p.widget_id')
    .join('firms as f', 'f.id', 'p.firm_id')
    .join('pass_tokens as t', 't.pass_id', 'p.id')
    .whereNull('p.revoked_at')
    .whereNull('c.archived_at')
    .whereNull('w.unpublished_at')
    .whereNull('t.revoked_at')
    .where('t.expires_at', '>', now)
    .where('c.allowed_origins', 'like', `%${JSON.stringify(origin)}%`)
    .select('p.id as pass_id', 'c.id as client_id', 'c.name as client_name', 'c.allowed_origins', 'f.name as firm_name', 'w.title as widget_title', ...TOKEN_COLUMNS.map((c) => `t.${c}`))
    .orderBy('c.name')
    .orderBy('p.created_at')
    .orderBy('t.issued_at', 'desc');
  const seen = new Set<string>();
  const out: HostPass[] = [];
  for (const r of rows as Record<string, unknown>[]) {
    if (seen.has(r.pass_id as string) || !(JSON.parse(r.allowed_origins as string) as string[]).includes(origin)) continue;
    seen.add(r.pass_id as string);
    out.push({ passId: r.pass_id as string, clientId: r.client_id as string, clientName: r.client_name as string, firmName: r.firm_name as string, widgetTitle: r.widget_title as string, token: toToken(r) });
  }
  return out;
}
