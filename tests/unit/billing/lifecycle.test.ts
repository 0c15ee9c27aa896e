// The owner's whole billing life at the library level: the official SDK against the local fake Stripe, its hosted
// pages posted like a browser, signed webhooks verified and applied by the app's own code into SQLite, e-mails
// through the local SMTP fake. No Next.js server: the route handlers are thin wrappers over these functions.
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import http from 'node:http';
import os from 'node:os';
import path from 'node:path';
import fs from 'node:fs';
import type { AddressInfo } from 'node:net';
import { randomUUID } from 'node:crypto';
import { useFreshDb } from '../../support/test-db';
import { closeDb, getDb, writeTransaction } from '@/db/knex';
import { resetEnvCache } from '@/lib/server/env';
import { resetMailTransport } from '@/lib/server/mail/send';
import { insertFirmWithOwner, insertUser } from '@/db/users';
import { insertMembership } from '@/db/team';
import { getBillingAccount, listInvoices, listSubscriptions } from '@/db/billing';
import { verifyWebhook, stripe } from '@/lib/server/billing/stripe';
import { processStripeEvent, type EventOutcome } from '@/lib/server/billing/webhooks';
import { deliverNotices } from '@/lib/server/billing/mail';
import { assertAuthoringAllowed, billingStatus } from '@/lib/server/billing';
import { billingSummary, changeSeats, openPortal, previewSeatChange, setCancelAtPeriodEnd, startCheckout } from '@/lib/server/billing/service';
import { AppError } from '@/lib/server/http/errors';
import type { Member } from '@/lib/server/auth/guard';
import { startFakeStripe, type FakeStripeHandle } from '@/lib/fakes/stripe/server';
import { startFakeSmtp, type FakeSmtpHandle } from '@/lib/fakes/smtp/server';

const GOOD = { card_number: '4242 4242 4242 4242', card_expiry: '12 / 34', card_cvc: '123', card_name: 'Olive Owner' };
const DECLINED = { ...GOOD, card_number: '4000 0000 0000 0002' };

let fake: FakeStripeHandle;
let smtp: FakeSmtpHandle;
let receiver: http.Server;
const outcomes: { type: string; outcome: EventOutcome | 'bad_signature' }[] = [];
let owner: Member;

const postForm = (url: string, fields: Record<string, string>) =>
  fetch(url, { method: 'POST', headers: { 'content-type': 'application/x-www-form-urlencoded' }, body: new URLSearchParams(fields).toString(), redirect: 'manual' });

async function settle(): Promise<void> {
  expect(await fake.waitForWebhooks(15_000)).toBe(true);
}

async function refusal(p: Promise<unknown>): Promise<AppError> {
  const err = await p.then(
    () => null,
    (e: unknown) => e,
  );
  expect(err).toBeInstanceOf(AppError);
  return err as AppError;
}

const mailsTo = (email: string, subject: RegExp) => smtp.messages().filter((m) => m.to.includes(email) && subject.test(m.subject));

async function waitForMail(email: string, subject: RegExp, count = 1): Promise<string> {
  for (let i = 0; i < 100; i++) {
    const found = mailsTo(email, subject);
    if (found.length >= count) return found[0]!.text;
    await new Promise((r) => setTimeout(r, 50));
  }
  throw new Error(`no mail ${subject} to ${email}; have: ${smtp.messages().map((m) => m.subject).join(' | ')}`);
}

