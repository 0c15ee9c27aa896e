// The /v1 API the official SDK calls: one route table over the fake's resources, with Stripe's list
// pagination and `expand`. server.ts handles keys, idempotency and the HTTP around it.
import { FakeStripeError, invalidRequest } from './errors';
import { type FakeStripe, type RequestContext, newestFirst } from './fake';
import type { Params } from './params';

/** Path segments that are part of a route; every other segment is an object id. */
const LITERALS = new Set([
  'customers', 'payment_methods', 'products', 'prices', 'checkout', 'sessions', 'line_items', 'expire',
  'billing_portal', 'subscriptions', 'subscription_items', 'invoices', 'create_preview', 'lines', 'invoiceitems', 'events',
]);

export type Json = Record<string, unknown>;
export interface ApiResult {
  status: number;
  body: unknown;
}

function list<T extends { id: string }>(items: T[], p: Params, url: string): Json {
  const limit = p.int('limit', { min: 1, max: 100 }) ?? 10;
  const after = p.str('starting_after');
  const before = p.str('ending_before');
  let rest = items;
  if (after) {
    const i = rest.findIndex((x) => x.id === after);
    if (i < 0) throw invalidRequest(`No such object: '${after}'`, 'starting_after', 'resource_missing');
    rest = rest.slice(i + 1);
  }
  if (before) {
    const i = rest.findIndex((x) => x.id === before);
    if (i < 0) throw invalidRequest(`No such object: '${before}'`, 'ending_before', 'resource_missing');
    rest = rest.slice(0, i);
    return { object: 'list', data: rest.slice(-limit), has_more: rest.length > limit, url };
  }
  return { object: 'list', data: rest.slice(0, limit), has_more: rest.length > limit, url };
}

function expandPath(fake: FakeStripe, node: unknown, segs: string[], full: string): void {
  if (node === null || typeof node !== 'object') return;
  if (Array.isArray(node)) {
    for (const n of node) expandPath(fake, n, segs, full);
    return;
  }
  const [key, ...rest] = segs;
  const rec = node as Json;
  if (key === 'line_items' && rec.object === 'checkout.session') {
    const id = rec.id as string;
    rec.line_items = { object: 'list', data: structuredClone(fake.state.checkoutLineItems[id] ?? []), has_more: false, url: `/v1/checkout/sessions/${id}/line_items` };
  } else if (!(key in rec)) {
    throw invalidRequest(`This property cannot be expanded (${full}).`, 'expand');
  } else if (typeof rec[key] === 'string') {
    const found = fake.lookup(rec[key] as string);
    if (!found) throw invalidRequest(`This property cannot be expanded (${full}).`, 'expand');
    rec[key] = structuredClone(found);
  }
  if (rest.length > 0) expandPath(fake, rec[key], rest, full);
}

function render(fake: FakeStripe, object: unknown, p: Params): unknown {
  const out = structuredClone(object);
  for (const path of p.expand()) {
    if (path.split('.').length > 4) throw invalidRequest('You cannot expand more than 4 levels of a property.', 'expand');
    expandPath(fake, out, path.split('.'), path);
  }
  return out;
}

