import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso, sha256 } from '@/db/ids';
import type { Role } from '@/db/users';
import type { Invitation, TeamMember } from '@/lib/core/api-types';

export type MemberRow = TeamMember;

export async function listMembers(firmId: string): Promise<MemberRow[]> {
  const rows = await getDb()('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where('m.firm_id', firmId)
    .select('m.id', 'm.user_id', 'u.name', 'u.email', 'm.role', 'm.status', 'u.last_active_at', 'm.created_at')
    .orderBy([{ column: 'm.status', order: 'asc' }, { column: 'u.name', order: 'asc' }]);
  return rows.map((r) => ({
    id: r.id,
    userId: r.user_id,
    name: r.name,
    email: r.email,
    role: r.role,
    status: r.status,
    lastActiveAt: r.last_active_at,
    joinedAt: r.created_at,
  }));
}

export async function getMember(firmId: string, membershipId: string, trx?: Knex.Transaction): Promise<MemberRow | null> {
  const r = await (trx ?? getDb())('memberships as m')
    .join('users as u', 'u.id', 'm.user_id')
    .where({ 'm.firm_id': firmId, 'm.id': membershipId })
    .select('m.id', 'm.user_id', 'u.name', 'u.email', 'm.role', 'm.status', 'u.last_active_at', 'm.created_at')
    .first();
  return r
    ? { id: r.id, userId: r.user_id, name: r.name, email: r.email, role: r.role, status: r.status, lastActiveAt: r.last_active_at, joinedAt: r.created_at }
    : null;
}

export async function countActiveByRole(firmId: string, trx?: Knex.Transaction): Promise<Record<Role, number>> {
  const rows = await (trx ?? getDb())('memberships').where({ firm_id: firmId, status: 'active' }).select('role').count({ n: '*' }).groupBy('role');
  const out: Record<Role, number> = { owner: 0, author: 0, checker: 0 };
  for (const r of rows as unknown as { role: Role; n: number }[]) out[r.role] = Number(r.n);
  return out;
}

export async function setMemberRole(firmId: string, membershipId: string, role: Role, trx: Knex.Transaction): Promise<void> {
  await trx('memberships').where({ firm_id: firmId, id: membershipId }).update({ role, updated_at: nowIso() });
}

export async function setMemberStatus(firmId: string, membershipId: string, status: 'active' | 'removed', trx: Knex.Transaction): Promise<void> {
  await trx('memberships')
    .where({ firm_id: firmId, id: membershipId })
    .update({ status, updated_at: nowIso(), removed_at: status === 'removed' ? nowIso() : null });
}

export async function insertMembership(firmId: string, userId: string, role: Role, trx: Knex.Transaction): Promise<string> {
  const existing = await trx('memberships').select('id').where({ firm_id: firmId, user_id: userId }).first();
  const now = nowIso();
  if (existing) {
    await trx('memberships').where({ id: existing.id }).update({ role, status: 'active', updated_at: now, removed_at: null });
    return existing.id;
  }
  const id = newId();
  await trx('memberships').insert({ id, firm_id: firmId, user_id: userId, role, status: 'active', created_at: now, updated_at: now });
  return id;
}

export type InvitationRow = Invitation;

export async function listPendingInvitations(firmId: string): Promise<InvitationRow[]> {
  const rows = await getDb()('invitations as i')
    .leftJoin('users as u', 'u.id', 'i.invited_by')
    .where('i.firm_id', firmId)
    .whereNull('i.accepted_at')
    .whereNull('i.revoked_at')
    .select('i.id', 'i.email', 'i.role', 'i.expires_at', 'i.created_at', 'u.name as invited_by_name')
    .orderBy('i.created_at', 'desc');
  return rows.map((r) => ({ id: r.id, email: r.email, role: r.role, expiresAt: r.expires_at, createdAt: r.created_at, invitedByName: r.invited_by_name }));
}

export async function countLiveInvitations(firmId: string, trx?: Knex.Transaction): Promise<number> {
  const r = await (trx ?? getDb())('invitations')
    .where({ firm_id: firmId })
    .whereNull('accepted_at')
    .whereNull('revoked_at')
    .whereNot('role', 'owner')
    .where('expires_at', '>', nowIso())
    .count({ n: '*' })
    .first();
  return Number(r?.n ?? 0);
}

export async function insertInvitation(
  inv: { firmId: string; email: string; role: Role; token: string; invitedBy: string; expiresAt: string },
  trx: Knex.Transaction,
): Promise<string> {
  // A new invitation replaces any live one for the same address.
  await trx('invitations').where({ firm_id: inv.firmId, email: inv.email.toLowerCase() }).whereNull('accepted_at').whereNull('revoked_at').update({ revoked_at: nowIso() });
  const id = newId();
  await trx('invitations').insert({
    id,
    firm_id: inv.firmId,
    email: inv.email.toLowerCase(),
    role: inv.role,
    token_hash: sha256(inv.token),
    invited_by: inv.invitedBy,
    expires_at: inv.expiresAt,
    created_at: nowIso(),
  });
  return id;
}

export async function revokeInvitation(firmId: string, invitationId: string, trx: Knex.Transaction): Promise<boolean> {
  const n = await trx('invitations').where({ firm_id: firmId, id: invitationId }).whereNull('accepted_at').whereNull('revoked_at').update({ revoked_at: nowIso() });
  return n > 0;
}

export interface InvitationByToken {
  id: string;
  firmId: string;
  firmName: string;
  email: string;
  role: Role;
  expiresAt: string;
  acceptedAt: string | null;
  revokedAt: string | null;
}

/** Looks an invitation up by its secret (only the hash is stored). Not firm-scoped: the token is the credential. */
export async function getInvitationByToken(token: string, trx?: Knex.Transaction): Promise<InvitationByToken | null> {
  const r = await (trx ?? getDb())('invitations as i')
    .join('firms as f', 'f.id', 'i.firm_id')
    .where('i.token_hash', sha256(token))
    .select('i.id', 'i.firm_id', 'f.name as firm_name', 'i.email', 'i.role', 'i.expires_at', 'i.accepted_at', 'i.revoked_at')
    .first();
  return r
    ? { id: r.id, firmId: r.firm_id, firmName: r.firm_name, email: r.email, role: r.role, expiresAt: r.expires_at, acceptedAt: r.accepted_at, revokedAt: r.revoked_at }
    : null;
}

export async function markInvitationAccepted(invitationId: string, trx: Knex.Transaction): Promise<boolean> {
  const n = await trx('invitations').where({ id: invitationId }).whereNull('accepted_at').update({ accepted_at: nowIso() });
  return n > 0;
}
