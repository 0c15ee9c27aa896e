import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';

import type { Role } from '@/lib/core/api-types';

export type { Role };
export const ROLES: readonly Role[] = ['owner', 'author', 'checker'];

export interface SessionMember {
  userId: string;
  email: string;
  name: string;
  sessionVersion: number;
  membershipId: string;
  firmId: string;
  firmName: string;
  role: Role;
}

/** The one query behind every authorization check: the user's active membership, read fresh per request. */
export async function getActiveMember(userId: string): Promise<SessionMember | null> {
  const row = await getDb()('users as u')
    .join('memberships as m', 'm.user_id', 'u.id')
    .join('firms as f', 'f.id', 'm.firm_id')
    .where('u.id', userId)
    .andWhere('m.status', 'active')
    .select('u.id as user_id', 'u.email', 'u.name', 'u.session_version', 'm.id as membership_id', 'm.role', 'f.id as firm_id', 'f.name as firm_name')
    .first();
  if (!row) return null;
  return {
    userId: row.user_id,
    email: row.email,
    name: row.name,
    sessionVersion: row.session_version,
    membershipId: row.membership_id,
    firmId: row.firm_id,
    firmName: row.firm_name,
    role: row.role,
  };
}

export interface UserCredentials {
  id: string;
  email: string;
  name: string;
  passwordHash: string | null;
  sessionVersion: number;
  /** Null until the owner of the address followed an e-mailed link (sign-up confirmation, sign-in link, reset). */
  emailVerifiedAt: string | null;
}

/** Only the sign-in path reads the password hash; nothing else selects it. */
export async function getUserCredentials(email: string): Promise<UserCredentials | null> {
  const row = await getDb()('users').select('id', 'email', 'name', 'password_hash', 'session_version', 'email_verified_at').where({ email: email.toLowerCase() }).first();
  return row
    ? { id: row.id, email: row.email, name: row.name, passwordHash: row.password_hash, sessionVersion: row.session_version, emailVerifiedAt: row.email_verified_at ?? null }
    : null;
}

export async function findUserIdByEmail(email: string, trx?: Knex.Transaction): Promise<string | null> {
  const row = await (trx ?? getDb())('users').select('id').where({ email: email.toLowerCase() }).first();
  return row?.id ?? null;
}

export async function insertUser(u: { email: string; name: string; passwordHash: string | null; verified: boolean }, trx: Knex.Transaction): Promise<string> {
  const id = newId();
  const now = nowIso();
  await trx('users').insert({
    id,
    email: u.email.toLowerCase(),
    name: u.name,
    password_hash: u.passwordHash,
    email_verified_at: u.verified ? now : null,
    created_at: now,
  });
  return id;
}

export async function insertFirmWithOwner(firm: { name: string; unitsDefault?: string }, userId: string, trx: Knex.Transaction): Promise<string> {
  const firmId = newId();
  const now = nowIso();
  await trx('firms').insert({ id: firmId, name: firm.name, units_default: firm.unitsDefault ?? 'mm', created_at: now });
  await trx('memberships').insert({ id: newId(), firm_id: firmId, user_id: userId, role: 'owner', status: 'active', created_at: now, updated_at: now });
  return firmId;
}

export async function bumpSessionVersion(userId: string, trx?: Knex.Transaction): Promise<void> {
  await (trx ?? getDb())('users').where({ id: userId }).increment('session_version', 1);
}

/** A new password ends every session of the user (their session version moves on). */
export async function setPassword(userId: string, passwordHash: string, o: { verifyEmail: boolean }, trx: Knex.Transaction): Promise<void> {
  await trx('users').where({ id: userId }).update({ password_hash: passwordHash });
  await trx('users').where({ id: userId }).increment('session_version', 1);
  if (o.verifyEmail) await trx('users').where({ id: userId }).whereNull('email_verified_at').update({ email_verified_at: nowIso() });
}

export async function touchLastActive(userId: string): Promise<void> {
  // At most once a minute per user, to keep writes off the hot path.
  const cutoff = new Date(Date.now() - 60_000).toISOString();
  await getDb()('users')
    .where({ id: userId })
    .andWhere((q) => q.whereNull('last_active_at').orWhere('last_active_at', '<', cutoff))
    .update({ last_active_at: nowIso() });
}

export async function markEmailVerified(userId: string, trx?: Knex.Transaction): Promise<void> {
  await (trx ?? getDb())('users').where({ id: userId }).whereNull('email_verified_at').update({ email_verified_at: nowIso() });
}

export async function hasActiveMembership(userId: string, trx?: Knex.Transaction): Promise<boolean> {
  const row = await (trx ?? getDb())('memberships').select('id').where({ user_id: userId, status: 'active' }).first();
  return Boolean(row);
}
