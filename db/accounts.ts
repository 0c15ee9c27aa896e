import 'server-only';
import type { Knex } from 'knex';
import { getDb, writeTransaction } from '@/db/knex';
import { newId, nowIso, sha256 } from '@/db/ids';

// Pending sign-ups and password-reset links. Only SHA-256 hashes of the e-mailed secrets are stored.

export interface PendingSignUp {
  id: string;
  email: string;
  name: string;
  firmName: string;
  passwordHash: string;
  expiresAt: string;
}

export async function insertPendingSignUp(p: { email: string; name: string; firmName: string; passwordHash: string; token: string; expiresAt: string }): Promise<void> {
  await getDb()('pending_sign_ups').insert({
    id: newId(),
    email: p.email.toLowerCase(),
    name: p.name,
    firm_name: p.firmName,
    password_hash: p.passwordHash,
    token_hash: sha256(p.token),
    expires_at: p.expiresAt,
    created_at: nowIso(),
  });
}

export async function getPendingSignUp(token: string, trx?: Knex.Transaction): Promise<PendingSignUp | null> {
  const row = await (trx ?? getDb())('pending_sign_ups')
    .select('id', 'email', 'name', 'firm_name', 'password_hash', 'expires_at')
    .where({ token_hash: sha256(token) })
    .first();
  return row ? { id: row.id, email: row.email, name: row.name, firmName: row.firm_name, passwordHash: row.password_hash, expiresAt: row.expires_at } : null;
}

/** Once an address has an account, every other pending sign-up for it is void. */
export async function deletePendingSignUps(email: string, trx: Knex.Transaction): Promise<void> {
  await trx('pending_sign_ups').where({ email: email.toLowerCase() }).delete();
}

export async function prunePendingSignUps(beforeIso: string): Promise<void> {
  await getDb()('pending_sign_ups').where('expires_at', '<', beforeIso).delete();
}

export async function insertPasswordReset(userId: string, token: string, expiresAt: string): Promise<void> {
  await getDb()('password_resets').insert({ id: newId(), user_id: userId, token_hash: sha256(token), expires_at: expiresAt, created_at: nowIso() });
}

export interface PasswordReset {
  id: string;
  userId: string;
  email: string;
  expiresAt: string;
  usedAt: string | null;
}

export async function getPasswordReset(token: string, trx?: Knex.Transaction): Promise<PasswordReset | null> {
  const row = await (trx ?? getDb())('password_resets as r')
    .join('users as u', 'u.id', 'r.user_id')
    .select('r.id', 'r.user_id', 'u.email', 'r.expires_at', 'r.used_at')
    .where('r.token_hash', sha256(token))
    .first();
  return row ? { id: row.id, userId: row.user_id, email: row.email, expiresAt: row.expires_at, usedAt: row.used_at ?? null } : null;
}

/** Marks this link and every other open link of the user as used: a link works once, and a newer one voids older ones. */
export async function usePasswordResets(resetId: string, userId: string, trx: Knex.Transaction): Promise<boolean> {
  const now = nowIso();
  const n = await trx('password_resets').where({ id: resetId }).whereNull('used_at').update({ used_at: now });
  await trx('password_resets').where({ user_id: userId }).whereNull('used_at').update({ used_at: now });
  return n === 1;
}

// E-mail limits: one row per message someone triggered.
// E-mail limits: one row per message someone triggered.
export interface MailSendCheck {
  key: string;
  sinceIso: string;
  max: number;
}

/**
 * Checks every limit and, when none is reached, counts the send under each key, all in one transaction holding a
 * lock per key: two requests at once cannot both see room for one more e-mail. Returns the first limit reached.
 */
export async function takeMailSends(checks: MailSendCheck[]): Promise<{ refused: null } | { refused: number; oldest: string | null }> {
  if (!checks.length) return { refused: null };
  return writeTransaction((trx) => takeMailSendsIn(trx, checks), { locks: checks.map((c) => c.key) });
}

/** takeMailSends inside the caller's write transaction, which must hold the keys' locks (writeTransaction's `locks`). */
export async function takeMailSendsIn(trx: Knex.Transaction, checks: MailSendCheck[]): Promise<{ refused: null } | { refused: number; oldest: string | null }> {
  for (let i = 0; i < checks.length; i++) {
    const c = checks[i];
    const r = await trx('mail_sends').where('key', c.key).andWhere('at', '>', c.sinceIso).count({ n: '*' }).min({ oldest: 'at' }).first();
    if (Number(r?.n ?? 0) >= c.max) return { refused: i, oldest: (r?.oldest as string | null) ?? null };
  }
  if (checks.length) {
    const at = nowIso();
    await trx('mail_sends').insert(checks.map((c) => ({ key: c.key, at })));
  }
  return { refused: null };
}

export async function pruneMailSends(beforeIso: string): Promise<void> {
  await getDb()('mail_sends').where('at', '<', beforeIso).delete();
}
