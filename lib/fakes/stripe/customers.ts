// Customers: create and update, with the default card in invoice_settings.
import type Stripe from 'stripe';
import { invalidRequest } from './errors';
import { invoicePrefix, newId } from './ids';
import { customerObject } from './objects';
import type { Params } from './params';
import { clone, type FakeCore, previousAttributes, type RequestContext } from './core';

export function createCustomer(core: FakeCore, p: Params, ctx: RequestContext): Stripe.Customer {
  return core.tx(() => {
    const id = newId('cus', 14);
    const c = customerObject({
      id,
      created: core.now(),
      email: p.str('email') || null,
      name: p.str('name') || null,
      description: p.str('description') || null,
      phone: p.str('phone') || null,
      metadata: p.applyMetadata({}),
      invoicePrefix: invoicePrefix(),
    });
    core.state.customers[id] = c;
    const pm = p.child('invoice_settings')?.str('default_payment_method');
    if (pm) {
      attachPaymentMethod(core, core.paymentMethod(pm, 'invoice_settings[default_payment_method]'), id);
      c.invoice_settings.default_payment_method = pm;
    }
    core.emit('customer.created', c, ctx);
    return c;
  });
}

export function updateCustomer(core: FakeCore, id: string, p: Params, ctx: RequestContext): Stripe.Customer {
  return core.tx(() => {
    const c = core.customer(id);
    const before = clone(c);
    if (p.has('email')) c.email = p.str('email') || null;
    if (p.has('name')) c.name = p.str('name') || null;
    if (p.has('description')) c.description = p.str('description') || null;
    if (p.has('phone')) c.phone = p.str('phone') || null;
    c.metadata = p.applyMetadata(c.metadata);
    const settings = p.child('invoice_settings');
    if (settings?.has('default_payment_method')) {
      const pm = settings.str('default_payment_method');
      if (pm) attachPaymentMethod(core, core.paymentMethod(pm, 'invoice_settings[default_payment_method]'), id);
      c.invoice_settings.default_payment_method = pm || null;
    }
    const prev = previousAttributes(before, c);
    if (Object.keys(prev).length > 0) core.emit('customer.updated', c, ctx, prev);
    return c;
  });
}

function attachPaymentMethod(core: FakeCore, pm: Stripe.PaymentMethod, customer: string): void {
  if (pm.customer && pm.customer !== customer) {
    throw invalidRequest('The payment method is attached to another customer.', 'payment_method');
  }
  pm.customer = customer;
}
