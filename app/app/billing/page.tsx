import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/auth/guard';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/empty-state';

export const metadata: Metadata = { title: 'Billing' };

export default async function BillingPage() {
  await requirePageMember('billing.manage', '/app/billing');
  return (
    <>
      <PageHeader title="Billing" description="Seats for authors and checkers, invoices and payment state. The account owner and client viewers take no seat." />
      <EmptyState
        title="No subscription yet"
        icon={
          <svg aria-hidden="true" viewBox="0 0 48 40" className="h-10 w-12 text-ink-400" fill="none" stroke="currentColor" strokeWidth="1.5">
            <rect x="5" y="8" width="38" height="25" rx="3" strokeDasharray="3 2.5" />
            <path d="M5 15h38" />
            <path d="M11 25h10" stroke="#1f887b" />
          </svg>
        }
      >
        <p>Your firm has no paid seats. Once a subscription is in place, this page shows the number of seats, the seats in use, the next invoice and past invoices.</p>
      </EmptyState>
    </>
  );
}
