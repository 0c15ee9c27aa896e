import type { Metadata } from 'next';
import { NotFoundScreen } from '@/components/segments/not-found-screen';

export const metadata: Metadata = { title: 'Not found' };

export default function DashboardNotFound() {
  return (
    <NotFoundScreen title="This is not in your firm’s workspace" links={[{ href: '/app/models', label: 'Your models' }]}>
      <p>It may have been deleted, the link may be mistyped, or it belongs to another firm.</p>
    </NotFoundScreen>
  );
}
