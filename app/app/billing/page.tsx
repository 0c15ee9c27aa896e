import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { BillingView } from '@/components/billing/billing-view';

export const metadata: Metadata = { title: 'Billing' };

type Search = { checkout?: string; portal?: string };

export default async function BillingPage({ searchParams }: { searchParams: Promise<Search> }) {
  await requirePageMember('billing.manage', '/app/billing');
  const q = await searchParams;
  const returnedFrom = q.checkout === 'success' ? 'checkout-success' : q.checkout === 'cancelled' ? 'checkout-cancelled' : q.portal === 'returned' ? 'portal' : null;
  return <BillingView returnedFrom={returnedFrom} />;
}
