import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { EmptyState } from '@/components/ui/empty-state';

export const metadata: Metadata = { title: 'Clients' };

export default async function ClientsPage() {
  const member = await requirePageMember('firm.read', '/app/clients');
  const canManage = can(member.role, 'clients.manage');
  return (
    <>
      <PageHeader
        title="Clients"
        description="The client organisations your firm publishes widgets to, with the web addresses allowed to embed them and the e-mail domains allowed to receive snapshots."
      />
      <EmptyState
        title="No clients yet"
        icon={
          <svg aria-hidden="true" viewBox="0 0 48 40" className="h-10 w-12 text-ink-400" fill="none" stroke="currentColor" strokeWidth="1.5">
            <rect x="4" y="6" width="40" height="28" rx="3" strokeDasharray="3 2.5" />
            <path d="M4 13h40" />
            <rect x="10" y="18" width="16" height="11" rx="1.5" stroke="#1f887b" />
          </svg>
        }
      >
        <p>
          Each client gets its own list of allowed origins (the exact addresses of its portal pages that may frame a widget) and allowed e-mail domains (whose people may ask for a PDF
          snapshot). Publishing a widget to a client creates a pass you can revoke at any time.
        </p>
        <p>{canManage ? 'Authors and the account owner add clients here.' : 'Authors and the account owner add clients; you will see them listed here.'}</p>
      </EmptyState>
    </>
  );
}
