// Builders for invoices, their lines and pending invoice items (see objects.ts for what this API version
// changed: invoices name their subscription under parent.subscription_details, lines carry pricing.price_details).
import type Stripe from 'stripe';

/** Decimal fields travel as strings on the wire; the SDK turns them into its Decimal type. */
export function dec(value: number): Stripe.Decimal {
  return String(value) as unknown as Stripe.Decimal;
}

export interface LineSpec {
  id: string;
  amount: number;
  currency: string;
  description: string;
  price: Stripe.Price;
  quantity: number;
  periodStart: number;
  periodEnd: number;
  subscription: string | null;
  subscriptionItem: string | null;
  /** Set for lines that come from an invoice item (prorations). */
  invoiceItem: string | null;
  proration: boolean;
  creditedItems: { invoice: string; invoice_line_items: string[] } | null;
}

export function invoiceLineObject(invoice: string | null, s: LineSpec): Stripe.InvoiceLineItem {
  const product = typeof s.price.product === 'string' ? s.price.product : s.price.product.id;
  return {
    id: s.id,
    object: 'line_item',
    amount: s.amount,
    currency: s.currency,
    description: s.description,
    discount_amounts: [],
    discountable: true,
    discounts: [],
    invoice,
    livemode: false,
    metadata: {},
    parent: s.subscriptionItem
      ? {
          type: 'subscription_item_details',
          invoice_item_details: null,
          subscription_item_details: {
            invoice_item: s.invoiceItem,
            proration: s.proration,
            proration_details: { credited_items: s.creditedItems },
            subscription: s.subscription,
            subscription_item: s.subscriptionItem,
          },
        }
      : {
          type: 'invoice_item_details',
          subscription_item_details: null,
          invoice_item_details: {
            invoice_item: s.invoiceItem ?? '',
            proration: s.proration,
            proration_details: { credited_items: s.creditedItems },
            subscription: s.subscription,
          },
        },
    period: { start: s.periodStart, end: s.periodEnd },
    pretax_credit_amounts: [],
    pricing: {
      type: 'price_details',
      price_details: { price: s.price.id, product },
      unit_amount_decimal: s.price.unit_amount_decimal,
    },
    quantity: s.quantity,
    quantity_decimal: dec(s.quantity),
    subscription: s.subscription,
    subtotal: s.amount,
    taxes: [],
  };
}

export function invoiceItemObject(a: {
  created: number;
  customer: string;
  line: LineSpec;
  subscriptionMetadata: Record<string, string>;
  invoice: string | null;
}): Stripe.InvoiceItem {
  const s = a.line;
  const product = typeof s.price.product === 'string' ? s.price.product : s.price.product.id;
  return {
    id: s.invoiceItem ?? s.id,
    object: 'invoiceitem',
    amount: s.amount,
    currency: s.currency,
    customer: a.customer,
    customer_account: null,
    date: a.created,
    description: s.description,
    discountable: false,
    discounts: [],
    invoice: a.invoice,
    livemode: false,
    metadata: {},
    parent: s.subscription
      ? {
          type: 'subscription_details',
          subscription_details: { subscription: s.subscription, ...(s.subscriptionItem ? { subscription_item: s.subscriptionItem } : {}) },
        }
      : null,
    period: { start: s.periodStart, end: s.periodEnd },
    pricing: {
      type: 'price_details',
      price_details: { price: s.price.id, product },
      unit_amount_decimal: s.price.unit_amount_decimal,
    },
    proration: s.proration,
    proration_details: {
      credited_items: s.creditedItems
        ? { type: 'invoice_line_items', invoice_line_item_details: s.creditedItems }
        : null,
      discount_amounts: [],
    },
    quantity: s.quantity,
    quantity_decimal: dec(s.quantity),
    tax_rates: [],
    test_clock: null,
  };
}

export function invoiceObject(a: {
  id: string;
  created: number;
  customer: Stripe.Customer;
  currency: string;
  subscription: Stripe.Subscription | null;
  billingReason: Stripe.Invoice.BillingReason;
  lines: Stripe.InvoiceLineItem[];
  periodStart: number;
  periodEnd: number;
  number: string | null;
  hostedUrl: string | null;
  startingBalance: number;
}): Stripe.Invoice {
  const subtotal = a.lines.reduce((sum, l) => sum + l.amount, 0);
  const amountDue = Math.max(0, subtotal + a.startingBalance);
  return {
    id: a.id,
    object: 'invoice',
    account_country: 'DE',
    account_name: 'Stochos (local test account)',
    account_tax_ids: null,
    amount_due: amountDue,
    amount_overpaid: 0,
    amount_paid: 0,
    amount_remaining: amountDue,
    amount_shipping: 0,
    application: null,
    attempt_count: 0,
    attempted: false,
    auto_advance: true,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null, provider: null, status: null },
    automatically_finalizes_at: null,
    billing_reason: a.billingReason,
    collection_method: 'charge_automatically',
    created: a.created,
    currency: a.currency,
    custom_fields: null,
    customer: a.customer.id,
    customer_account: null,
    customer_address: null,
    customer_email: a.customer.email,
    customer_name: a.customer.name ?? null,
    customer_phone: a.customer.phone ?? null,
    customer_shipping: null,
    customer_tax_exempt: 'none',
    customer_tax_ids: [],
    default_payment_method: null,
    default_source: null,
    default_tax_rates: [],
    description: null,
    discounts: [],
    due_date: null,
    effective_at: null,
    ending_balance: null,
    footer: null,
    from_invoice: null,
    hosted_invoice_url: a.hostedUrl,
    invoice_pdf: null,
    issuer: { type: 'self' },
    last_finalization_error: null,
    latest_revision: null,
    lines: {
      object: 'list',
      data: a.lines,
      has_more: false,
      url: `/v1/invoices/${a.id}/lines`,
    },
    livemode: false,
    metadata: {},
    next_payment_attempt: null,
    number: a.number,
    on_behalf_of: null,
    parent: a.subscription
      ? {
          type: 'subscription_details',
          quote_details: null,
          subscription_details: { metadata: { ...a.subscription.metadata }, subscription: a.subscription.id },
        }
      : null,
    payment_settings: { default_mandate: null, payment_method_options: null, payment_method_types: null },
    period_end: a.periodEnd,
    period_start: a.periodStart,
    post_payment_credit_notes_amount: 0,
    pre_payment_credit_notes_amount: 0,
    receipt_number: null,
    rendering: null,
    shipping_cost: null,
    shipping_details: null,
    starting_balance: a.startingBalance,
    statement_descriptor: null,
    status: 'draft',
    status_transitions: { finalized_at: null, marked_uncollectible_at: null, paid_at: null, voided_at: null },
    subtotal,
    subtotal_excluding_tax: subtotal,
    test_clock: null,
    total: subtotal,
    total_discount_amounts: [],
    total_excluding_tax: subtotal,
    total_pretax_credit_amounts: [],
    total_taxes: [],
    webhooks_delivered_at: null,
  };
}
