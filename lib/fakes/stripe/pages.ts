// Hosted pages of the fake: checkout, billing portal and invoice. Plain server-rendered HTML with
// native forms (no script), labelled inputs, visible focus and errors announced with role="alert".
// A neutral look of our own; it deliberately does not resemble any payment provider's pages.
import type Stripe from 'stripe';
import type { FakeStripe, ProrationBehavior } from './fake';
import { day, escapeHtml as h, money } from './format';
import type { LineSpec } from './objects';

const STYLE = `
:root { color-scheme: light; --ink:#1d2327; --muted:#4f5a61; --line:#cfd5d8; --bg:#f4f5f3; --card:#ffffff; --act:#22313a; --err:#a3201b; --ok:#1f5f3a; --focus:#1a5fb4; }
* { box-sizing: border-box; }
body { margin:0; font: 16px/1.5 system-ui, -apple-system, "Segoe UI", Roboto, sans-serif; color:var(--ink); background:var(--bg); }
main { max-width: 40rem; margin: 0 auto; padding: 1.5rem 1rem 3rem; }
.note { border:1px dashed var(--muted); background:#fbfbf8; padding:.5rem .75rem; font-size:.9rem; color:var(--muted); margin-bottom:1.25rem; }
h1 { font-size:1.5rem; margin:.25rem 0 1rem; }
h2 { font-size:1.1rem; margin:0 0 .75rem; }
section, form.card { background:var(--card); border:1px solid var(--line); border-radius:6px; padding:1rem 1.25rem; margin-bottom:1rem; }
dl { display:grid; grid-template-columns: max-content 1fr; gap:.25rem 1rem; margin:0; }
dt { color:var(--muted); } dd { margin:0; font-variant-numeric: tabular-nums; }
label { display:block; font-weight:600; margin:.75rem 0 .25rem; }
.hint { font-size:.875rem; color:var(--muted); margin:.25rem 0 0; }
input { font:inherit; width:100%; padding:.5rem .6rem; border:1px solid #8a969c; border-radius:4px; background:#fff; color:var(--ink); }
input[aria-invalid="true"] { border-color:var(--err); border-width:2px; }
.row { display:grid; grid-template-columns: 1fr 1fr; gap:0 1rem; }
button, .button { display:inline-block; font:inherit; font-weight:600; padding:.6rem 1rem; border-radius:4px; border:1px solid var(--act); background:var(--act); color:#fff; cursor:pointer; text-decoration:none; margin-top:1rem; }
button.secondary, .button.secondary { background:#fff; color:var(--act); }
:focus-visible { outline:3px solid var(--focus); outline-offset:2px; }
a { color:var(--focus); }
.error { color:var(--err); font-weight:600; border-left:4px solid var(--err); padding:.25rem .75rem; margin:.75rem 0; background:#fff5f4; }
.notice { border-left:4px solid var(--ok); padding:.25rem .75rem; margin:.75rem 0; background:#f3faf5; }
table { width:100%; border-collapse:collapse; font-variant-numeric: tabular-nums; }
th, td { text-align:left; padding:.4rem .25rem; border-bottom:1px solid var(--line); }
td.num, th.num { text-align:right; }
.total { font-size:1.25rem; font-weight:700; }
.visually-hidden { position:absolute; width:1px; height:1px; overflow:hidden; clip:rect(0 0 0 0); white-space:nowrap; }
`;

export function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="robots" content="noindex"><title>${h(title)}</title><style>${STYLE}</style></head>
<body><main>
<p class="note" role="note">Local test payment page — no real money moves.</p>
${body}
</main></body></html>`;
}

export interface CardFormState {
  values?: Record<string, string>;
  error?: string | null;
  field?: string | null;
}

function field(
  name: string,
  label: string,
  attrs: string,
  state: CardFormState,
  hint?: string,
): string {
  const invalid = state.field === name;
  const describedBy = [hint ? `${name}-hint` : '', invalid ? 'form-error' : ''].filter(Boolean).join(' ');
  return `<label for="${name}">${h(label)}</label>
<input id="${name}" name="${name}" ${attrs} value="${h(state.values?.[name] ?? '')}"${invalid ? ' aria-invalid="true" autofocus' : ''}${describedBy ? ` aria-describedby="${describedBy}"` : ''}>
${hint ? `<p class="hint" id="${name}-hint">${h(hint)}</p>` : ''}`;
}

export function cardFields(state: CardFormState): string {
  return `${field('card_name', 'Name on card', 'autocomplete="cc-name"', state)}
