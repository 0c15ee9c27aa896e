// Webhook retries with backoff, the event log, state that survives a restart, and the entry point.
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { backoffMs } from '@/lib/fakes/stripe/webhooks';
import { SECRET, startFake, startReceiver, subscribe, type Receiver } from './stripe-support';

const cleanups: Array<() => Promise<void>> = [];
afterEach(async () => {
  for (const fn of cleanups.splice(0).reverse()) await fn();
});

async function receiver(): Promise<Receiver> {
  const r = await startReceiver();
  cleanups.push(() => r.close());
  return r;
}

interface AdminEvent {
  id: string;
  type: string;
  delivery_status: string;
  attempts: { at: string; status: number | null; error: string | null }[];
}

describe('webhook delivery', () => {
  it('retries a failed delivery with growing waits until the app answers 2xx', async () => {
    const r = await receiver();
    const { handle, stripe } = await startFake({ webhookUrl: r.url, webhookSecret: SECRET, retry: { baseMs: 60, maxMs: 1000 } });
    cleanups.push(() => handle.close());
    r.failNext(3);
    const customer = await stripe.customers.create({ email: 'retry@firm.test' });
    expect(await handle.waitForWebhooks(10_000)).toBe(true);

    expect(r.hits.map((h) => h.status)).toEqual([500, 500, 500, 200]);
    expect(new Set(r.hits.map((h) => JSON.parse(h.raw).id)).size).toBe(1);
    expect(r.events).toHaveLength(1);
    expect((r.events[0].data.object as Stripe.Customer).id).toBe(customer.id);
    // Waits of about 60, 120 and 240 ms between attempts (timers fire late, never early).
    const gaps = r.hits.slice(1).map((h, i) => h.at - r.hits[i].at);
    expect(gaps[0]).toBeGreaterThanOrEqual(55);
    expect(gaps[1]).toBeGreaterThanOrEqual(115);
    expect(gaps[2]).toBeGreaterThanOrEqual(235);
    expect(gaps[2]).toBeGreaterThan(gaps[0]);

    const log = (await (await fetch(`${handle.url}/_fake/events`)).json()) as { events: AdminEvent[] };
    const entry = log.events.find((e) => e.type === 'customer.created')!;
    expect(entry.delivery_status).toBe('delivered');
    expect(entry.attempts.map((a) => a.status)).toEqual([500, 500, 500, 200]);
  });

  it('computes the backoff as base · 2^(n−1), capped', () => {
    expect([1, 2, 3, 4, 5, 6, 7].map((n) => backoffMs(n, 500, 16_000))).toEqual([500, 1000, 2000, 4000, 8000, 16_000, 16_000]);
  });

  it('records an unreachable endpoint as failed attempts without an HTTP status', async () => {
    const r = await startReceiver();
    const deadUrl = r.url;
    await r.close(); // nothing listens there any more
    const { handle, stripe } = await startFake({ webhookUrl: deadUrl, webhookSecret: SECRET, retry: { baseMs: 30, maxMs: 60 } });
    cleanups.push(() => handle.close());
    await stripe.customers.create({ email: 'down@firm.test' });
    const start = Date.now();
    let entry: AdminEvent | undefined;
    while (Date.now() - start < 5000) {
      const log = (await (await fetch(`${handle.url}/_fake/events`)).json()) as { events: AdminEvent[] };
      entry = log.events[0];
      if (entry && entry.attempts.length >= 2) break;
      await new Promise((res) => setTimeout(res, 20));
    }
    expect(entry!.delivery_status).toBe('pending');
    expect(entry!.attempts[0].status).toBeNull();
    expect(entry!.attempts[0].error).toBeTruthy();
  });

  it('serves the event log through the events API and can resend an event', async () => {
    const r = await receiver();
    const { handle, stripe } = await startFake({ webhookUrl: r.url, webhookSecret: SECRET });
    cleanups.push(() => handle.close());
    await subscribe(stripe, 2);
    await handle.waitForWebhooks();
    const completed = await stripe.events.list({ type: 'checkout.session.completed' });
    expect(completed.data).toHaveLength(1);
    const again = await stripe.events.retrieve(completed.data[0].id);
    expect(again.type).toBe('checkout.session.completed');
    expect(again.pending_webhooks).toBe(0);

    const before = r.events.filter((e) => e.id === again.id).length;
    const res = await fetch(`${handle.url}/_fake/events/${again.id}/resend`, { method: 'POST' });
    expect(res.status).toBe(200);
    await r.waitFor((evs) => evs.filter((e) => e.id === again.id).length === before + 1);
  });
});

