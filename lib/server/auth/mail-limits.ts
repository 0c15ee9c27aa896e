import 'server-only';
import type { Knex } from 'knex';
import { takeMailSends, takeMailSendsIn } from '@/db/accounts';
import { AppError } from '@/lib/server/http/errors';
import { env } from '@/lib/server/env';

/**
 * Limits on the e-mails anyone can make Stochos send (common practice, no source): per recipient address,
 * per client address and, for invitations, per firm. Counted in the database so every app process shares them.
 * A request counts whether or not the recipient has an account, so the limit itself reveals nothing.
 */
export type MailKind = 'sign-in-link' | 'password-reset' | 'sign-up' | 'invitation';

const HOUR = 3_600_000;

interface Rule {
  max: number;
  windowMs: number;
  message: (wait: string) => string;
}

function rules(kind: MailKind): Partial<Record<'recipient' | 'client' | 'firm', Rule>> {
  const perClient: Rule = {
    max: env().MAIL_LIMIT_PER_CLIENT_HOUR,
    windowMs: HOUR,
    message: (wait) => `Too many e-mails were requested from your network address. Try again in ${wait}.`,
  };
  switch (kind) {
    case 'sign-in-link':
      return {
        recipient: { max: 5, windowMs: HOUR, message: (wait) => `Too many sign-in links were requested for this address. Try again in ${wait}, or sign in with your password.` },
        client: perClient,
      };
    case 'password-reset':
      return {
        recipient: { max: 5, windowMs: HOUR, message: (wait) => `Too many password-reset links were requested for this address. Use the newest link you received, or try again in ${wait}.` },
        client: perClient,
      };
    case 'sign-up':
      return {
        recipient: { max: 5, windowMs: HOUR, message: (wait) => `Too many sign-ups were tried with this address. Use the confirmation link already sent, or try again in ${wait}.` },
        client: perClient,
      };
    case 'invitation':
      return { firm: { max: 50, windowMs: 24 * HOUR, message: (wait) => `Your firm has sent 50 invitations in the last 24 hours, the most allowed. Try again in ${wait}.` } };
  }
}

export interface MailSubjects {
  recipient?: string;
  client?: string;
  firm?: string;
}

const keyOf = (kind: MailKind, what: keyof MailSubjects, value: string) =>
  // The per-client limit is shared by every kind of e-mail a visitor can trigger.
  what === 'client' ? `mail:client:${value}` : `mail:${kind}:${what}:${value.toLowerCase()}`;

function waitWords(seconds: number): string {
  if (seconds >= 5400) {
    const h = Math.ceil(seconds / 3600);
    return `${h} hour${h === 1 ? '' : 's'}`;
  }
  const m = Math.max(1, Math.ceil(seconds / 60));
  return `${m} minute${m === 1 ? '' : 's'}`;
}

function refusal(rule: Rule, oldest: string | null): AppError {
  const retryAfter = oldest ? Math.max(1, Math.ceil((Date.parse(oldest) + rule.windowMs - Date.now()) / 1000)) : Math.ceil(rule.windowMs / 1000);
  return new AppError('rate_limited', rule.message(waitWords(retryAfter)), { retryAfter });
}

function applicable(kind: MailKind, subjects: MailSubjects): { rule: Rule; key: string }[] {
  const r = rules(kind);
  return (['recipient', 'client', 'firm'] as const).flatMap((what) => {
    const rule = r[what];
    const value = subjects[what];
    return rule && value ? [{ rule, key: keyOf(kind, what, value) }] : [];
  });
}

const checksOf = (list: { rule: Rule; key: string }[], now: number) => list.map(({ rule, key }) => ({ key, max: rule.max, sinceIso: new Date(now - rule.windowMs).toISOString() }));

/** Check and count in one transaction, for e-mails a visitor triggers: concurrent requests cannot overshoot. */
export async function takeMailAllowance(kind: MailKind, subjects: MailSubjects): Promise<void> {
  const list = applicable(kind, subjects);
  const taken = await takeMailSends(checksOf(list, Date.now()));
  if (taken.refused !== null) throw refusal(list[taken.refused].rule, taken.oldest);
}

/** The lock keys takeMailAllowanceIn needs: pass them as writeTransaction's `locks`. */
export function mailAllowanceLocks(kind: MailKind, subjects: MailSubjects): string[] {
  return applicable(kind, subjects).map((a) => a.key);
}

/**
 * takeMailAllowance inside the caller's write transaction (opened with mailAllowanceLocks), so the e-mail is
 * counted only if the rest of the transaction (the invitation row, say) commits too.
 */
export async function takeMailAllowanceIn(trx: Knex.Transaction, kind: MailKind, subjects: MailSubjects): Promise<void> {
  const list = applicable(kind, subjects);
  const taken = await takeMailSendsIn(trx, checksOf(list, Date.now()));
  if (taken.refused !== null) throw refusal(list[taken.refused].rule, taken.oldest);
}
