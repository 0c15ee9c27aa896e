import 'server-only';
import type { InvitationView } from '@/lib/core/api-types';
import { z } from 'zod';
import { writeTransaction } from '@/db/knex';
import { findUserIdByEmail, hasActiveMembership, insertUser, bumpSessionVersion, getUserCredentials, markEmailVerified, type Role } from '@/db/users';
import {
  countActiveByRole,
  getInvitationByToken,
  getMember,
  insertInvitation,
  insertMembership,
  markInvitationAccepted,
  revokeInvitation,
  setMemberRole,
  setMemberStatus,
  listMembers,
  listPendingInvitations,
} from '@/db/team';
import { recordAudit } from '@/db/audit';
import { newSecret } from '@/db/ids';
import { hashPassword, verifyPassword } from '@/lib/server/auth/password';
import { AppError, conflict, fieldError, notFound } from '@/lib/server/http/errors';
import { linkMail, sendMail } from '@/lib/server/mail/send';
import { env } from '@/lib/server/env';
import type { Member } from '@/lib/server/auth/guard';
import { passwordField, type inviteSchema, type acceptInvitationSchema } from '@/lib/core/auth/schemas';
import { assertSeatAvailable, seatUsage } from '@/lib/server/team/seats';
import { mailAllowanceLocks, takeMailAllowanceIn } from '@/lib/server/auth/mail-limits';

export const INVITATION_DAYS = 7;

/** The team page: active and removed members, invitations still open, and the seats they use. */
export async function teamOverview(actor: Member) {
  const [members, invitations, seats] = await Promise.all([listMembers(actor.firmId), listPendingInvitations(actor.firmId), seatUsage(actor.firmId)]);
  return { members, invitations, seats };
}

export async function inviteMember(actor: Member, input: z.infer<typeof inviteSchema>): Promise<{ id: string; email: string; role: Role; expiresAt: string }> {
  const token = newSecret();
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 86_400_000).toISOString();
  const id = await writeTransaction(async (trx) => {
    const existingUser = await findUserIdByEmail(input.email, trx);
    if (existingUser && (await hasActiveMembership(existingUser, trx))) {
      throw new AppError('conflict', 'This person already belongs to a firm on Stochos.', {
        fields: { email: ['This address already belongs to an active member of a firm on Stochos.'] },
      });
    }
    await assertSeatAvailable(actor.firmId, { adding: 1, countInvitations: true }, trx);
    // Invitations are e-mails to any address a firm types: limited per firm, withdrawn ones included. Checked
    // and counted in this transaction, so two invitations at once cannot overshoot and a refused one is not counted.
    await takeMailAllowanceIn(trx, 'invitation', { firm: actor.firmId });
    const invId = await insertInvitation({ firmId: actor.firmId, email: input.email, role: input.role, token, invitedBy: actor.userId, expiresAt }, trx);
    await recordAudit({ firmId: actor.firmId, actorUserId: actor.userId, action: 'member.invited', targetType: 'invitation', targetId: invId, detail: { email: input.email, role: input.role } }, trx);
    return invId;
  }, { locks: mailAllowanceLocks('invitation', { firm: actor.firmId }) });
  const url = `${env().APP_URL}/invite/${token}`;
  await sendMail(
    linkMail(input.email, `${actor.name} invited you to ${actor.firmName} on Stochos`, [
      `${actor.name} invited you to join ${actor.firmName} on Stochos as ${input.role === 'author' ? 'an author' : 'a checker'}.`,
      `The invitation expires in ${INVITATION_DAYS} days.`,
    ], { label: 'Accept the invitation', url }),
  );
  return { id, email: input.email, role: input.role, expiresAt };
}

export async function cancelInvitation(actor: Member, invitationId: string): Promise<void> {
  await writeTransaction(async (trx) => {
    if (!(await revokeInvitation(actor.firmId, invitationId, trx))) throw notFound('That invitation');
    await recordAudit({ firmId: actor.firmId, actorUserId: actor.userId, action: 'invitation.revoked', targetType: 'invitation', targetId: invitationId }, trx);
  });
}

function assertKeepsAnOwner(counts: Record<Role, number>, losingOwner: boolean): void {
  if (losingOwner && counts.owner <= 1) throw conflict('A firm needs at least one owner. Make someone else owner first.');
}

export async function changeRole(actor: Member, membershipId: string, role: Role) {
  return writeTransaction(async (trx) => {
    const target = await getMember(actor.firmId, membershipId, trx);
    if (!target || target.status !== 'active') throw notFound('That member');
    if (target.role === role) return target;
    assertKeepsAnOwner(await countActiveByRole(actor.firmId, trx), target.role === 'owner');
    if (target.role === 'owner') await assertSeatAvailable(actor.firmId, { adding: 1, countInvitations: false }, trx);
    await setMemberRole(actor.firmId, membershipId, role, trx);
    await recordAudit({ firmId: actor.firmId, actorUserId: actor.userId, action: 'member.role_changed', targetType: 'member', targetId: membershipId, detail: { email: target.email, from: target.role, to: role } }, trx);
    return { ...target, role };
  });
}

