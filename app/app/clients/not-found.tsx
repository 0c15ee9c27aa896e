import type { Metadata } from 'next';
import { NotFoundScreen } from '@/components/segments/not-found-screen';

export const metadata: Metadata = { title: 'Client not found' };

// A client or pass page whose client or pass is not in the member's firm.
export default function ClientNotFound() {
  return (
    <NotFoundScreen title="This client or pass is not here" links={[{ href: '/app/clients', label: 'All clients' }]}>
      <p>It may have been removed, the link may be mistyped, or it belongs to another firm’s workspace.</p>
    </NotFoundScreen>
  );
}
