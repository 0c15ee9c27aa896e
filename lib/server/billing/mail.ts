import 'server-only';
import { billingContacts } from '@/db/billing';
import { env } from '@/lib/server/env';
import { linkMail, sendMail, type Mail } from '@/lib/server/mail/send';
import { formatMoney } from '@/lib/core/billing/money';
import { GRACE_DAYS } from '@/lib/core/billing/plan';
import type { BillingNotice } from './webhooks';

const longDate = (iso: string | null) =>
  iso ? new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' }).format(new Date(iso)) : 'an unknown date';

const seatsText = (n: number | null) => (n == null ? 'your seats' : `${n} seat${n === 1 ? '' : 's'} (authors and checkers)`);

/** The e-mails one billing notice sends: one per active owner of the firm. */
export function noticeMails(notice: BillingNotice, firmName: string, owners: { email: string; name: string }[]): Mail[] {
  const inv = notice.invoice;
  const action = { label: 'Open billing in Stochos', url: `${env().APP_URL}/app/billing` };
  const number = inv.number ? `invoice ${inv.number}` : 'your invoice';
  return owners.map((o) => {
    if (notice.kind === 'receipt') {
      const lines = [
        `Hello ${o.name},`,
        `Thank you: we received ${formatMoney(inv.amountPaid, inv.currency)} from ${firmName} for ${number}.`,
        `Seats: ${seatsText(inv.seats)}.`,
        `Period: ${longDate(inv.periodStart)} to ${longDate(inv.periodEnd)}.`,
      ];
      if (inv.hostedInvoiceUrl) lines.push(`The invoice itself: ${inv.hostedInvoiceUrl}`);
      return linkMail(o.email, `Receipt: ${formatMoney(inv.amountPaid, inv.currency)} for ${firmName}'s Stochos seats`, lines, action);
    }
    return linkMail(
      o.email,
      `Payment failed for ${firmName}'s Stochos seats`,
      [
        `Hello ${o.name},`,
        `We could not collect ${formatMoney(inv.amountDue, inv.currency)} for ${number}: the card on file was declined.`,
        `Everything keeps working until ${longDate(notice.graceEndsAt)} (a ${GRACE_DAYS}-day grace period). After that, models become read-only until the invoice is paid; published widgets keep working for your clients.`,
        'To fix it, open Billing in Stochos, choose “Manage in portal” and update the card. The open invoice is charged again when you do.',
      ],
      action,
    );
  });
}

/** Sends the notices' e-mails. Failures are logged, never thrown: the event itself is already recorded. */
export async function deliverNotices(notices: BillingNotice[]): Promise<void> {
  for (const notice of notices) {
    try {
      const contacts = await billingContacts(notice.firmId);
      if (!contacts) continue;
      for (const mail of noticeMails(notice, contacts.firmName, contacts.owners)) await sendMail(mail);
    } catch (err) {
      console.error(`[billing] could not send the ${notice.kind} e-mail for invoice ${notice.invoice.id}:`, err);
    }
  }
}