${field('card_number', 'Card number', 'inputmode="numeric" autocomplete="cc-number" required', state, 'Test cards: 4242 4242 4242 4242 succeeds; 4000 0000 0000 0002 is declined.')}
<div class="row"><div>${field('card_expiry', 'Expiry (MM / YY)', 'inputmode="numeric" autocomplete="cc-exp" placeholder="MM / YY" required', state)}</div>
<div>${field('card_cvc', 'Security code (CVC)', 'inputmode="numeric" autocomplete="cc-csc" required', state)}</div></div>`;
}

function errorBox(state: CardFormState): string {
  return state.error ? `<p class="error" id="form-error" role="alert">${h(state.error)}</p>` : '';
}

function priceLine(price: Stripe.Price): string {
  const every = price.recurring ? `per ${price.recurring.interval}` : '';
  return `${money(price.unit_amount ?? 0, price.currency)} ${every}`;
}

export function checkoutPage(fake: FakeStripe, session: Stripe.Checkout.Session, state: CardFormState): string {
  const items = fake.state.checkoutLineItems[session.id] ?? [];
  const extras = fake.state.checkoutExtras[session.id];
  const perPeriod = items.reduce((s, li) => s + li.amount_total, 0);
  const currency = session.currency ?? 'eur';
  const first = items[0]?.price;
  const interval = first?.recurring?.interval ?? 'month';
  if (session.status === 'complete') {
    return layout(
      'Payment complete',
      `<h1>Payment complete</h1><section><p>This checkout is already paid.</p><a class="button" href="${h(fake.successRedirect(session))}">Continue</a></section>`,
    );
  }
  if (session.status === 'expired') {
    return layout(
      'Checkout expired',
      `<h1>This checkout has expired</h1><section><p>Start again from the app to get a new payment page.</p>${
        session.cancel_url ? `<a class="button secondary" href="${h(session.cancel_url)}">Return</a>` : ''
      }</section>`,
    );
  }
  const rows = items
    .map((li) => {
      const price = li.price!;
      const unit = fake.state.products[price.product as string]?.unit_label ?? 'unit';
      return `<tr><td>${h(li.description)}</td><td class="num">${li.quantity} ${h(unit)}${li.quantity === 1 ? '' : 's'}</td><td class="num">${h(
        priceLine(price),
      )} each</td><td class="num">${h(money(li.amount_total, currency))}</td></tr>`;
    })
    .join('');
  const trial = extras?.trialPeriodDays;
  const totalText = trial
    ? `${trial}-day trial, then ${money(perPeriod, currency)} per ${interval}`
    : `${money(perPeriod, currency)} per ${interval}`;
  const payLabel = trial ? 'Start trial' : `Pay ${money(perPeriod, currency)} and subscribe`;
  const needEmail = !session.customer && !session.customer_email;
  return layout(
    'Subscribe',
    `<h1>Subscribe</h1>
<section aria-labelledby="summary-h"><h2 id="summary-h">Order summary</h2>
<table><thead><tr><th scope="col">Item</th><th scope="col" class="num">Quantity</th><th scope="col" class="num">Price</th><th scope="col" class="num">Amount</th></tr></thead><tbody>${rows}</tbody></table>
<p class="total">Total: ${h(totalText)}</p>
${session.customer_email ? `<p class="hint">Receipts go to ${h(session.customer_email)}.</p>` : ''}
</section>
<form class="card" method="post" action="/checkout/${h(session.id)}" aria-labelledby="pay-h" novalidate>
<h2 id="pay-h">Card details</h2>
${errorBox(state)}
${needEmail ? field('email', 'E-mail', 'type="email" autocomplete="email" required', state) : ''}
${cardFields(state)}
<button type="submit">${h(payLabel)}</button>
</form>
${session.cancel_url ? `<p><a href="${h(session.cancel_url)}">Cancel and return</a></p>` : ''}`,
  );
}

const STATUS_TEXT: Record<string, string> = {
  active: 'Active',
  trialing: 'Trial',
  past_due: 'Payment overdue',
  canceled: 'Canceled',
  unpaid: 'Unpaid',
  incomplete: 'Incomplete',
};

export interface PortalState extends CardFormState {
  confirm?: { seats: number; preview: { prorationNet: number; lines: LineSpec[]; newPeriodTotal: number; behaviour: ProrationBehavior } };
}

export function portalPage(fake: FakeStripe, session: Stripe.BillingPortal.Session, state: PortalState): string {
  const customer = fake.state.customers[session.customer];
  const sub = fake.portalSubscription(session.customer);
  const back = session.return_url ? `<p><a href="${h(session.return_url)}">Return to Stochos</a></p>` : '';
  const invoices = fake.invoicesOf({ customer: session.customer }).filter((i) => i.status !== 'draft');
  const invoiceRows = invoices
    .map(
      (i) =>
        `<tr><td>${h(day(i.created))}</td><td>${h(i.number ?? '')}</td><td class="num">${h(money(i.total, i.currency))}</td><td>${h(
          i.status === 'paid' ? 'Paid' : i.status === 'open' ? 'Unpaid' : (i.status ?? ''),
        )}</td><td><a href="/invoices/${h(i.id)}">View<span class="visually-hidden"> invoice ${h(i.number ?? '')}</span></a></td></tr>`,
    )
    .join('');
  const invoiceSection = `<section aria-labelledby="inv-h"><h2 id="inv-h">Invoices</h2>${
    invoices.length === 0
      ? '<p>No invoices yet.</p>'
      : `<table><thead><tr><th scope="col">Date</th><th scope="col">Number</th><th scope="col" class="num">Amount</th><th scope="col">Status</th><th scope="col"><span class="visually-hidden">Link</span></th></tr></thead><tbody>${invoiceRows}</tbody></table>`
  }</section>`;
  const pm = fake.defaultCard(session.customer, sub);
  const cardText = pm?.card ? `${pm.card.brand.toUpperCase()} ending ${pm.card.last4}, expires ${String(pm.card.exp_month).padStart(2, '0')}/${pm.card.exp_year}` : 'No card on file';
  const cardSection = `<form class="card" method="post" action="/portal/${h(session.id)}/card" aria-labelledby="card-h" novalidate>
