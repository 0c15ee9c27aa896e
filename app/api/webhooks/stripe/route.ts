import { after } from 'next/server';
import Stripe from 'stripe';
import { z } from 'zod';
import { route, json, readText } from '@/lib/server/http/handler';
import { AppError } from '@/lib/server/http/errors';
import { verifyWebhook, stripe } from '@/lib/server/billing/stripe';
import { processStripeEvent } from '@/lib/server/billing/webhooks';
import { deliverNotices } from '@/lib/server/billing/mail';

export const dynamic = 'force-dynamic';

// The least every event carries; anything else is read by the handler for its own event type.
const eventShape = z.object({ id: z.string().min(1), type: z.string().min(1), created: z.number().int(), data: z.object({ object: z.record(z.string(), z.unknown()) }) });

const deps = {
  fetchSubscription: async (id: string) => {
    try {
      return await stripe().subscriptions.retrieve(id);
    } catch (err) {
      console.warn(`[billing] could not read subscription ${id} from Stripe; using the event's copy:`, err instanceof Error ? err.message : err);
      return null;
    }
  },
  now: () => Date.now(),
  log: (line: string) => console.warn(`[billing webhook] ${line}`),
};

// Stripe calls this without cookies or an Origin header; the signature over the raw body is the credential.
export const POST = route(async (req) => {
  // Stripe's events are a few KiB; the usual 1 MiB cap applies.
  const raw = await readText(req);
  let event;
  try {
    event = verifyWebhook(raw, req.headers.get('stripe-signature'));
  } catch (err) {
    const text = err instanceof Error ? err.message : '';
    const why = !req.headers.get('stripe-signature')
      ? 'no Stripe-Signature header'
      : !(err instanceof Stripe.errors.StripeSignatureVerificationError)
        ? 'the body is not a Stripe event'
        : /tolerance/i.test(text)
          ? 'the signature is too old'
          : 'the signature does not match this endpoint’s secret';
    throw new AppError('bad_request', `Webhook refused: ${why}. Nothing was changed.`);
  }
  if (!eventShape.safeParse(event).success) throw new AppError('bad_request', 'Webhook refused: the body is not a Stripe event. Nothing was changed.');
  const result = await processStripeEvent(event, deps);
  // E-mails go out after the response, so a slow mail relay never makes Stripe retry an event already applied.
  if (result.notices.length) after(() => deliverNotices(result.notices));
  return json({ received: true, outcome: result.outcome });
});
