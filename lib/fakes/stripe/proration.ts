// Prorations: reading item changes from parameters and pricing them for the rest of the period.
// Pure with respect to state: the callers decide what to store.
import type Stripe from 'stripe';
import { invalidRequest } from './errors';
import { newId, randomToken } from './ids';
import type { LineSpec } from './objects';
import type { Params } from './params';
import { prorate } from './period';
import { type FakeCore, type ItemChange, productName } from './core';

/** Proration lines for changing items at time `at`, without touching state. */
export function prorationLines(core: FakeCore, sub: Stripe.Subscription, changes: ItemChange[], at: number, tmpIds: boolean): LineSpec[] {
  const lines: LineSpec[] = [];
  const when = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' }).format(
    new Date(at * 1000),
  );
  for (const { item, quantity, price } of changes) {
    const oldQty = item.quantity ?? 1;
    if (oldQty === quantity && item.price.id === price.id) continue;
    const start = item.current_period_start;
    const end = item.current_period_end;
    const lineId = () => (tmpIds ? `il_tmp_${randomToken(24)}` : newId('il'));
    const itemId = () => (tmpIds ? `ii_tmp_${randomToken(24)}` : newId('ii'));
    const lastPaid = core.invoicesOf({ subscription: sub.id }).find(
      (i) => i.status === 'paid' && i.lines.data.some((l) => l.parent?.subscription_item_details?.subscription_item === item.id && !l.parent.subscription_item_details.proration),
    );
    const creditedLine = lastPaid?.lines.data.find((l) => l.parent?.subscription_item_details?.subscription_item === item.id);
    lines.push({
      id: lineId(),
      amount: -prorate(item.price.unit_amount ?? 0, oldQty, start, end, at),
      currency: sub.currency,
      description: `Unused time on ${oldQty} × ${productName(core.state, item.price)} after ${when}`,
      price: item.price,
      quantity: oldQty,
      periodStart: at,
      periodEnd: end,
      subscription: sub.id,
      subscriptionItem: item.id,
      invoiceItem: itemId(),
      proration: true,
      creditedItems: lastPaid && creditedLine ? { invoice: lastPaid.id, invoice_line_items: [creditedLine.id] } : null,
    });
    lines.push({
      id: lineId(),
      amount: prorate(price.unit_amount ?? 0, quantity, start, end, at),
      currency: sub.currency,
      description: `Remaining time on ${quantity} × ${productName(core.state, price)} after ${when}`,
      price,
      quantity,
      periodStart: at,
      periodEnd: end,
      subscription: sub.id,
      subscriptionItem: item.id,
      invoiceItem: itemId(),
      proration: true,
      creditedItems: null,
    });
  }
  return lines;
}

/** Reads items[] of an update or preview into concrete changes, validating every parameter. */
export function readItemChanges(core: FakeCore, sub: Stripe.Subscription, items: Params[] | undefined): ItemChange[] {
  if (!items) return [];
  return items.map((ip) => {
    const id = ip.str('id');
    if (ip.bool('deleted')) throw invalidRequest('The local fake Stripe cannot delete subscription items.', ip.name('deleted'));
    const item = id ? sub.items.data.find((x) => x.id === id) : sub.items.data.length === 1 && !ip.has('price') ? sub.items.data[0] : undefined;
    if (!item) {
      if (id) throw invalidRequest(`No such subscription item: '${id}'`, ip.name('id'), 'resource_missing');
      throw invalidRequest('The local fake Stripe cannot add items to a subscription; pass items[0][id].', ip.name('id'));
    }
    const priceId = ip.str('price');
    const price = priceId ? core.price(priceId, ip.name('price')) : item.price;
    if (priceId) {
      if (!price.recurring) throw invalidRequest('The price must be recurring.', ip.name('price'));
      if (price.currency !== sub.currency) throw invalidRequest('The price must use the subscription currency.', ip.name('price'));
      if (price.recurring.interval !== item.price.recurring?.interval || price.recurring.interval_count !== item.price.recurring?.interval_count) {
        throw invalidRequest('The local fake Stripe cannot change the billing interval.', ip.name('price'));
      }
    }
    const quantity = ip.int('quantity', { min: 1, max: core.settings.maxQuantity }) ?? item.quantity ?? 1;
    return { item, quantity, price };
  });
}

export function readProrationDate(core: FakeCore, sub: Stripe.Subscription, p: Params, key: string): number {
  const at = p.int(key);
  const item = sub.items.data[0];
  if (at === undefined) return core.now(sub.customer as string);
  if (at < item.current_period_start || at > item.current_period_end) {
    throw invalidRequest('proration_date must be within the current billing period.', p.name(key));
  }
  return at;
}
