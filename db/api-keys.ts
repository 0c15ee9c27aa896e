import 'server-only';
import type { ApiKey } from '@/lib/core/api-types';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, newSecret, nowIso, sha256 } from '@/db/ids';

export type ApiKeyRow = ApiKey;

export async function listApiKeys(firmId: string): Promise<ApiKeyRow[]> {
  const rows = await getDb()('api_keys as k')
    .leftJoin('users as u', 'u.id', 'k.created_by')
    .where('k.firm_id', firmId)
    .select('k.id', 'k.name', 'k.prefix', 'k.created_at', 'u.name as created_by_name', 'k.last_used_at', 'k.revoked_at')
    .orderBy('k.created_at', 'desc');
  return rows.map((r) => ({ id: r.id, name: r.name, prefix: r.prefix, createdAt: r.created_at, createdByName: r.created_by_name, lastUsedAt: r.last_used_at, revokedAt: r.revoked_at }));
}

/** Returns the full secret once; afterwards only its prefix is shown. */
export async function insertApiKey(firmId: string, name: string, createdBy: string, trx: Knex.Transaction): Promise<{ id: string; secret: string; prefix: string }> {
  const id = newId();
  const secret = `stk_${newSecret(24)}`;
  const prefix = secret.slice(0, 10);
  await trx('api_keys').insert({ id, firm_id: firmId, name, prefix, key_hash: sha256(secret), created_by: createdBy, created_at: nowIso() });
  return { id, secret, prefix };
}

export async function revokeApiKey(firmId: string, id: string, trx: Knex.Transaction): Promise<boolean> {
  return (await trx('api_keys').where({ firm_id: firmId, id }).whereNull('revoked_at').update({ revoked_at: nowIso() })) > 0;
}

export async function findFirmByApiKey(secret: string): Promise<{ keyId: string; firmId: string } | null> {
  const row = await getDb()('api_keys').select('id', 'firm_id').where({ key_hash: sha256(secret) }).whereNull('revoked_at').first();
  if (!row) return null;
  return { keyId: row.id, firmId: row.firm_id };
}