describe('persistence', () => {
  it('keeps objects and undelivered events across a restart, then delivers them', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fake-stripe-'));
    cleanups.push(async () => fs.rmSync(dir, { recursive: true, force: true }));
    const statePath = path.join(dir, 'state', 'fake-stripe.json');
    const r = await receiver();
    r.failNext(1_000_000); // the app is "down" during the first run

    const first = await startFake({ statePath, webhookUrl: r.url, webhookSecret: SECRET, retry: { baseMs: 5000, maxMs: 5000 } });
    const { customer, subscription, session } = await subscribe(first.stripe, 3);
    await new Promise((res) => setTimeout(res, 100));
    await first.handle.close();
    expect(r.events).toHaveLength(0);
    const saved = JSON.parse(fs.readFileSync(statePath, 'utf8')) as { events: { event: { id: string }; delivery: { status: string } }[] };
    const pendingIds = saved.events.filter((e) => e.delivery.status === 'pending').map((e) => e.event.id);
    const pending = pendingIds.length;
    expect(pending).toBeGreaterThanOrEqual(8);
    expect(fs.readdirSync(path.dirname(statePath))).toEqual(['fake-stripe.json']); // no temp files left

    r.failNext(0);
    const second = await startFake({ statePath, webhookUrl: r.url, webhookSecret: SECRET, retry: { baseMs: 20, maxMs: 50 } });
    cleanups.push(() => second.handle.close());
    expect(((await second.stripe.customers.retrieve(customer.id)) as Stripe.Customer).email).toBe(customer.email);
    const sub = await second.stripe.subscriptions.retrieve(subscription.id);
    expect(sub.items.data[0].quantity).toBe(3);
    expect((await second.stripe.checkout.sessions.retrieve(session.id)).status).toBe('complete');

    // The first run's retries were 5 s apart; a restart makes every pending event due at once.
    expect(await second.handle.waitForWebhooks(10_000)).toBe(true);
    const types = r.events.map((e) => e.type);
    expect(types).toEqual(expect.arrayContaining(['customer.created', 'customer.subscription.created', 'checkout.session.completed', 'invoice.paid']));
    expect(r.events.map((e) => e.id)).toEqual(pendingIds); // in creation order
  });

  it('makes pending deliveries due at once on start, whatever their backoff said', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fake-stripe-'));
    cleanups.push(async () => fs.rmSync(dir, { recursive: true, force: true }));
    const statePath = path.join(dir, 'fake-stripe.json');
    const r = await receiver();
    r.failNext(1_000_000);
    const slow = { baseMs: 60_000, maxMs: 60_000 };
    const first = await startFake({ statePath, webhookUrl: r.url, webhookSecret: SECRET, retry: slow });
    await first.stripe.customers.create({ email: 'later@firm.test' });
    await r.waitFor(() => r.hits.length === 1);
    await first.handle.close();
    r.failNext(0);
    const second = await startFake({ statePath, webhookUrl: r.url, webhookSecret: SECRET, retry: slow });
    cleanups.push(() => second.handle.close());
    await r.waitFor((evs) => evs.some((e) => e.type === 'customer.created'), 5000);
    expect(r.hits.map((h) => h.status)).toEqual([500, 200]);
  });

  it('reset empties the account but keeps the seeded price', async () => {
    const { handle, stripe } = await startFake();
    cleanups.push(() => handle.close());
    await stripe.customers.create({ email: 'gone@firm.test' });
    await fetch(`${handle.url}/_fake/reset`, { method: 'POST' });
    expect((await stripe.customers.list()).data).toHaveLength(0);
    expect((await stripe.prices.retrieve('price_stochos_seat')).unit_amount).toBe(2900);
    const state = (await (await fetch(`${handle.url}/_fake/state`)).json()) as { events: unknown[]; customers: object };
    expect(state.events).toHaveLength(0);
    expect(Object.keys(state.customers)).toHaveLength(0);
  });
});

describe('entry point', () => {
  it('starts from the environment with tsx and answers the SDK', async () => {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'fake-stripe-main-'));
    cleanups.push(async () => fs.rmSync(dir, { recursive: true, force: true }));
    const child = spawn(process.execPath, [path.resolve('node_modules/tsx/dist/cli.mjs'), 'lib/fakes/stripe/main.ts'], {
      env: { ...process.env, FAKE_STRIPE_PORT: '0', FAKE_STRIPE_STATE: path.join(dir, 's.json'), FAKE_STRIPE_CURRENCY: 'usd' },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    cleanups.push(
      () =>
        new Promise<void>((res) => {
          if (child.exitCode !== null) return res();
          child.once('exit', () => res());
          child.kill('SIGTERM');
        }),
    );
    const url = await new Promise<string>((resolve, reject) => {
      let out = '';
      const timer = setTimeout(() => reject(new Error(`no start line: ${out}`)), 20_000);
      child.stdout!.on('data', (c: Buffer) => {
        out += c.toString();
        const m = /listening on (http:\/\/[\d.]+:\d+)/.exec(out);
        if (m) {
          clearTimeout(timer);
          resolve(m[1]);
        }
      });
      child.once('exit', (code) => reject(new Error(`exited ${code}: ${out}`)));
    });
    const port = Number(new URL(url).port);
    const sdk = new Stripe('sk_test_main', { host: '127.0.0.1', port, protocol: 'http', maxNetworkRetries: 0 });
    const price = await sdk.prices.retrieve('price_stochos_seat');
    expect(price.currency).toBe('usd');
    await sdk.customers.create({ email: 'main@firm.test' });
    expect(fs.existsSync(path.join(dir, 's.json'))).toBe(true);
  });
});