<h2 id="card-h">Payment method</h2><p>${h(cardText)}</p>
${state.field?.startsWith('card_') ? errorBox(state) : ''}
${cardFields(state.field?.startsWith('card_') ? state : { values: {} })}
<button type="submit">Update card</button></form>`;

  if (!sub || sub.status === 'canceled') {
    return layout(
      'Billing',
      `<h1>Billing</h1><p>${h(customer?.email ?? '')}</p><section><h2>Plan</h2><p>No active subscription.</p></section>${invoiceSection}${back}`,
    );
  }
  const item = sub.items.data[0];
  const seats = item.quantity ?? 1;
  const end = item.current_period_end;
  const overdue = fake.invoicesOf({ subscription: sub.id }).filter((i) => i.status === 'open');
  const overdueBanner =
    overdue.length > 0
      ? `<p class="error" role="alert">Your last payment of ${h(money(overdue[0].amount_remaining, overdue[0].currency))} failed. Update your card below to pay it.</p>`
      : '';

  if (state.confirm) {
    const { seats: target, preview } = state.confirm;
    const when =
      preview.behaviour === 'always_invoice'
        ? 'Charged now'
        : preview.behaviour === 'none'
          ? 'No proration'
          : `Added to your next invoice on ${day(end)}`;
    const lines = preview.lines
      .map((l) => `<tr><td>${h(l.description)}</td><td class="num">${h(money(l.amount, sub.currency))}</td></tr>`)
      .join('');
    return layout(
      'Confirm seat change',
      `<h1>Change seats from ${seats} to ${target}</h1>
<section aria-labelledby="conf-h"><h2 id="conf-h">What changes</h2>
${lines ? `<table><tbody>${lines}</tbody></table>` : ''}
<dl><dt>${h(when)}</dt><dd>${h(money(preview.prorationNet, sub.currency))}</dd>
<dt>New total per ${h(item.price.recurring?.interval ?? 'month')}</dt><dd>${h(money(preview.newPeriodTotal, sub.currency))}</dd></dl>
<form method="post" action="/portal/${h(session.id)}/seats"><input type="hidden" name="seats" value="${target}"><input type="hidden" name="confirm" value="1">
<button type="submit">Confirm change</button> <a class="button secondary" href="/portal/${h(session.id)}">Back</a></form>
</section>`,
    );
  }

  const seatsInvalid = state.field === 'seats';
  return layout(
    'Billing',
    `<h1>Billing</h1><p>${h(customer?.email ?? customer?.name ?? '')}</p>
