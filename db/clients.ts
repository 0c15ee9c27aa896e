import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';

// The firm's client organisations. Every query is scoped by firm.

export interface ClientRecord {
  id: string;
  firmId: string;
  name: string;
  note: string | null;
  allowedOrigins: string[];
  allowedEmailDomains: string[];
  /** Snapshots may go to any address (an explicit, warned choice); otherwise only to allowedEmailDomains. */
  snapshotAnyAddress: boolean;
  keyVersion: number;
  notBefore: string;
  createdAt: string;
  updatedAt: string;
  archivedAt: string | null;
}

export interface ClientListRow extends ClientRecord {
  activePasses: number;
  totalPasses: number;
  lastViewAt: string | null;
}

const COLUMNS = [
  'c.id',
  'c.firm_id',
  'c.name',
  'c.note',
  'c.allowed_origins',
  'c.allowed_email_domains',
  'c.snapshot_any_address',
  'c.key_version',
  'c.not_before',
  'c.created_at',
  'c.updated_at',
  'c.archived_at',
];

export function toClient(r: Record<string, unknown>): ClientRecord {
  return {
    id: r.id as string,
    firmId: r.firm_id as string,
    name: r.name as string,
    note: (r.note as string | null) ?? null,
    allowedOrigins: JSON.parse(r.allowed_origins as string) as string[],
    allowedEmailDomains: JSON.parse(r.allowed_email_domains as string) as string[],
    snapshotAnyAddress: Boolean(r.snapshot_any_address),
    keyVersion: Number(r.key_version),
    notBefore: r.not_before as string,
    createdAt: r.created_at as string,
    updatedAt: r.updated_at as string,
    archivedAt: (r.archived_at as string | null) ?? null,
  };
}

export async function listClients(firmId: string, opts: { includeArchived?: boolean } = {}): Promise<ClientListRow[]> {
  const now = nowIso();
  const db = getDb();
  const q = db('clients as c')
    .where('c.firm_id', firmId)
    .select(COLUMNS)
    .select(
      db.raw(
        `(select count(*) from passes p where p.client_id = c.id and p.revoked_at is null and p.expires_at > ?) as active_passes`,
        [now],
      ),
      db.raw('(select count(*) from passes p where p.client_id = c.id) as total_passes'),
      db.raw('(select max(p.last_view_at) from passes p where p.client_id = c.id) as last_view_at'),
    )
    .orderByRaw('c.archived_at is not null, lower(c.name)');
  if (!opts.includeArchived) q.whereNull('c.archived_at');
  const rows = await q;
  return rows.map((r: Record<string, unknown>) => ({
    ...toClient(r),
    activePasses: Number(r.active_passes),
    totalPasses: Number(r.total_passes),
    lastViewAt: (r.last_view_at as string | null) ?? null,
  }));
}

export async function getClient(firmId: string, id: string, trx?: Knex.Transaction): Promise<ClientRecord | null> {
  const r = await (trx ?? getDb())('clients as c').where({ 'c.firm_id': firmId, 'c.id': id }).select(COLUMNS).first();
  return r ? toClient(r) : null;
}

/** For the embed side, which knows a pass but not yet its firm: the client behind a pass id. */
export async function getClientById(id: string, trx?: Knex.Transaction): Promise<ClientRecord | null> {
  const r = await (trx ?? getDb())('clients as c').where({ 'c.id': id }).select(COLUMNS).first();
  return r ? toClient(r) : null;
}

export async function clientNameTaken(firmId: string, name: string, exceptId: string | null, trx: Knex.Transaction): Promise<boolean> {
  const q = trx('clients').where('firm_id', firmId).whereRaw('lower(name) = lower(?)', [name]).select('id').first();
  if (exceptId) q.whereNot('id', exceptId);
  return Boolean(await q);
}

export interface ClientFields {
  name: string;
  note?: string | null;
  allowedOrigins: string[];
  allowedEmailDomains: string[];
  snapshotAnyAddress?: boolean;
}

export async function insertClient(firmId: string, userId: string, f: ClientFields, trx: Knex.Transaction): Promise<string> {
  const id = newId();
  const now = nowIso();
  await trx('clients').insert({
    id,
    firm_id: firmId,
    name: f.name,
    note: f.note ?? null,
    allowed_origins: JSON.stringify(f.allowedOrigins),
    allowed_email_domains: JSON.stringify(f.allowedEmailDomains),
    snapshot_any_address: f.snapshotAnyAddress ?? false,
    key_version: 1,
    not_before: now,
    created_by: userId,
    created_at: now,
    updated_by: userId,
    updated_at: now,
  });
  return id;
}

export async function updateClient(
  firmId: string,
  id: string,
  userId: string,
  patch: Partial<ClientFields> & { archived?: boolean },
  trx: Knex.Transaction,
): Promise<void> {
  const now = nowIso();
  const row: Record<string, unknown> = { updated_by: userId, updated_at: now };
  if (patch.name !== undefined) row.name = patch.name;
  if (patch.note !== undefined) row.note = patch.note || null;
  if (patch.allowedOrigins !== undefined) row.allowed_origins = JSON.stringify(patch.allowedOrigins);
  if (patch.allowedEmailDomains !== undefined) row.allowed_email_domains = JSON.stringify(patch.allowedEmailDomains);
  if (patch.snapshotAnyAddress !== undefined) row.snapshot_any_address = patch.snapshotAnyAddress;
  if (patch.archived !== undefined) row.archived_at = patch.archived ? now : null;
  await trx('clients').where({ firm_id: firmId, id }).update(row);
}

/** New key version and not-before: every token issued for this client before now is refused. */
export async function rotateClientKey(firmId: string, id: string, userId: string, trx: Knex.Transaction): Promise<number> {
  const now = nowIso();
  await trx('clients')
    .where({ firm_id: firmId, id })
    .update({ key_version: trx.raw('key_version + 1'), not_before: now, updated_by: userId, updated_at: now });
  const r = await trx('clients').where({ firm_id: firmId, id }).select('key_version').first();
  return Number(r.key_version);
}