/** The /v1 API. Returns the live object; `render` clones and expands it. */
export function api(fake: FakeStripe, method: string, path: string, p: Params, ctx: RequestContext): ApiResult {
  const s = fake.state;
  const seg = path.split('/').filter(Boolean).slice(1); // drop "v1"
  const ok = (body: unknown): ApiResult => ({ status: 200, body: render(fake, body, p) });
  const route = `${method} /${seg.map((x) => (LITERALS.has(x) ? x : ':id')).join('/')}`;

  switch (route) {
    // customers
    case 'POST /customers':
      return ok(fake.createCustomer(p, ctx));
    case 'GET /customers': {
      const email = p.str('email');
      return ok(list(newestFirst(Object.values(s.customers).filter((c) => !email || c.email === email)), p, '/v1/customers'));
    }
    case 'GET /customers/:id':
      return ok(fake.customer(seg[1]));
    case 'POST /customers/:id':
      return ok(fake.updateCustomer(seg[1], p, ctx));
    case 'GET /customers/:id/payment_methods': {
      fake.customer(seg[1]);
      return ok(list(newestFirst(Object.values(s.paymentMethods).filter((pm) => pm.customer === seg[1])), p, `/v1/customers/${seg[1]}/payment_methods`));
    }
    case 'GET /payment_methods/:id':
      return ok(fake.paymentMethod(seg[1]));

    // catalogue
    case 'POST /products':
      return ok(fake.createProduct(p, ctx));
    case 'GET /products': {
      const active = p.bool('active');
      const ids = p.strings('ids');
      return ok(
        list(
          newestFirst(Object.values(s.products).filter((x) => (active === undefined || x.active === active) && (!ids || ids.includes(x.id)))),
          p,
          '/v1/products',
        ),
      );
    }
    case 'GET /products/:id':
      return ok(fake.product(seg[1]));
    case 'POST /prices':
      return ok(fake.createPrice(p, ctx));
    case 'GET /prices': {
      const active = p.bool('active');
      const currency = p.str('currency')?.toLowerCase();
      const product = p.str('product');
      const type = p.str('type');
      const lookupKeys = p.strings('lookup_keys');
      const interval = p.child('recurring')?.str('interval');
      const found = Object.values(s.prices).filter(
        (x) =>
          (active === undefined || x.active === active) &&
          (!currency || x.currency === currency) &&
          (!product || x.product === product) &&
          (!type || x.type === type) &&
          (!lookupKeys || (x.lookup_key !== null && lookupKeys.includes(x.lookup_key))) &&
          (!interval || x.recurring?.interval === interval),
      );
      return ok(list(newestFirst(found), p, '/v1/prices'));
    }
    case 'GET /prices/:id':
      return ok(fake.price(seg[1]));

    // checkout
    case 'POST /checkout/sessions':
      return ok(fake.createCheckoutSession(p));
    case 'GET /checkout/sessions': {
      const customer = p.str('customer');
      const subscription = p.str('subscription');
      const status = p.str('status');
      const found = Object.values(s.checkoutSessions).filter(
        (x) => (!customer || x.customer === customer) && (!subscription || x.subscription === subscription) && (!status || x.status === status),
      );
      return ok(list(newestFirst(found), p, '/v1/checkout/sessions'));
    }
    case 'GET /checkout/sessions/:id':
      return ok(fake.refreshCheckout(seg[2]));
    case 'GET /checkout/sessions/:id/line_items':
      fake.checkoutSession(seg[2]);
      return ok(list(s.checkoutLineItems[seg[2]] ?? [], p, `/v1/checkout/sessions/${seg[2]}/line_items`));
    case 'POST /checkout/sessions/:id/expire':
      return ok(fake.expireCheckoutSession(seg[2], ctx));

    // billing portal
    case 'POST /billing_portal/sessions':
      return ok(fake.createPortalSession(p, ctx));

    // subscriptions
    case 'GET /subscriptions': {
      const customer = p.str('customer');
      const price = p.str('price');
      const status = p.str('status');
      const found = Object.values(s.subscriptions).filter(
        (x) =>
          (!customer || x.customer === customer) &&
          (!price || x.items.data.some((i) => i.price.id === price)) &&
          (status === 'all' || (status === 'ended' ? x.status === 'canceled' : status ? x.status === status : x.status !== 'canceled')),
      );
      return ok(list(newestFirst(found), p, '/v1/subscriptions'));
    }
    case 'GET /subscriptions/:id':
      return ok(fake.subscription(seg[1]));
    case 'POST /subscriptions/:id':
      return ok(fake.updateSubscription(seg[1], p, ctx));
    case 'DELETE /subscriptions/:id':
      return ok(fake.cancelSubscription(seg[1], ctx));
    case 'GET /subscription_items': {
      const sub = fake.subscription(p.reqStr('subscription'), 'subscription');
      return ok(list(sub.items.data, p, '/v1/subscription_items'));
    }

    // invoices
    case 'GET /invoices': {
      const status = p.str('status');
      const found = fake
        .invoicesOf({ customer: p.str('customer'), subscription: p.str('subscription') })
        .filter((i) => !status || i.status === status);
      return ok(list(found, p, '/v1/invoices'));
    }
    case 'POST /invoices/create_preview':
      return ok(fake.previewInvoice(p));
    case 'GET /invoices/:id':
      return ok(fake.invoice(seg[1]));
    case 'GET /invoices/:id/lines':
      return ok(list(fake.invoice(seg[1]).lines.data, p, `/v1/invoices/${seg[1]}/lines`));
    case 'GET /invoiceitems': {
      const customer = p.str('customer');
      const pending = p.bool('pending');
      const invoice = p.str('invoice');
      const found = Object.values(s.invoiceItems).filter(
        (x) => (!customer || x.customer === customer) && (pending === undefined || (x.invoice === null) === pending) && (!invoice || x.invoice === invoice),
      );
      return ok(list(found.map((x, i) => ({ x, i })).sort((a, b) => b.x.date - a.x.date || b.i - a.i).map(({ x }) => x), p, '/v1/invoiceitems'));
    }

    // events
    case 'GET /events': {
      const type = p.str('type');
      const types = p.strings('types');
      const matches = (t: string) => (!type || (type.endsWith('*') ? t.startsWith(type.slice(0, -1)) : t === type)) && (!types || types.includes(t));
      const found = s.events.map((e) => e.event).filter((e) => matches(e.type)).reverse();
      return ok(list(found, p, '/v1/events'));
    }
    case 'GET /events/:id': {
      const e = s.events.find((x) => x.event.id === seg[1]);
      if (!e) throw new FakeStripeError(404, { type: 'invalid_request_error', code: 'resource_missing', message: `No such event: '${seg[1]}'`, param: 'id' });
      return ok(e.event);
    }
    default:
      throw new FakeStripeError(404, {
        type: 'invalid_request_error',
        message: `Unrecognized request URL (${method}: ${path}). The local fake Stripe implements only the endpoints Stochos uses.`,
      });
  }
}
