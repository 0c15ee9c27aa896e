// Shared pieces for the fake Stripe tests: a webhook receiver that checks every signature with the
// official SDK, a browser-like form post to the hosted pages, and an SDK client bound to the fake.
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { startFakeStripe, type FakeStripeHandle, type FakeStripeOptions } from '@/lib/fakes/stripe/server';

export const SECRET = 'whsec_fake_stripe_test_secret';

export interface Hit {
  at: number;
  status: number;
  type: string | null;
  raw: string;
  signature: string;
}

export interface Receiver {
  url: string;
  events: Stripe.Event[];
  hits: Hit[];
  /** Answer the next n deliveries with HTTP 500. */
  failNext(n: number): void;
  waitFor(pred: (events: Stripe.Event[]) => boolean, timeoutMs?: number): Promise<void>;
  close(): Promise<void>;
}

export async function startReceiver(secret = SECRET, port = 0): Promise<Receiver> {
  const verifier = new Stripe('sk_test_receiver');
  const events: Stripe.Event[] = [];
  const hits: Hit[] = [];
  let failures = 0;
  const server = http.createServer((req, res) => {
    const chunks: Buffer[] = [];
    req.on('data', (c: Buffer) => chunks.push(c));
    req.on('end', () => {
      const raw = Buffer.concat(chunks).toString('utf8');
      const signature = String(req.headers['stripe-signature'] ?? '');
      const type = (() => {
        try {
          return (JSON.parse(raw) as { type?: string }).type ?? null;
        } catch {
          return null;
        }
      })();
      if (failures > 0) {
        failures -= 1;
        hits.push({ at: Date.now(), status: 500, type, raw, signature });
        res.writeHead(500).end('temporary failure');
        return;
      }
      try {
        // The real check the app's webhook route performs.
        const event = verifier.webhooks.constructEvent(raw, signature, secret);
        events.push(event);
        hits.push({ at: Date.now(), status: 200, type, raw, signature });
        res.writeHead(200, { 'Content-Type': 'application/json' }).end('{"received":true}');
      } catch {
        hits.push({ at: Date.now(), status: 400, type, raw, signature });
        res.writeHead(400).end('bad signature');
      }
    });
  });
  await new Promise<void>((r) => server.listen(port, '127.0.0.1', r));
  const url = `http://127.0.0.1:${(server.address() as AddressInfo).port}/api/webhooks/stripe`;
  return {
    url,
    events,
    hits,
    failNext(n) {
      failures = n;
    },
    async waitFor(pred, timeoutMs = 10_000) {
      const start = Date.now();
      while (!pred(events)) {
        if (Date.now() - start > timeoutMs) {
          throw new Error(`webhooks not received in time; got: ${events.map((e) => e.type).join(', ')}`);
        }
        await new Promise((r) => setTimeout(r, 20));
      }
    },
    close: () =>
      new Promise<void>((r) => {
        server.close(() => r());
        server.closeAllConnections();
      }),
  };
}

export async function startFake(options: FakeStripeOptions = {}): Promise<{ handle: FakeStripeHandle; stripe: Stripe }> {
  const handle = await startFakeStripe({ port: 0, log: false, retry: { baseMs: 40, maxMs: 400 }, ...options });
  const stripe = new Stripe('sk_test_stochos_fake', { host: '127.0.0.1', port: handle.port, protocol: 'http', maxNetworkRetries: 0 });
  return { handle, stripe };
}

/** What a browser does when the buyer presses the pay button: a urlencoded form POST, redirects not followed. */
export function postForm(url: string, fields: Record<string, string>): Promise<Response> {
  return fetch(url, {
    method: 'POST',
    headers: { 'Content-Type': 'application/x-www-form-urlencoded' },
    body: new URLSearchParams(fields).toString(),
    redirect: 'manual',
  });
}

export const GOOD_CARD = { card_number: '4242 4242 4242 4242', card_expiry: '12 / 34', card_cvc: '123', card_name: 'Ada Example' };
export const DECLINE_CARD = { ...GOOD_CARD, card_number: '4000 0000 0000 0002' };

export async function subscribe(
  stripe: Stripe,
  seats: number,
  extra: Partial<Stripe.Checkout.SessionCreateParams> = {},
): Promise<{ customer: Stripe.Customer; session: Stripe.Checkout.Session; subscription: Stripe.Subscription }> {
  const customer = await stripe.customers.create({ email: `owner-${seats}@firm.test`, name: 'Northgate Tolerancing', metadata: { firm_id: 'firm_1' } });
  const session = await stripe.checkout.sessions.create({
    mode: 'subscription',
    customer: customer.id,
    line_items: [{ price: 'price_stochos_seat', quantity: seats }],
    success_url: 'http://127.0.0.1:3000/app/billing?checkout={CHECKOUT_SESSION_ID}',
    cancel_url: 'http://127.0.0.1:3000/app/billing?canceled=1',
    client_reference_id: 'firm_1',
    metadata: { firm_id: 'firm_1' },
    subscription_data: { metadata: { firm_id: 'firm_1' } },
    ...extra,
  });
  const res = await postForm(session.url!, GOOD_CARD);
  if (res.status !== 303) throw new Error(`checkout did not complete: ${res.status} ${await res.text()}`);
  const done = await stripe.checkout.sessions.retrieve(session.id, { expand: ['subscription'] });
  return { customer, session: done, subscription: done.subscription as Stripe.Subscription };
}
