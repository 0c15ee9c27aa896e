// Catalogue: products and prices (the seat price is seeded by the core).
import type Stripe from 'stripe';
import { invalidRequest } from './errors';
import { newId } from './ids';
import { priceObject, productObject } from './objects';
import type { Params } from './params';
import type { FakeCore, RequestContext } from './core';

export function createProduct(core: FakeCore, p: Params, ctx: RequestContext): Stripe.Product {
  return core.tx(() => {
    const id = p.str('id') || newId('prod', 14);
    if (core.state.products[id]) throw invalidRequest(`Product already exists.`, 'id', 'resource_already_exists');
    const product = productObject({
      id,
      created: core.now(),
      name: p.reqStr('name'),
      description: p.str('description') || null,
      unitLabel: p.str('unit_label') || null,
      metadata: p.applyMetadata({}),
    });
    if (p.has('active')) product.active = p.bool('active') ?? true;
    core.state.products[id] = product;
    core.emit('product.created', product, ctx);
    return product;
  });
}

export function createPrice(core: FakeCore, p: Params, ctx: RequestContext): Stripe.Price {
  return core.tx(() => {
    const currency = p.reqStr('currency').toLowerCase();
    const unitAmount = p.int('unit_amount', { min: 0 });
    if (unitAmount === undefined) throw invalidRequest('Missing required param: unit_amount.', 'unit_amount');
    let productId = p.str('product');
    const productData = p.child('product_data');
    if (!productId && productData) {
      productId = createProduct(core, productData, ctx).id;
    }
    if (!productId) throw invalidRequest('Missing required param: product.', 'product');
    core.product(productId, 'product');
    const recurring = p.child('recurring');
    const interval = recurring?.enumOf('interval', ['day', 'week', 'month', 'year'] as const) ?? null;
    if (recurring && !interval) throw invalidRequest('Missing required param: recurring[interval].', 'recurring[interval]');
    const lookupKey = p.str('lookup_key') || null;
    if (lookupKey) {
      const holder = Object.values(core.state.prices).find((x) => x.lookup_key === lookupKey);
      if (holder) {
        if (p.bool('transfer_lookup_key')) holder.lookup_key = null;
        else throw invalidRequest(`A price (\`${holder.id}\`) already uses that lookup key.`, 'lookup_key');
      }
    }
    const price = priceObject({
      id: newId('price'),
      created: core.now(),
      product: productId,
      currency,
      unitAmount,
      interval,
      intervalCount: recurring?.int('interval_count', { min: 1, max: 12 }) ?? 1,
      lookupKey,
      nickname: p.str('nickname') || null,
      metadata: p.applyMetadata({}),
    });
    core.state.prices[price.id] = price;
    core.emit('price.created', price, ctx);
    return price;
  });
}
