import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { ClientsList } from '@/components/clients/clients-list';

export const metadata: Metadata = { title: 'Clients' };

export default async function ClientsPage() {
  const member = await requirePageMember('firm.read', '/app/clients');
  return (
    <>
      <PageHeader
        title="Clients"
        description="The client organisations your firm publishes widgets to, with the web addresses allowed to embed them and the e-mail domains allowed to receive snapshots."
      />
      <ClientsList canManage={can(member.role, 'clients.manage')} />
    </>
  );
}
