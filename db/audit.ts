import 'server-only';
import type { AuditEntry } from '@/lib/core/api-types';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { nowIso } from '@/db/ids';

export interface AuditInput {
  firmId: string;
  actorUserId: string | null;
  action: string;
  targetType?: string;
  targetId?: string;
  detail?: Record<string, unknown>;
}

export async function recordAudit(entry: AuditInput, trx?: Knex.Transaction): Promise<void> {
  await (trx ?? getDb())('audit_log').insert({
    firm_id: entry.firmId,
    actor_user_id: entry.actorUserId,
    action: entry.action,
    target_type: entry.targetType ?? null,
    target_id: entry.targetId ?? null,
    detail: entry.detail ? JSON.stringify(entry.detail) : null,
    at: nowIso(),
  });
}

export type AuditRow = AuditEntry;

export async function listAudit(firmId: string, opts: { limit: number; beforeId?: number }): Promise<AuditRow[]> {
  const q = getDb()('audit_log as a')
    .leftJoin('users as u', 'u.id', 'a.actor_user_id')
    .where('a.firm_id', firmId)
    .select('a.id', 'a.at', 'a.action', 'a.target_type', 'a.target_id', 'a.detail', 'u.name as actor_name', 'u.email as actor_email')
    .orderBy('a.id', 'desc')
    .limit(opts.limit);
  if (opts.beforeId) q.where('a.id', '<', opts.beforeId);
  const rows = await q;
  return rows.map((r) => ({
    id: r.id,
    at: r.at,
    action: r.action,
    targetType: r.target_type,
    targetId: r.target_id,
    detail: r.detail ? JSON.parse(r.detail) : null,
    actorName: r.actor_name,
    actorEmail: r.actor_email,
  }));
}
