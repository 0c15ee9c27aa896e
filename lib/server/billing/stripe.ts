import 'server-only';
import Stripe from 'stripe';
import { env, FAKE_STRIPE_KEY } from '@/lib/server/env';

// The one Stripe client. With STRIPE_SECRET_KEY set it talks to Stripe; without it, to the local fake
// (FAKE_STRIPE_URL) with a test key the fake accepts. Everything else in the app is the same either way.

let cached: { signature: string; client: Stripe } | null = null;

export function usingFakeStripe(): boolean {
  return !env().STRIPE_SECRET_KEY;
}

export function stripe(): Stripe {
  const e = env();
  const signature = `${e.STRIPE_SECRET_KEY ?? ''}|${e.FAKE_STRIPE_URL}`;
  if (cached?.signature === signature) return cached.client;
  const common = { maxNetworkRetries: 2, timeout: 15_000, telemetry: false, appInfo: { name: 'Stochos' } } as const;
  let client: Stripe;
  if (e.STRIPE_SECRET_KEY) {
    client = new Stripe(e.STRIPE_SECRET_KEY, common);
  } else {
    const u = new URL(e.FAKE_STRIPE_URL);
    const protocol = u.protocol === 'https:' ? 'https' : 'http';
    client = new Stripe(FAKE_STRIPE_KEY, { ...common, host: u.hostname, port: Number(u.port || (protocol === 'https' ? 443 : 80)), protocol });
  }
  cached = { signature, client };
  return client;
}

/** Verifies Stripe's signature on the raw body and parses the event; throws on a missing, wrong or stale signature. */
export function verifyWebhook(rawBody: string, signature: string | null): Stripe.Event {
  if (!signature) throw new Error('No Stripe-Signature header.');
  return stripe().webhooks.constructEvent(rawBody, signature, env().STRIPE_WEBHOOK_SECRET);
}

