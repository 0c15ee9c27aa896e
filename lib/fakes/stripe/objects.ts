// Builders for the Stripe objects the fake returns, typed against the pinned SDK's own types
// (stripe@23, API version 2026-10-28.endive) so a missing or renamed field fails `tsc`.
// Notable for this API version: billing periods live on subscription ITEMS
// (items.data[].current_period_start/end), invoices name their subscription under
// parent.subscription_details.subscription, and line items carry pricing.price_details.
import type Stripe from 'stripe';

/** Decimal fields travel as strings on the wire; the SDK turns them into its Decimal type. */
export function dec(value: number): Stripe.Decimal {
  return String(value) as unknown as Stripe.Decimal;
}

export function customerObject(a: {
  id: string;
  created: number;
  email: string | null;
  name: string | null;
  description: string | null;
  phone: string | null;
  metadata: Record<string, string>;
  invoicePrefix: string;
}): Stripe.Customer {
  return {
    id: a.id,
    object: 'customer',
    address: null,
    balance: 0,
    created: a.created,
    currency: null,
    default_source: null,
    delinquent: false,
    description: a.description,
    discount: null,
    email: a.email,
    invoice_prefix: a.invoicePrefix,
    invoice_settings: { custom_fields: null, default_payment_method: null, footer: null, rendering_options: null },
    livemode: false,
    metadata: a.metadata,
    name: a.name,
    next_invoice_sequence: 1,
    phone: a.phone,
    preferred_locales: [],
    shipping: null,
    tax_exempt: 'none',
    test_clock: null,
  };
}

export function productObject(a: {
  id: string;
  created: number;
  name: string;
  description: string | null;
  unitLabel: string | null;
  metadata: Record<string, string>;
}): Stripe.Product {
  return {
    id: a.id,
    object: 'product',
    active: true,
    created: a.created,
    default_price: null,
    description: a.description,
    images: [],
    livemode: false,
    marketing_features: [],
    metadata: a.metadata,
    name: a.name,
    package_dimensions: null,
    shippable: null,
    statement_descriptor: null,
    tax_code: null,
    tax_details: null,
    type: 'service',
    unit_label: a.unitLabel,
    updated: a.created,
    url: null,
  };
}

export function priceObject(a: {
  id: string;
  created: number;
  product: string;
  currency: string;
  unitAmount: number;
  interval: 'day' | 'week' | 'month' | 'year' | null;
  intervalCount: number;
  lookupKey: string | null;
  nickname: string | null;
  metadata: Record<string, string>;
}): Stripe.Price {
  return {
    id: a.id,
    object: 'price',
    active: true,
    billing_scheme: 'per_unit',
    created: a.created,
    currency: a.currency,
    custom_unit_amount: null,
    livemode: false,
    lookup_key: a.lookupKey,
    metadata: a.metadata,
    nickname: a.nickname,
    product: a.product,
    recurring: a.interval
      ? { interval: a.interval, interval_count: a.intervalCount, meter: null, trial_period_days: null, usage_type: 'licensed' }
      : null,
    tax_behavior: 'unspecified',
    tiers_mode: null,
    transform_quantity: null,
    type: a.interval ? 'recurring' : 'one_time',
    unit_amount: a.unitAmount,
    unit_amount_decimal: dec(a.unitAmount),
  };
}

/** The legacy `plan` mirror of a recurring price that subscription items still carry. */
export function planFromPrice(price: Stripe.Price): Stripe.Plan {
  return {
    id: price.id,
    object: 'plan',
    active: price.active,
    amount: price.unit_amount,
    amount_decimal: price.unit_amount_decimal,
    billing_scheme: price.billing_scheme,
    created: price.created,
    currency: price.currency,
    interval: price.recurring?.interval ?? 'month',
    interval_count: price.recurring?.interval_count ?? 1,
    livemode: false,
    metadata: price.metadata,
    meter: null,
    nickname: price.nickname,
    product: typeof price.product === 'string' ? price.product : price.product.id,
    tiers_mode: null,
    transform_usage: null,
    trial_period_days: null,
    usage_type: 'licensed',
  };
}

export function paymentMethodObject(a: {
  id: string;
  created: number;
  customer: string | null;
  brand: string;
  last4: string;
  expMonth: number;
  expYear: number;
  name: string | null;
  fingerprint: string;
}): Stripe.PaymentMethod {
  return {
    id: a.id,
    object: 'payment_method',
    allow_redisplay: 'unspecified',
    billing_details: { address: null, email: null, name: a.name, phone: null, tax_id: null },
    card: {
      brand: a.brand,
      checks: { address_line1_check: null, address_postal_code_check: null, cvc_check: 'pass' },
      country: 'US',
      display_brand: a.brand,
      exp_month: a.expMonth,
      exp_year: a.expYear,
      fingerprint: a.fingerprint,
      funding: 'credit',
      generated_from: null,
      last4: a.last4,
      networks: { available: [a.brand], preferred: null },
      regulated_status: 'unregulated',
      three_d_secure_usage: { supported: true },
      wallet: null,
    },
    created: a.created,
    customer: a.customer,
    customer_account: null,
    livemode: false,
    metadata: {},
    type: 'card',
  };
}

export function subscriptionItemObject(a: {
  id: string;
  created: number;
  subscription: string;
  price: Stripe.Price;
  quantity: number;
  periodStart: number;
  periodEnd: number;
  metadata: Record<string, string>;
}): Stripe.SubscriptionItem {
  return {
    id: a.id,
    object: 'subscription_item',
    billing_thresholds: null,
    created: a.created,
    current_period_end: a.periodEnd,
    current_period_start: a.periodStart,
    current_trial: null,
    discounts: [],
    metadata: a.metadata,
    plan: planFromPrice(a.price),
    price: a.price,
    quantity: a.quantity,
    subscription: a.subscription,
    tax_rates: [],
  };
}

