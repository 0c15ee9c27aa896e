import { beforeAll, describe, expect, it } from 'vitest';
import { useFreshDb } from '../../support/test-db';
import { resetEnvCache } from '@/lib/server/env';
import { getDb } from '@/db/knex';
import { mailAllowanceLocks, takeMailAllowance, takeMailAllowanceIn } from '@/lib/server/auth/mail-limits';
import { writeTransaction } from '@/db/knex';
import { AppError } from '@/lib/server/http/errors';

// The e-mail limits against a real (temporary) database. Limits are common practice, no source.
beforeAll(async () => {
  process.env.MAIL_LIMIT_PER_CLIENT_HOUR = '8';
  resetEnvCache();
  await useFreshDb();
});

async function refusal(p: Promise<unknown>): Promise<AppError> {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(AppError);
  return err as AppError;
}

describe('e-mail limits', () => {
  it('per client address, shared across kinds of e-mail and recipients', async () => {
    for (let i = 0; i < 4; i++) await takeMailAllowance('sign-in-link', { recipient: `a${i}@x.example`, client: '198.51.100.7' });
    for (let i = 0; i < 4; i++) await takeMailAllowance('password-reset', { recipient: `b${i}@x.example`, client: '198.51.100.7' });
    const err = await refusal(takeMailAllowance('sign-up', { recipient: 'c@x.example', client: '198.51.100.7' }));
    expect(err.status).toBe(429);
    expect(err.message).toMatch(/Too many e-mails were requested from your network address. Try again in 60 minutes/);
    expect(err.retryAfter).toBeGreaterThan(3500);
    // Another client is not affected.
    await takeMailAllowance('sign-up', { recipient: 'c@x.example', client: '198.51.100.8' });
  });

  it('per recipient, case-insensitive, and a refused request is not counted', async () => {
    for (let i = 0; i < 5; i++) await takeMailAllowance('password-reset', { recipient: 'Someone@Firm.example', client: `203.0.113.${i}` });
    const err = await refusal(takeMailAllowance('password-reset', { recipient: 'someone@firm.example', client: '203.0.113.99' }));
    expect(err.message).toMatch(/Too many password-reset links/);
    const n = await getDb()('mail_sends').where('key', 'like', 'mail:client:203.0.113.99').count({ n: '*' }).first();
    expect(Number(n?.n)).toBe(0);
  });

  it('requests at the same moment cannot overshoot a limit', async () => {
    const tries = Array.from({ length: 12 }, (_, i) => takeMailAllowance('sign-up', { recipient: 'rush@x.example', client: `192.0.2.${i}` }));
    const settled = await Promise.allSettled(tries);
    expect(settled.filter((s) => s.status === 'fulfilled')).toHaveLength(5);
    const n = await getDb()('mail_sends').where('key', 'mail:sign-up:recipient:rush@x.example').count({ n: '*' }).first();
    expect(Number(n?.n)).toBe(5);
  });

  it('frees up as the window moves on', async () => {
    const old = new Date(Date.now() - 2 * 3_600_000).toISOString();
    await getDb()('mail_sends').insert(Array.from({ length: 10 }, () => ({ key: 'mail:sign-in-link:recipient:late@x.example', at: old })));
    await takeMailAllowance('sign-in-link', { recipient: 'late@x.example' });
  });

  it('invitations per firm: 50 per 24 hours, with the wait in hours', async () => {
    for (let i = 0; i < 50; i++) await takeMailAllowance('invitation', { firm: 'firm-1' });
    const err = await refusal(takeMailAllowance('invitation', { firm: 'firm-1' }));
    expect(err.message).toMatch(/50 invitations in the last 24 hours.*Try again in 24 hours/);
    await takeMailAllowance('invitation', { firm: 'firm-2' });
  });

  it('inside a write transaction: counted only when it commits, and concurrent ones cannot overshoot', async () => {
    const subjects = { firm: 'firm-3' };
    const locks = mailAllowanceLocks('invitation', subjects);
    const count = async () => Number((await getDb()('mail_sends').where('key', locks[0]).count({ n: '*' }).first())?.n);
    // A transaction that fails after taking the allowance (an invitation refused for a seat, say) counts nothing.
    await expect(
      writeTransaction(async (trx) => {
        await takeMailAllowanceIn(trx, 'invitation', subjects);
        throw new Error('refused later in the transaction');
      }, { locks }),
    ).rejects.toThrow('refused later');
    expect(await count()).toBe(0);
    await getDb()('mail_sends').insert(Array.from({ length: 47 }, () => ({ key: locks[0], at: new Date().toISOString() })));
    const tries = Array.from({ length: 6 }, () => writeTransaction((trx) => takeMailAllowanceIn(trx, 'invitation', subjects), { locks }));
    const settled = await Promise.allSettled(tries);
    expect(settled.filter((s) => s.status === 'fulfilled')).toHaveLength(3);
    expect(await count()).toBe(50);
  });
});
