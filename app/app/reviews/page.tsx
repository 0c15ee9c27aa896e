import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { PageHeader } from '@/components/ui/page-header';
import { WaitingChecks } from '@/components/reviews/waiting-checks';

export const metadata: Metadata = { title: 'To check' };

export default async function ReviewsPage() {
  await requirePageMember('versions.check', '/app/reviews');
  return (
    <>
      <PageHeader title="To check" description="Versions saved by other members that wait for a checker to sign them off or send them back, oldest first." />
      <WaitingChecks />
    </>
  );
}
