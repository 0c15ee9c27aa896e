import 'server-only';
import type { z } from 'zod';
import { writeTransaction } from '@/db/knex';
import { findUserIdByEmail, getUserCredentials, insertFirmWithOwner, insertUser } from '@/db/users';
import { deletePendingSignUps, getPendingSignUp, insertPendingSignUp } from '@/db/accounts';
import { recordAudit } from '@/db/audit';
import { newSecret } from '@/db/ids';
import { burnPasswordCheck, hashPassword, verifyPassword } from '@/lib/server/auth/password';
import { takeMailAllowance } from '@/lib/server/auth/mail-limits';
import { assertSignInAllowed, noteSignInFailure } from '@/lib/server/auth/rate-limit';
import { AppError, conflict, fieldError, notFound } from '@/lib/server/http/errors';
import { linkMail, sendMail } from '@/lib/server/mail/send';
import { env } from '@/lib/server/env';
import type { confirmSignUpSchema, signUpSchema } from '@/lib/core/auth/schemas';

export const SIGN_UP_LINK_HOURS = 24;

/**
 * Sign-up creates nothing yet: it e-mails a confirmation link, and the firm and its owner exist only once the
 * owner of the address follows it. The answer is the same whether or not the address already has an account;
 * an existing account's owner gets a notice instead of a link.
 */
export async function requestSignUp(input: z.infer<typeof signUpSchema>, client: string): Promise<void> {
  await takeMailAllowance('sign-up', { recipient: input.email, client });
  // Hash either way, so the time taken does not tell whether the address is known.
  const passwordHash = await hashPassword(input.password);
  const existing = await getUserCredentials(input.email);
  const base = env().APP_URL.replace(/\/+$/, '');
  if (existing) {
    await sendMail(
      linkMail(
        existing.email,
        'Someone tried to sign up on Stochos with your address',
        [
          `Hello ${existing.name},`,
          `Someone asked to create a new firm’s account (“${input.firmName}”) on Stochos with this e-mail address. This address already has a Stochos account, so nothing was created or changed.`,
          'If it was you: sign in with your password or a sign-in link. If you forgot your password, set a new one from the sign-in page (“Forgot your password?”).',
          'If it was not you, you need do nothing.',
        ],
        { label: 'Sign in to Stochos', url: `${base}/sign-in?email=${encodeURIComponent(existing.email)}` },
      ),
    );
    return;
  }
  const token = newSecret();
  const expiresAt = new Date(Date.now() + SIGN_UP_LINK_HOURS * 3_600_000).toISOString();
  await insertPendingSignUp({ email: input.email, name: input.name, firmName: input.firmName, passwordHash, token, expiresAt });
  await sendMail(
    linkMail(
      input.email,
      'Confirm your e-mail address for Stochos',
      [
        `Hello ${input.name},`,
        `You asked to create the Stochos account of ${input.firmName} with this e-mail address. Follow the link and enter the password you chose to confirm the address and open the account.`,
        `The link works once and expires in ${SIGN_UP_LINK_HOURS} hours. Until then, nothing is created.`,
        'If it was not you, ignore this message: no account will be created.',
      ],
      { label: 'Confirm and open the account', url: `${base}/sign-up/confirm/${token}` },
    ),
  );
}

/** Follows the e-mailed link: with the password chosen at sign-up, creates the firm and its owner (address verified). */
export async function confirmSignUp(input: z.infer<typeof confirmSignUpSchema>, client: string): Promise<{ email: string }> {
  const pending = await getPendingSignUp(input.token);
  if (!pending) {
    await burnPasswordCheck(input.password);
    throw notFound('That confirmation link');
  }
  if (Date.parse(pending.expiresAt) < Date.now()) throw new AppError('gone', `This confirmation link has expired (links last ${SIGN_UP_LINK_HOURS} hours). Sign up again to get a new one.`);
  // The password is checked too: whoever created the sign-up cannot hand an account to the address's owner, nor the reverse.
  await assertSignInAllowed(pending.email, client);
  if (!(await verifyPassword(input.password, pending.passwordHash))) {
    await noteSignInFailure(pending.email, client);
    throw fieldError('password', 'That is not the password chosen when signing up. Check it, or sign up again with a new password.');
  }
  await writeTransaction(async (trx) => {
    // Re-read inside the write lock: two clicks create one account.
    const again = await getPendingSignUp(input.token, trx);
    if (!again) throw new AppError('gone', 'This link was already used. Sign in with your e-mail and password.');
    if (await findUserIdByEmail(again.email, trx)) {
      await deletePendingSignUps(again.email, trx);
      throw conflict('This address already has a Stochos account. Sign in instead.');
    }
    const userId = await insertUser({ email: again.email, name: again.name, passwordHash: again.passwordHash, verified: true }, trx);
    const firmId = await insertFirmWithOwner({ name: again.firmName }, userId, trx);
    await deletePendingSignUps(again.email, trx);
    await recordAudit({ firmId, actorUserId: userId, action: 'firm.created', targetType: 'firm', targetId: firmId, detail: { name: again.firmName } }, trx);
  });
  return { email: pending.email };
}
