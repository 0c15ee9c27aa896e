// HTTP front of the fake Stripe: the /v1 API the official SDK calls (routes in api.ts), the hosted pages
// (/checkout, /portal, /invoices) and the test-only admin endpoints under /_fake.
//
// Admin endpoints (not part of Stripe's API; loopback only):
//   POST /_fake/advance?customer=cus_…   (or subscription=sub_…, or nothing / all=1 for every subscription)
//        moves each subscription to its next period: cancel-at-period-end ones end
//        (customer.subscription.deleted); others retry open invoices, start the next period and charge
//        the card on file (invoice.paid, or invoice.payment_failed and status past_due).
//   POST /_fake/card?customer=cus_…&number=4000000000000002[&expiry=12/30]   sets the card on file
//   GET  /_fake/state     the whole state document
//   POST /_fake/reset     back to the seeded catalogue, no customers, no events
//   GET  /_fake/events[?type=…&status=pending|delivered|failed|no_endpoint]   events and delivery attempts
//   POST /_fake/events/:id/resend   queue an event for delivery again
//   POST /_fake/wait?timeout_ms=5000   answers once no delivery is pending (or on timeout)
//   GET  /_fake/health
import http from 'node:http';
import type { AddressInfo } from 'node:net';
import Stripe from 'stripe';
import { FakeStripeError, invalidRequest, type StripeErrorBody } from './errors';
import { api, type ApiResult, type Json } from './api';
import { FakeStripe, type FakeStripeSettings, type ProrationBehavior, NO_REQUEST } from './fake';
import { parseForm } from './form';
import { newId } from './ids';
import { checkoutPage, invoicePage, layout, messagePage, portalPage } from './pages';
import { Params } from './params';
import { Deliverer } from './webhooks';
import { refuseUnlessLocal } from '../local-only';

export interface FakeStripeOptions {
  /** 0 picks a free port. Default 12111. */
  port?: number;
  host?: string;
  /** JSON state file; null keeps state in memory only. Default null here (main.ts defaults to .data/fake-stripe.json). */
  statePath?: string | null;
  /** Alias of statePath. */
  stateFile?: string | null;
  /** Base URL of the hosted pages; defaults to http://host:port. */
  publicUrl?: string;
  webhookUrl?: string | null;
  webhookSecret?: string | null;
  /** Currency of the seeded seat price. Default eur. */
  currency?: string;
  /** Unit amount of the seeded seat price in minor units. Default 2900. */
  seatUnitAmount?: number;
  /** Highest seat quantity accepted (Stochos' own rule). Default 500. */
  maxQuantity?: number;
  retry?: Partial<FakeStripeSettings['retry']>;
  /** What seat changes made in the hosted portal do. Default create_prorations. */
  portalProrationBehavior?: ProrationBehavior;
  /** Log sink; false silences. Default: console.error with a prefix. */
  log?: ((line: string) => void) | false;
}

export interface FakeStripeHandle {
  url: string;
  port: number;
  fake: FakeStripe;
  /** Resolves true once no webhook delivery is pending, false on timeout. */
  waitForWebhooks(timeoutMs?: number): Promise<boolean>;
  close(): Promise<void>;
}

const BODY_LIMIT = 1024 * 1024;

function readBody(req: http.IncomingMessage): Promise<string> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    let size = 0;
    req.on('data', (c: Buffer) => {
      size += c.length;
      if (size > BODY_LIMIT) {
        reject(new FakeStripeError(413, { type: 'invalid_request_error', message: 'Request body too large.' }));
        req.destroy();
        return;
      }
      chunks.push(c);
    });
    req.on('end', () => resolve(Buffer.concat(chunks).toString('utf8')));
    req.on('error', reject);
  });
}

function sendJson(res: http.ServerResponse, status: number, body: unknown, headers: Record<string, string> = {}): void {
  const text = JSON.stringify(body, null, 2);
  res.writeHead(status, { 'Content-Type': 'application/json; charset=utf-8', 'Cache-Control': 'no-store', ...headers });
  res.end(text);
}

function sendHtml(res: http.ServerResponse, status: number, html: string): void {
  res.writeHead(status, { 'Content-Type': 'text/html; charset=utf-8', 'Cache-Control': 'no-store', 'X-Content-Type-Options': 'nosniff' });
  res.end(html);
}

function redirect(res: http.ServerResponse, location: string): void {
  res.writeHead(303, { Location: location, 'Cache-Control': 'no-store' });
  res.end();
}

