// Builders for the Stripe objects the fake returns, typed against the pinned SDK's own types
// (stripe@23, API version 2026-10-28.endive) so a missing or renamed field fails `tsc`.
// Notable for this API version: billing periods live on subscription ITEMS
// (items.data[].current_period_start/end), invoices name their subscription under
// parent.subscription_details.subscription, and line items carry pricing.price_details.
import type Stripe from 'stripe';

import { dec } from './invoice-objects';

// Invoices have their own file; their builders are re-exported here so callers keep one import.
export { dec, type LineSpec, invoiceItemObject, invoiceLineObject, invoiceObject } from './invoice-objects';

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