beforeAll(async () => {
  await useFreshDb();
  const tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'stochos-billing-life-'));
  smtp = await startFakeSmtp({ smtpPort: 0, httpPort: 0, dir: path.join(tmp, 'mail'), log: false });
  receiver = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', async () => {
      const raw = Buffer.concat(chunks).toString('utf8');
      try {
        const event = verifyWebhook(raw, (req.headers['stripe-signature'] as string | undefined) ?? null);
        const result = await processStripeEvent(event, {
          fetchSubscription: (id) => stripe().subscriptions.retrieve(id).catch(() => null),
          now: () => Date.now(),
          log: () => undefined,
        });
        outcomes.push({ type: event.type, outcome: result.outcome });
        await deliverNotices(result.notices);
        res.writeHead(200).end('{}');
      } catch {
        outcomes.push({ type: 'unknown', outcome: 'bad_signature' });
        res.writeHead(400).end('{}');
      }
    });
  });
  await new Promise<void>((r) => receiver.listen(0, '127.0.0.1', r));
  const hookUrl = `http://127.0.0.1:${(receiver.address() as AddressInfo).port}/api/webhooks/stripe`;
  fake = await startFakeStripe({ port: 0, webhookUrl: hookUrl, webhookSecret: 'whsec_lifecycle_test_secret', log: false, retry: { baseMs: 50, maxMs: 500 } });
  Object.assign(process.env, {
    FAKE_STRIPE_URL: fake.url,
    STRIPE_WEBHOOK_SECRET: 'whsec_lifecycle_test_secret',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(smtp.smtpPort),
    APP_URL: 'http://localhost:3999',
    NEXTAUTH_URL: 'http://localhost:3999',
  });
  delete process.env.STRIPE_SECRET_KEY;
  delete process.env.STRIPE_PRICE_ID;
  resetEnvCache();
  resetMailTransport();

  const email = `owner-${randomUUID().slice(0, 8)}@hollin-stack.example`;
  owner = await writeTransaction(async (trx) => {
    const userId = await insertUser({ email, name: 'Olive Owner', passwordHash: null, verified: true }, trx);
    const firmId = await insertFirmWithOwner({ name: 'Hollin Stack Engineering' }, userId, trx);
    for (const role of ['author', 'checker'] as const) {
      const id = await insertUser({ email: `${role}-${randomUUID().slice(0, 8)}@hollin-stack.example`, name: role, passwordHash: null, verified: true }, trx);
      await insertMembership(firmId, id, role, trx);
    }
    const membership = await trx('memberships').select('id').where({ firm_id: firmId, user_id: userId }).first();
    return { userId, email, name: 'Olive Owner', sessionVersion: 1, membershipId: membership.id, firmId, firmName: 'Hollin Stack Engineering', role: 'owner' as const };
  });
});

afterAll(async () => {
  await fake?.close();
  await smtp?.close();
  await new Promise<void>((r) => (receiver ? receiver.close(() => r()) : r()));
  await closeDb();
});