function formStrings(body: string): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [k, v] of Object.entries(parseForm(body))) if (typeof v === 'string') out[k] = v;
  return out;
}

function cardInput(f: Record<string, string>) {
  return { number: f.card_number ?? '', expiry: f.card_expiry ?? '', cvc: f.card_cvc ?? '', name: f.card_name ?? '', email: f.email ?? '' };
}

/** Echo what the buyer typed, except the security code. */
function echo(f: Record<string, string>): Record<string, string> {
  const rest = { ...f };
  delete rest.card_cvc;
  return rest;
}

interface IdempotentEntry {
  fingerprint: string;
  status: number;
  body: unknown;
}

export async function startFakeStripe(options: FakeStripeOptions = {}): Promise<FakeStripeHandle> {
  const host = options.host ?? '127.0.0.1';
  const log = options.log === false ? () => undefined : (options.log ?? ((line: string) => console.error(`[fake-stripe] ${line}`)));
  const settings: FakeStripeSettings = {
    statePath: options.statePath ?? options.stateFile ?? null,
    publicUrl: options.publicUrl ?? '',
    webhookUrl: options.webhookUrl ?? null,
    webhookSecret: options.webhookSecret ?? null,
    currency: (options.currency ?? 'eur').toLowerCase(),
    seatUnitAmount: options.seatUnitAmount ?? 2900,
    maxQuantity: options.maxQuantity ?? 500,
    retry: { baseMs: 500, maxMs: 60_000, maxAgeMs: 3 * 24 * 3600 * 1000, timeoutMs: 10_000, ...options.retry },
    portalProrationBehavior: options.portalProrationBehavior ?? 'create_prorations',
    log,
  };
  const fake = new FakeStripe(settings);
  const deliverer = new Deliverer(fake);
  const idempotency = new Map<string, IdempotentEntry>();

  async function handleApi(req: http.IncomingMessage, res: http.ServerResponse, url: URL, body: string): Promise<void> {
    const requestId = newId('req', 14);
    const version = (req.headers['stripe-version'] as string | undefined) ?? '';
    const headers: Record<string, string> = { 'Request-Id': requestId, 'Stripe-Version': version || Stripe.API_VERSION };
    const auth = req.headers.authorization ?? '';
    const key = auth.startsWith('Bearer ') ? auth.slice(7) : auth.startsWith('Basic ') ? Buffer.from(auth.slice(6), 'base64').toString().split(':')[0] : '';
    if (!key) {
      sendJson(res, 401, { error: { type: 'invalid_request_error', message: 'You did not provide an API key.' } }, headers);
      return;
    }
    if (!/^(sk|rk)_test_/.test(key)) {
      sendJson(res, 401, { error: { type: 'invalid_request_error', code: 'api_key_invalid', message: 'The local fake Stripe accepts test keys only (sk_test_…).' } }, headers);
      return;
    }
    const method = req.method ?? 'GET';
    const idemKey = method === 'POST' ? ((req.headers['idempotency-key'] as string | undefined) ?? null) : null;
    const fingerprint = `${method} ${url.pathname} ${body}`;
    if (idemKey) {
      headers['Idempotency-Key'] = idemKey;
      const seen = idempotency.get(idemKey);
      if (seen) {
        if (seen.fingerprint !== fingerprint) {
          sendJson(res, 400, { error: { type: 'idempotency_error', message: 'Keys for idempotent requests can only be used with the same parameters they were first used with.' } }, headers);
        } else {
          sendJson(res, seen.status, seen.body, { ...headers, 'Idempotent-Replayed': 'true' });
        }
        return;
      }
    }
    const raw = { ...parseForm(url.search.slice(1)), ...(method === 'GET' ? {} : parseForm(body)) };
    let result: ApiResult;
    try {
      result = api(fake, method, url.pathname, new Params(raw), { requestId, idempotencyKey: idemKey });
    } catch (err) {
      if (!(err instanceof FakeStripeError)) throw err;
      result = { status: err.status, body: { error: { ...err.body, request_log_url: null } satisfies StripeErrorBody & Json } };
    }
    if (idemKey && result.status !== 500) {
      idempotency.set(idemKey, { fingerprint, status: result.status, body: result.body });
      if (idempotency.size > 2000) idempotency.delete(idempotency.keys().next().value as string);
    }
    sendJson(res, result.status, result.body, headers);
  }

  async function handleAdmin(req: http.IncomingMessage, res: http.ServerResponse, url: URL, body: string): Promise<void> {
    const refused = refuseUnlessLocal(req, [`http://${host}:${port}`, settings.publicUrl || `http://${host}:${port}`]);
    if (refused) return sendJson(res, 403, { error: { type: 'invalid_request_error', message: refused } });
    const q = { ...Object.fromEntries(url.searchParams), ...formStrings(body) };
    const method = req.method ?? 'GET';
    const path = url.pathname;
    if (method === 'GET' && path === '/_fake/health') return sendJson(res, 200, { ok: true });
    if (method === 'GET' && path === '/_fake/state') return sendJson(res, 200, fake.state);
    if (method === 'POST' && path === '/_fake/reset') {
      fake.reset();
      return sendJson(res, 200, { ok: true });
    }
    if (method === 'POST' && path === '/_fake/advance') {
      const customer = q.customer && q.customer !== 'all' ? q.customer : undefined;
      const results = fake.advance({ customer, subscription: q.subscription || undefined });
      return sendJson(res, 200, { advanced: results });
    }
    if (method === 'POST' && path === '/_fake/card') {
      if (!q.customer) throw invalidRequest('Missing required param: customer.', 'customer');
      if (!q.number) throw invalidRequest('Missing required param: number.', 'number');
      const pm = fake.setCardForTests(q.customer, q.number, q.expiry);
      return sendJson(res, 200, pm);
    }
    if (method === 'GET' && path === '/_fake/events') {
      const events = fake.state.events
        .filter((e) => (!q.type || e.event.type === q.type) && (!q.status || e.delivery.status === q.status))
        .map((e) => ({
          id: e.event.id,
          type: e.event.type,
          created: e.event.created,
          object_id: (e.event.data.object as { id?: string }).id ?? null,
          delivery_status: e.delivery.status,
          next_attempt_at: e.delivery.nextAttemptAt ? new Date(e.delivery.nextAttemptAt).toISOString() : null,
          attempts: e.delivery.attempts.map((a) => ({ at: new Date(a.at).toISOString(), status: a.status, error: a.error })),
        }));
      return sendJson(res, 200, { events, pending: deliverer.pendingCount(), webhook_url: settings.webhookUrl });
    }
    const resend = /^\/_fake\/events\/(evt_[A-Za-z0-9]+)\/resend$/.exec(path);
    if (method === 'POST' && resend) {
      const stored = fake.state.events.find((e) => e.event.id === resend[1]);
      if (!stored) throw new FakeStripeError(404, { type: 'invalid_request_error', message: `No such event: '${resend[1]}'`, param: 'id' });
      fake.tx(() => {
        stored.delivery.status = 'pending';
        stored.delivery.nextAttemptAt = Date.now();
      });
      return sendJson(res, 200, { ok: true });
    }
    if (method === 'POST' && path === '/_fake/wait') {
      const idle = await deliverer.waitForIdle(Math.min(120_000, Number(q.timeout_ms ?? 10_000) || 10_000));
      return sendJson(res, 200, { idle, pending: deliverer.pendingCount() });
    }
    throw new FakeStripeError(404, { type: 'invalid_request_error', message: `Unknown admin endpoint ${method} ${path}` });
  }

  function handlePages(req: http.IncomingMessage, res: http.ServerResponse, url: URL, body: string): void {
    const method = req.method ?? 'GET';
    const parts = url.pathname.split('/').filter(Boolean);
    const f = formStrings(body);
    const [kind, id, action] = parts;
    const objectFor = (): unknown => (kind === 'checkout' ? fake.state.checkoutSessions[id] : kind === 'portal' ? fake.state.portalSessions[id] : fake.state.invoices[id]);
    if (!id || !objectFor()) return sendHtml(res, 404, messagePage('Page not found', 'This payment link is not valid. Start again from Stochos.'));

    if (kind === 'checkout') {
      const session = fake.refreshCheckout(id);
      if (method === 'GET' && !action) return sendHtml(res, 200, checkoutPage(fake, session, {}));
      if (method === 'POST' && !action) {
        const outcome = fake.completeCheckout(id, cardInput(f));
        if (outcome.ok) return redirect(res, outcome.redirect);
        return sendHtml(res, 402, checkoutPage(fake, fake.checkoutSession(id), { values: echo(f), error: outcome.message, field: outcome.field }));
      }
    }

    if (kind === 'portal') {
      const session = fake.portalSession(id);
      const done = () => (session.return_url ? redirect(res, session.return_url) : redirect(res, `/portal/${id}`));
      if (method === 'GET' && !action) return sendHtml(res, 200, portalPage(fake, session, {}));
      if (method === 'POST' && action === 'seats') {
        const seats = /^\d+$/.test((f.seats ?? '').trim()) ? Number(f.seats.trim()) : NaN;
        try {
          if (f.confirm === '1') {
            fake.portalChangeSeats(id, seats);
            return done();
          }
          const current = fake.portalSubscription(session.customer)?.items.data[0].quantity;
          if (seats === current) return sendHtml(res, 400, portalPage(fake, session, { values: f, field: 'seats', error: `You already have ${seats} seats.` }));
          const preview = fake.portalPreviewSeats(id, seats);
          return sendHtml(res, 200, portalPage(fake, session, { confirm: { seats, preview } }));
        } catch (err) {
          if (err instanceof FakeStripeError) return sendHtml(res, 400, portalPage(fake, session, { values: f, field: 'seats', error: err.message }));
          throw err;
        }
      }
      if (method === 'POST' && (action === 'cancel' || action === 'resume')) {
        fake.portalSetCancel(id, action === 'cancel');
        return done();
      }
      if (method === 'POST' && action === 'card') {
        const outcome = fake.portalUpdateCard(id, cardInput(f));
        if (outcome.ok) return done();
        return sendHtml(res, 402, portalPage(fake, session, { values: echo(f), error: outcome.message, field: outcome.field }));
      }
    }

    if (kind === 'invoices') {
      const invoice = fake.invoice(id);
      if (method === 'GET' && !action) return sendHtml(res, 200, invoicePage(invoice, {}));
      if (method === 'POST' && action === 'pay') {
        const outcome = fake.payInvoiceWithCard(id, cardInput(f));
        if (outcome.ok) return sendHtml(res, 200, invoicePage(fake.invoice(id), { field: 'notice', error: 'Payment received. Thank you.' }));
        return sendHtml(res, 402, invoicePage(invoice, { values: echo(f), error: outcome.message, field: outcome.field }));
      }
    }
    return sendHtml(res, 405, messagePage('Not allowed', 'That action is not available on this page.'));
  }

  // Known once listening; the admin endpoints compare a request's Origin with it.
  let port = 0;
  const server = http.createServer((req, res) => {
    void (async () => {
      const url = new URL(req.url ?? '/', 'http://fake.local');
      try {
        const body = await readBody(req);
        if (url.pathname.startsWith('/v1/')) return await handleApi(req, res, url, body);
        if (url.pathname.startsWith('/_fake/')) return await handleAdmin(req, res, url, body);
        if (/^\/(checkout|portal|invoices)\//.test(url.pathname)) return handlePages(req, res, url, body);
        if (url.pathname === '/') {
          return sendHtml(res, 200, layout('Local payment service', '<h1>Local payment service</h1><section><p>This is the local stand-in for the payment provider used in development, demos and tests. Its pages open from links in Stochos.</p></section>'));
        }
        return sendHtml(res, 404, messagePage('Page not found', 'There is nothing at this address.'));
      } catch (err) {
        if (res.headersSent) return res.end();
        if (err instanceof FakeStripeError) {
          if (url.pathname.startsWith('/v1/') || url.pathname.startsWith('/_fake/')) return sendJson(res, err.status, { error: err.body });
          return sendHtml(res, err.status, messagePage('Something is not right', err.message));
        }
        log(`internal error on ${req.method} ${url.pathname}: ${err instanceof Error ? (err.stack ?? err.message) : String(err)}`);
        const message = 'An internal error occurred in the local fake Stripe; see its log.';
        if (url.pathname.startsWith('/v1/') || url.pathname.startsWith('/_fake/')) return sendJson(res, 500, { error: { type: 'api_error', message } });
        return sendHtml(res, 500, messagePage('Something went wrong', message));
      }
    })();
  });

  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 12111, host, () => {
      server.off('error', reject);
      resolve();
    });
  });
  port = (server.address() as AddressInfo).port;
  const url = `http://${host}:${port}`;
  if (!settings.publicUrl) settings.publicUrl = url;
  settings.publicUrl = settings.publicUrl.replace(/\/+$/, '');
  deliverer.start();

  return {
    url,
    port,
    fake,
    waitForWebhooks: (timeoutMs = 10_000) => deliverer.waitForIdle(timeoutMs),
    close: async () => {
      const closed = new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await deliverer.stop();
      fake.persist();
      await closed;
    },
  };
}

export { FakeStripe, NO_REQUEST };
