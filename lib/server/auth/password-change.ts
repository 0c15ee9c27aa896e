import 'server-only';
import type { z } from 'zod';
import { writeTransaction } from '@/db/knex';
import { getActiveMember, getUserCredentials, setPassword } from '@/db/users';
import { getPasswordReset, insertPasswordReset, usePasswordResets } from '@/db/accounts';
import { recordAudit } from '@/db/audit';
import { newSecret } from '@/db/ids';
import { hashPassword, verifyPassword } from '@/lib/server/auth/password';
import { takeMailAllowance } from '@/lib/server/auth/mail-limits';
import { assertSignInAllowed, noteSignInFailure, noteSignInSuccess } from '@/lib/server/auth/rate-limit';
import { AppError, fieldError, notFound } from '@/lib/server/http/errors';
import { linkMail, sendMail } from '@/lib/server/mail/send';
import { env } from '@/lib/server/env';
import type { Member } from '@/lib/server/auth/guard';
import type { changePasswordSchema, resetPasswordSchema } from '@/lib/core/auth/schemas';

export const RESET_LINK_MINUTES = 30;

const base = () => env().APP_URL.replace(/\/+$/, '');

/** Tells the account's owner that the password changed, so a change they did not make does not go unnoticed. */
async function sendChangedNotice(email: string, name: string, how: string): Promise<void> {
  await sendMail(
    linkMail(
      email,
      'Your Stochos password was changed',
      [
        `Hello ${name},`,
        `The password of your Stochos account was ${how}. Every other session of this account has been signed out.`,
        'If you did not do this, set a new password at once with “Forgot your password?” on the sign-in page, and tell your firm’s account owner.',
      ],
      { label: 'Open the sign-in page', url: `${base()}/sign-in` },
    ),
  );
}

/**
 * E-mails a single-use link to set a new password. The answer is the same whether or not the address has an
 * account (the e-mail limits count either way); unknown addresses get no mail.
 */
export async function requestPasswordReset(email: string, client: string): Promise<void> {
  await takeMailAllowance('password-reset', { recipient: email, client });
  const user = await getUserCredentials(email);
  if (!user) return;
  const token = newSecret();
  await insertPasswordReset(user.id, token, new Date(Date.now() + RESET_LINK_MINUTES * 60_000).toISOString());
  await sendMail(
    linkMail(
      user.email,
      'Set a new Stochos password',
      [
        `Hello ${user.name},`,
        'Someone (we hope you) asked to set a new password for your Stochos account. Follow the link to choose one.',
        `The link works once and expires in ${RESET_LINK_MINUTES} minutes. Setting the new password signs out every other session of this account.`,
        'If you did not ask for it, ignore this message: your password stays as it is.',
      ],
      { label: 'Choose a new password', url: `${base()}/reset-password/${token}` },
    ),
  );
}

/** Follows the e-mailed link: sets the password, uses up every open link, proves the address and ends all sessions. */
export async function resetPassword(input: z.infer<typeof resetPasswordSchema>): Promise<{ email: string; canSignIn: boolean }> {
  const found = await getPasswordReset(input.token);
  if (!found) throw notFound('That password-reset link');
  if (found.usedAt) throw new AppError('gone', 'This password-reset link was already used, or a newer one replaced it. Ask for a new link.');
  if (Date.parse(found.expiresAt) < Date.now()) throw new AppError('gone', `This password-reset link has expired (links last ${RESET_LINK_MINUTES} minutes). Ask for a new one.`);
  const passwordHash = await hashPassword(input.password);
  const user = await writeTransaction(async (trx) => {
    // Inside the write lock: of two submissions of one link, only the first sets a password.
    if (!(await usePasswordResets(found.id, found.userId, trx))) {
      throw new AppError('gone', 'This password-reset link was already used. Ask for a new link.');
    }
    await setPassword(found.userId, passwordHash, { verifyEmail: true }, trx);
    return found;
  });
  await noteSignInSuccess(user.email);
  const creds = await getUserCredentials(user.email);
  const member = await getActiveMember(user.userId);
  if (member) await recordAudit({ firmId: member.firmId, actorUserId: member.userId, action: 'user.password_reset', targetType: 'user', targetId: member.userId });
  await sendChangedNotice(user.email, creds?.name ?? '', 'reset with an e-mailed link');
  return { email: user.email, canSignIn: Boolean(member) };
}

/** Signed in: the current password proves it is the person, not just their open session. Ends every session. */
export async function changePassword(member: Member, input: z.infer<typeof changePasswordSchema>, client: string): Promise<void> {
  await assertSignInAllowed(member.email, client);
  const creds = await getUserCredentials(member.email);
  if (!creds?.passwordHash || !(await verifyPassword(input.currentPassword, creds.passwordHash))) {
    await noteSignInFailure(member.email, client);
    throw fieldError('currentPassword', 'That is not your current password.');
  }
  if (input.currentPassword === input.newPassword) throw fieldError('newPassword', 'Choose a password different from the current one.');
  const passwordHash = await hashPassword(input.newPassword);
  await writeTransaction(async (trx) => {
    await setPassword(member.userId, passwordHash, { verifyEmail: false }, trx);
    await recordAudit({ firmId: member.firmId, actorUserId: member.userId, action: 'user.password_changed', targetType: 'user', targetId: member.userId }, trx);
  });
  await sendChangedNotice(member.email, member.name, 'changed from its settings');
}