export async function removeMember(actor: Member, membershipId: string): Promise<void> {
  await writeTransaction(async (trx) => {
    const target = await getMember(actor.firmId, membershipId, trx);
    if (!target || target.status !== 'active') throw notFound('That member');
    assertKeepsAnOwner(await countActiveByRole(actor.firmId, trx), target.role === 'owner');
    await setMemberStatus(actor.firmId, membershipId, 'removed', trx);
    // Ends the removed member's sessions at once.
    await bumpSessionVersion(target.userId, trx);
    await recordAudit({ firmId: actor.firmId, actorUserId: actor.userId, action: 'member.removed', targetType: 'member', targetId: membershipId, detail: { email: target.email, role: target.role } }, trx);
  });
}

export async function reactivateMember(actor: Member, membershipId: string) {
  return writeTransaction(async (trx) => {
    const target = await getMember(actor.firmId, membershipId, trx);
    if (!target || target.status !== 'removed') throw notFound('That removed member');
    if (await hasActiveMembership(target.userId, trx)) throw conflict('This person has since joined another firm on Stochos.');
    if (target.role !== 'owner') await assertSeatAvailable(actor.firmId, { adding: 1, countInvitations: false }, trx);
    await setMemberStatus(actor.firmId, membershipId, 'active', trx);
    await recordAudit({ firmId: actor.firmId, actorUserId: actor.userId, action: 'member.reactivated', targetType: 'member', targetId: membershipId, detail: { email: target.email } }, trx);
    return { ...target, status: 'active' as const };
  });
}

function assertInvitationUsable(inv: Awaited<ReturnType<typeof getInvitationByToken>>): asserts inv is NonNullable<typeof inv> {
  if (!inv) throw notFound('That invitation');
  if (inv.revokedAt) throw new AppError('gone', 'This invitation was withdrawn. Ask the firm’s owner for a new one.');
  if (inv.acceptedAt) throw new AppError('gone', 'This invitation was already used. Sign in with the account you created.');
  if (Date.parse(inv.expiresAt) < Date.now()) throw new AppError('gone', 'This invitation has expired. Ask the firm’s owner to send a new one.');
}

export async function describeInvitation(token: string): Promise<InvitationView> {
  const inv = await getInvitationByToken(token);
  assertInvitationUsable(inv);
  return { firmName: inv.firmName, email: inv.email, role: inv.role, expiresAt: inv.expiresAt, existingAccount: Boolean(await findUserIdByEmail(inv.email)) };
}

export async function acceptInvitation(input: z.infer<typeof acceptInvitationSchema>): Promise<{ email: string }> {
  const existing = await getInvitationByToken(input.token);
  assertInvitationUsable(existing);
  const creds = await getUserCredentials(existing.email);
  if (creds) {
    if (!creds.passwordHash || !(await verifyPassword(input.password, creds.passwordHash))) throw fieldError('password', 'That is not the password of this account.');
  } else {
    if (!input.name) throw fieldError('name', 'Enter your name.');
    const pw = passwordField.safeParse(input.password);
    if (!pw.success) throw fieldError('password', pw.error.issues[0]!.message);
  }
  const passwordHash = creds ? null : await hashPassword(input.password);
  await writeTransaction(async (trx) => {
    // Re-read inside the write lock: two clicks on the same link accept it once.
    const inv = await getInvitationByToken(input.token, trx);
    assertInvitationUsable(inv);
    let userId = await findUserIdByEmail(inv.email, trx);
    if (userId && (await hasActiveMembership(userId, trx))) throw conflict('This account already belongs to a firm on Stochos.');
    if (!userId) userId = await insertUser({ email: inv.email, name: input.name!, passwordHash, verified: true }, trx);
    // The invitation was e-mailed to this address: following it proves the address, for an existing account too.
    else await markEmailVerified(userId, trx);
    // The owner takes no seat; authors and checkers do.
    if (inv.role !== 'owner') await assertSeatAvailable(inv.firmId, { adding: 1, countInvitations: false }, trx);
    const membershipId = await insertMembership(inv.firmId, userId, inv.role, trx);
    if (!(await markInvitationAccepted(inv.id, trx))) throw new AppError('gone', 'This invitation was already used.');
    await recordAudit({ firmId: inv.firmId, actorUserId: userId, action: 'member.joined', targetType: 'member', targetId: membershipId, detail: { email: inv.email, role: inv.role } }, trx);
  });
  return { email: existing.email };
}