describe('billing life: trial, buy, grow, fail, recover, shrink, cancel', () => {
  let customerId: string;

  it('starts on the trial with 3 seats and the seeded price', async () => {
    expect(await billingStatus(owner.firmId)).toMatchObject({ kind: 'trial', seats: 3, authoring: true });
    const summary = await billingSummary(owner);
    expect(summary.plan).toEqual({ name: 'Stochos seat', unitAmount: 2900, currency: 'eur', interval: 'month' });
    expect(summary).toMatchObject({ provider: 'local fake', subscription: null, upcoming: null, invoices: [], providerError: null, seats: { used: 2, allowed: 3, paid: null } });
  });

  it('refuses seat counts outside 1..500 and below the members in use, before calling Stripe', async () => {
    for (const seats of [0, 501, 2.5]) expect((await refusal(startCheckout(owner, seats))).fields?.seats?.[0]).toMatch(/from 1 to 500/);
    const below = await refusal(startCheckout(owner, 1));
    expect(below.code).toBe('validation_failed');
    expect(below.message).toMatch(/cannot buy 1 seat: 2 authors and checkers use seats now.*at least 2/);
    expect((await getBillingAccount(owner.firmId))?.stripeCustomerId ?? null).toBeNull();
  });

  it('buys 3 seats through the hosted checkout; a declined card changes nothing', async () => {
    let { url } = await startCheckout(owner, 3);
    expect(url).toMatch(/\/checkout\/cs_test_/);
    customerId = (await getBillingAccount(owner.firmId))!.stripeCustomerId!;
    expect(customerId).toMatch(/^cus_/);

    const declined = await postForm(url, DECLINED);
    expect(declined.status).toBe(402);
    expect(await declined.text()).toContain('Your card was declined.');
    await settle();
    expect(await listSubscriptions(owner.firmId)).toEqual([]);

    // Opening checkout again retires the first page, so two tabs cannot start two subscriptions.
    const { url: second } = await startCheckout(owner, 3);
    const stale = await postForm(url, GOOD);
    expect(stale.status).toBe(402);
    expect(await stale.text()).toMatch(/This checkout (page )?has expired/);
    url = second;

    const paid = await postForm(url, GOOD);
    expect(paid.status).toBe(303);
    expect(paid.headers.get('location')).toMatch(/^http:\/\/localhost:3999\/app\/billing\?checkout=success&session_id=cs_test_/);
    await settle();
    const [sub] = await listSubscriptions(owner.firmId);
    expect(sub).toMatchObject({ status: 'active', quantity: 3, customerId, unitAmount: 2900 });
    const [inv] = await listInvoices(owner.firmId);
    expect(inv).toMatchObject({ status: 'paid', amountPaid: 8700, seats: 3, currency: 'eur' });
    expect(await billingStatus(owner.firmId)).toMatchObject({ kind: 'active', seats: 3, seatsPaid: 3 });
    const receipt = await waitForMail(owner.email, /^Receipt: €87\.00/);
    expect(receipt).toMatch(/received €87\.00 from Hollin Stack Engineering/);
    expect(receipt).toMatch(/Seats: 3 seats \(authors and checkers\)/);
    expect(receipt).toMatch(/http:\/\/localhost:3999\/app\/billing/);

    const again = await refusal(startCheckout(owner, 4));
    expect(again.code).toBe('conflict');
    expect(again.message).toMatch(/already has a subscription \(3 seats, active\)/);
  });

  it('grows to 5 seats: the preview quotes the prorated charge and the change charges exactly that', async () => {
    const preview = await previewSeatChange(owner, 5);
    // Two more seats for (almost) the whole month: 2 × €29.00, prorated to the second (Stripe-style proration).
    expect(preview.dueNow).toBeGreaterThan(5700);
    expect(preview.dueNow).toBeLessThanOrEqual(5800);
    expect(preview).toMatchObject({ seats: 5, currentSeats: 3, currency: 'eur', nextPeriodAmount: 14500 });
    expect(preview.lines.map((l) => l.description).join('\n')).toMatch(/Unused time on 3 × Stochos seat[\s\S]*Remaining time on 5 × Stochos seat/);

    const tampered = await refusal(changeSeats(owner, { seats: 4, prorationDate: preview.prorationDate, quote: preview.quote }));
    expect(tampered.fields?.quote?.[0]).toMatch(/does not match/);

    await changeSeats(owner, { seats: 5, prorationDate: preview.prorationDate, quote: preview.quote });
    await settle();
    expect((await listSubscriptions(owner.firmId))[0]).toMatchObject({ quantity: 5, status: 'active' });
    const invoices = await listInvoices(owner.firmId);
    const update = invoices.find((i) => i.billingReason === 'subscription_update');
    expect(update).toMatchObject({ status: 'paid', amountPaid: preview.dueNow, seats: 5 });
  });

  it('a failed renewal makes the firm past due with a warning e-mail; everything keeps working in the grace period', async () => {
    expect((await fetch(`${fake.url}/_fake/card?customer=${customerId}&number=4000000000000002`, { method: 'POST' })).status).toBe(200);
    const adv = (await (await fetch(`${fake.url}/_fake/advance?customer=${customerId}`, { method: 'POST' })).json()) as { advanced: { outcome: string }[] };
    expect(adv.advanced.map((a) => a.outcome)).toEqual(['payment_failed']);
    await settle();
    const status = await billingStatus(owner.firmId);
    expect(status).toMatchObject({ kind: 'past_due', seats: 5, authoring: true });
    // The grace period runs 7 days from when the app saw the failure (the fake's clock jumped a month ahead).
    expect(Date.parse(status.graceEndsAt!) - Date.now()).toBeGreaterThan(6.9 * 86_400_000);
    expect(Date.parse(status.graceEndsAt!) - Date.now()).toBeLessThanOrEqual(7 * 86_400_000);
    await expect(assertAuthoringAllowed(owner.firmId)).resolves.toBeUndefined();
    const warning = await waitForMail(owner.email, /^Payment failed/);
    expect(warning).toMatch(/could not collect €145\.00/);
    expect(warning).toMatch(/keeps working until .* \(a 7-day grace period\)/);
    expect((await listInvoices(owner.firmId))[0]).toMatchObject({ status: 'open', attemptCount: 1 });
    const summary = await billingSummary(owner);
    expect(summary.invoices[0]?.status).toBe('failed');
  });

  it('recovers when the owner puts a working card on file in the portal', async () => {
    const { url } = await openPortal(owner);
    expect(url).toMatch(/\/portal\/bps_/);
    const res = await postForm(`${url}/card`, GOOD);
    expect(res.status).toBe(303);
    expect(res.headers.get('location')).toBe('http://localhost:3999/app/billing?portal=returned');
    await settle();
    expect(await billingStatus(owner.firmId)).toMatchObject({ kind: 'active', seats: 5 });
    expect((await listInvoices(owner.firmId))[0]).toMatchObject({ status: 'paid', amountPaid: 14500 });
    await waitForMail(owner.email, /^Receipt: €145\.00/);
  });

  it('shrinks to 2 seats but never below the members in use', async () => {
    const below = await refusal(previewSeatChange(owner, 1));
    expect(below.message).toMatch(/cannot lower seats to 1 seat: 2 authors and checkers use seats now/);
    const same = await refusal(previewSeatChange(owner, 5));
    expect(same.message).toBe('You already pay for 5 seats.');
    const preview = await previewSeatChange(owner, 2);
    expect(preview.dueNow).toBe(0);
    expect(preview.prorationTotal).toBeLessThan(0);
    await changeSeats(owner, { seats: 2 });
    await settle();
    expect((await listSubscriptions(owner.firmId))[0]?.quantity).toBe(2);
  });

  it('cancels at period end, resumes, cancels again and ends at the period end', async () => {
    await setCancelAtPeriodEnd(owner, true);
    await settle();
    const canceling = await billingStatus(owner.firmId);
    expect(canceling).toMatchObject({ kind: 'canceling', seats: 2, authoring: true });
    expect((await billingSummary(owner)).upcoming).toBeNull();
    expect((await refusal(setCancelAtPeriodEnd(owner, true))).message).toMatch(/already ends on/);

    await setCancelAtPeriodEnd(owner, false);
    await settle();
    expect((await billingStatus(owner.firmId)).kind).toBe('active');
    // The next renewal bills 2 seats less the credit left by the shrink (Stripe applies customer credit first).
    const balance = ((await stripe().customers.retrieve(customerId)) as { balance: number }).balance;
    expect(balance).toBeLessThan(0);
    expect((await billingSummary(owner)).upcoming).toMatchObject({ amount: Math.max(0, 5800 + balance), currency: 'eur' });

    await setCancelAtPeriodEnd(owner, true);
    await settle();
    await fetch(`${fake.url}/_fake/advance?customer=${customerId}`, { method: 'POST' });
    await settle();
    expect(await billingStatus(owner.firmId)).toMatchObject({ kind: 'canceled', seats: 0, authoring: false });
    const blocked = await refusal(assertAuthoringAllowed(owner.firmId));
    expect(blocked.code).toBe('forbidden');
    expect(blocked.message).toMatch(/subscription ended on .*subscribe again.*widgets keep working/);
    // After cancelling, buying again is allowed.
    expect((await startCheckout(owner, 2)).url).toMatch(/\/checkout\//);
  });

  it('every webhook verified; a resent (replayed) event changes nothing', async () => {
    expect(outcomes.some((o) => o.outcome === 'bad_signature')).toBe(false);
    const events = (await (await fetch(`${fake.url}/_fake/events?type=customer.subscription.created`)).json()) as { events: { id: string }[] };
    const before = await getDb()('billing_subscriptions').select('*');
    const n = outcomes.length;
    await fetch(`${fake.url}/_fake/events/${events.events[0]!.id}/resend`, { method: 'POST' });
    await settle();
    expect(outcomes.slice(n)).toEqual([{ type: 'customer.subscription.created', outcome: 'duplicate' }]);
    expect(await getDb()('billing_subscriptions').select('*')).toEqual(before);
  });
});