export function subscriptionObject(a: {
  id: string;
  created: number;
  customer: string;
  currency: string;
  items: Stripe.SubscriptionItem[];
  metadata: Record<string, string>;
  status: Stripe.Subscription.Status;
  billingCycleAnchor: number;
  defaultPaymentMethod: string | null;
  trialStart: number | null;
  trialEnd: number | null;
  description: string | null;
}): Stripe.Subscription {
  return {
    id: a.id,
    object: 'subscription',
    application: null,
    application_fee_percent: null,
    automatic_tax: { disabled_reason: null, enabled: false, liability: null },
    billing_cycle_anchor: a.billingCycleAnchor,
    billing_cycle_anchor_config: null,
    billing_mode: { flexible: { proration_discounts: 'included' }, type: 'flexible', updated_at: a.created },
    billing_schedules: [],
    billing_thresholds: null,
    cancel_at: null,
    cancel_at_period_end: false,
    canceled_at: null,
    cancellation_details: { comment: null, feedback: null, feedback_option: null, reason: null },
    collection_method: 'charge_automatically',
    created: a.created,
    currency: a.currency,
    customer: a.customer,
    customer_account: null,
    days_until_due: null,
    default_payment_method: a.defaultPaymentMethod,
    default_source: null,
    default_tax_rates: [],
    description: a.description,
    discounts: [],
    ended_at: null,
    invoice_settings: { account_tax_ids: null, custom_fields: null, description: null, footer: null, issuer: { type: 'self' } },
    items: {
      object: 'list',
      data: a.items,
      has_more: false,
      url: `/v1/subscription_items?subscription=${a.id}`,
    },
    latest_invoice: null,
    livemode: false,
    managed_payments: null,
    metadata: a.metadata,
    next_pending_invoice_item_invoice: null,
    on_behalf_of: null,
    pause_collection: null,
    payment_settings: {
      payment_method_options: null,
      payment_method_types: null,
      save_default_payment_method: 'off',
    },
    pending_invoice_item_interval: null,
    pending_setup_intent: null,
    pending_update: null,
    schedule: null,
    start_date: a.created,
    status: a.status,
    test_clock: null,
    transfer_data: null,
    trial_end: a.trialEnd,
    trial_settings: { end_behavior: { billing_cycle_anchor: null, missing_payment_method: 'create_invoice' } },
    trial_start: a.trialStart,
  };
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

export function checkoutLineItemObject(a: {
  id: string;
  price: Stripe.Price;
  quantity: number;
  description: string;
}): Stripe.LineItem {
  const amount = (a.price.unit_amount ?? 0) * a.quantity;
  return {
    id: a.id,
    object: 'item',
    adjustable_quantity: null,
    amount_discount: 0,
    amount_subtotal: amount,
    amount_tax: 0,
    amount_total: amount,
    currency: a.price.currency,
    description: a.description,
    metadata: {},
    price: a.price,
    quantity: a.quantity,
  };
}

export function checkoutSessionObject(a: {
  id: string;
  created: number;
  url: string;
  customer: string | null;
  customerEmail: string | null;
  clientReferenceId: string | null;
  currency: string;
  amountTotal: number;
  metadata: Record<string, string>;
  successUrl: string;
  cancelUrl: string | null;
}): Stripe.Checkout.Session {
  return {
    id: a.id,
    object: 'checkout.session',
    adaptive_pricing: null,
    after_expiration: null,
    allow_promotion_codes: null,
    allowed_payment_method_types: null,
    amount_subtotal: a.amountTotal,
    amount_total: a.amountTotal,
    automatic_tax: { enabled: false, liability: null, provider: null, status: null },
    billing_address_collection: null,
    cancel_url: a.cancelUrl,
    client_reference_id: a.clientReferenceId,
    client_secret: null,
    collected_information: null,
    consent: null,
    consent_collection: null,
    created: a.created,
    currency: a.currency,
    currency_conversion: null,
    custom_fields: [],
    custom_text: { after_submit: null, shipping_address: null, submit: null, terms_of_service_acceptance: null },
    customer: a.customer,
    customer_account: null,
    customer_creation: a.customer ? null : 'always',
    customer_details: null,
    customer_email: a.customerEmail,
    discounts: [],
    expires_at: a.created + 24 * 3600,
    integration_identifier: null,
    invoice: null,
    invoice_creation: null,
    livemode: false,
    locale: null,
    managed_payments: null,
    metadata: a.metadata,
    mode: 'subscription',
    origin_context: null,
    payment_intent: null,
    payment_link: null,
    payment_method_collection: 'always',
    payment_method_configuration_details: null,
    payment_method_options: {},
    payment_method_types: ['card'],
    payment_status: 'unpaid',
    permissions: null,
    recovered_from: null,
    saved_payment_method_options: null,
    setup_intent: null,
    shipping_address_collection: null,
    shipping_cost: null,
    shipping_options: [],
    status: 'open',
    submit_type: null,
    subscription: null,
    success_url: a.successUrl,
    total_details: { amount_discount: 0, amount_shipping: 0, amount_tax: 0 },
    ui_mode: 'hosted_page',
    url: a.url,
    wallet_options: null,
  };
}

export function portalSessionObject(a: {
  id: string;
  created: number;
  customer: string;
  returnUrl: string | null;
  url: string;
}): Stripe.BillingPortal.Session {
  return {
    id: a.id,
    object: 'billing_portal.session',
    configuration: 'bpc_fake_default',
    created: a.created,
    customer: a.customer,
    customer_account: null,
    flow: null,
    livemode: false,
    locale: null,
    on_behalf_of: null,
    return_url: a.returnUrl,
    url: a.url,
  };
}