${overdueBanner}
${state.field === 'notice' && state.error ? `<p class="notice" role="status">${h(state.error)}</p>` : ''}
<section aria-labelledby="plan-h"><h2 id="plan-h">Plan</h2>
<dl><dt>Plan</dt><dd>${h(fake.state.products[item.price.product as string]?.name ?? item.price.id)}</dd>
<dt>Price</dt><dd>${h(priceLine(item.price))} per seat</dd>
<dt>Seats</dt><dd>${seats}</dd>
<dt>Total</dt><dd>${h(money((item.price.unit_amount ?? 0) * seats, sub.currency))} per ${h(item.price.recurring?.interval ?? 'month')}</dd>
<dt>Status</dt><dd>${h(STATUS_TEXT[sub.status] ?? sub.status)}</dd>
<dt>${sub.cancel_at_period_end ? 'Ends on' : sub.status === 'trialing' ? 'Trial ends on' : 'Renews on'}</dt><dd>${h(day(end))}</dd></dl>
</section>
<form class="card" method="post" action="/portal/${h(session.id)}/seats" aria-labelledby="seats-h" novalidate>
<h2 id="seats-h">Seats</h2>
${seatsInvalid ? errorBox(state) : ''}
<label for="seats">Number of seats</label>
<input id="seats" name="seats" type="number" min="1" max="${fake.settings.maxQuantity}" step="1" inputmode="numeric" required value="${h(
      state.values?.seats ?? String(seats),
    )}" aria-describedby="seats-hint${seatsInvalid ? ' form-error' : ''}"${seatsInvalid ? ' aria-invalid="true" autofocus' : ''}>
<p class="hint" id="seats-hint">Between 1 and ${fake.settings.maxQuantity}. You will see the prorated amount before confirming.</p>
<button type="submit">Review change</button>
</form>
<form class="card" method="post" action="/portal/${h(session.id)}/${sub.cancel_at_period_end ? 'resume' : 'cancel'}" aria-labelledby="cancel-h">
<h2 id="cancel-h">${sub.cancel_at_period_end ? 'Cancellation scheduled' : 'Cancel subscription'}</h2>
${
  sub.cancel_at_period_end
    ? `<p>The subscription ends on ${h(day(end))}. Seats stay usable until then.</p><button type="submit">Keep subscription</button>`
    : `<p>The subscription stays active until ${h(day(end))}, then ends. No further charges.</p><button type="submit" class="secondary">Cancel at period end</button>`
}
</form>
${cardSection}
${invoiceSection}
${back}`,
  );
}

export function invoicePage(invoice: Stripe.Invoice, state: CardFormState): string {
  const lines = invoice.lines.data
    .map(
      (l) =>
        `<tr><td>${h(l.description)}<br><span class="hint">${h(day(l.period.start))} – ${h(day(l.period.end))}</span></td><td class="num">${h(
          money(l.amount, l.currency),
        )}</td></tr>`,
    )
    .join('');
  const payForm =
    invoice.status === 'open'
      ? `<form class="card" method="post" action="/invoices/${h(invoice.id)}/pay" aria-labelledby="pay-h" novalidate>
<h2 id="pay-h">Pay ${h(money(invoice.amount_remaining, invoice.currency))}</h2>${errorBox(state)}${cardFields(state)}<button type="submit">Pay now</button></form>`
      : '';
  return layout(
    `Invoice ${invoice.number ?? invoice.id}`,
    `<h1>Invoice ${h(invoice.number ?? '')}</h1>
${state.field === 'notice' && state.error ? `<p class="notice" role="status">${h(state.error)}</p>` : ''}
<section aria-labelledby="inv-h"><h2 id="inv-h">Details</h2>
<dl><dt>Billed to</dt><dd>${h(invoice.customer_email ?? invoice.customer_name ?? '')}</dd>
<dt>Date</dt><dd>${h(day(invoice.created))}</dd>
<dt>Status</dt><dd>${h(invoice.status === 'paid' ? 'Paid' : invoice.status === 'open' ? 'Unpaid' : (invoice.status ?? ''))}</dd></dl>
<table><thead><tr><th scope="col">Description</th><th scope="col" class="num">Amount</th></tr></thead><tbody>${lines}</tbody>
<tfoot><tr><th scope="row">Total</th><td class="num">${h(money(invoice.total, invoice.currency))}</td></tr>
${invoice.starting_balance !== 0 ? `<tr><th scope="row">Applied balance</th><td class="num">${h(money(invoice.amount_due - invoice.total, invoice.currency))}</td></tr>` : ''}
<tr><th scope="row">Amount due</th><td class="num">${h(money(invoice.amount_due, invoice.currency))}</td></tr></tfoot></table>
</section>${payForm}`,
  );
}

export function messagePage(title: string, message: string): string {
  return layout(title, `<h1>${h(title)}</h1><section><p>${h(message)}</p></section>`);
}
