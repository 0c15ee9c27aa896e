// Entry point: `tsx lib/fakes/stripe/main.ts`. Configured by environment:
//   FAKE_STRIPE_PORT (12111), FAKE_STRIPE_HOST (127.0.0.1), FAKE_STRIPE_STATE (.data/fake-stripe.json),
//   FAKE_STRIPE_WEBHOOK_URL, FAKE_STRIPE_WEBHOOK_SECRET, FAKE_STRIPE_PUBLIC_URL (http://host:port),
//   FAKE_STRIPE_CURRENCY (eur), FAKE_STRIPE_SEAT_AMOUNT (2900), FAKE_STRIPE_PORTAL_PRORATION (create_prorations),
//   FAKE_STRIPE_RETRY_BASE_MS (500), FAKE_STRIPE_RETRY_MAX_MS (60000).
import { startFakeStripe } from './server';
import type { ProrationBehavior } from './fake';

function int(name: string, fallback: number): number {
  const raw = process.env[name];
  if (raw === undefined || raw === '') return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0) throw new Error(`${name} must be a non-negative integer, got "${raw}"`);
  return n;
}

async function main(): Promise<void> {
  const proration = (process.env.FAKE_STRIPE_PORTAL_PRORATION ?? 'create_prorations') as ProrationBehavior;
  if (!['create_prorations', 'always_invoice', 'none'].includes(proration)) {
    throw new Error('FAKE_STRIPE_PORTAL_PRORATION must be create_prorations, always_invoice or none');
  }
  const handle = await startFakeStripe({
    port: int('FAKE_STRIPE_PORT', 12111),
    host: process.env.FAKE_STRIPE_HOST || '127.0.0.1',
    statePath: process.env.FAKE_STRIPE_STATE || '.data/fake-stripe.json',
    webhookUrl: process.env.FAKE_STRIPE_WEBHOOK_URL || null,
    webhookSecret: process.env.FAKE_STRIPE_WEBHOOK_SECRET || null,
    publicUrl: process.env.FAKE_STRIPE_PUBLIC_URL || undefined,
    currency: process.env.FAKE_STRIPE_CURRENCY || 'eur',
    seatUnitAmount: int('FAKE_STRIPE_SEAT_AMOUNT', 2900),
    portalProrationBehavior: proration,
    retry: { baseMs: int('FAKE_STRIPE_RETRY_BASE_MS', 500), maxMs: int('FAKE_STRIPE_RETRY_MAX_MS', 60_000) },
  });
  const hooks = handle.fake.settings.webhookUrl
    ? `webhooks -> ${handle.fake.settings.webhookUrl}`
    : 'no webhook endpoint (set FAKE_STRIPE_WEBHOOK_URL and FAKE_STRIPE_WEBHOOK_SECRET)';
  console.log(`[fake-stripe] listening on ${handle.url}; pages at ${handle.fake.settings.publicUrl}; ${hooks}`);
  const stop = () => {
    void handle.close().then(() => process.exit(0));
  };
  process.on('SIGINT', stop);
  process.on('SIGTERM', stop);
}

main().catch((err: unknown) => {
  console.error('[fake-stripe] failed to start:', err);
  process.exit(1);
});
