import type { Metadata } from 'next';
import { NotFoundScreen } from '@/components/segments/not-found-screen';

export const metadata: Metadata = { title: 'Dataset not found' };

export default function DatasetNotFound() {
  return (
    <NotFoundScreen title="This dataset is not here" links={[{ href: '/app/datasets', label: 'All datasets' }]}>
      <p>It may have been deleted, the link may be mistyped, or it belongs to another firm’s workspace.</p>
    </NotFoundScreen>
  );
}
