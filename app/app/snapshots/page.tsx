import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { isUuid } from '@/lib/server/http/params';
import { PageHeader } from '@/components/ui/page-header';
import { SnapshotsList } from '@/components/snapshots/snapshots-list';

export const metadata: Metadata = { title: 'Snapshots' };

export default async function SnapshotsPage({ searchParams }: { searchParams: Promise<{ clientId?: string | string[] }> }) {
  await requirePageMember('clients.manage', '/app/snapshots');
  const raw = (await searchParams).clientId;
  const clientId = typeof raw === 'string' && isUuid(raw) ? raw : null;
  return (
    <>
      <PageHeader
        title="Snapshots"
        description="PDF snapshots your clients' viewers asked for by e-mail, and whether each one reached its recipient."
      />
      <SnapshotsList initialClientId={clientId} />
    </>
  );
}
