import type { Metadata } from 'next';
import { NotFoundScreen } from '@/components/segments/not-found-screen';

export const metadata: Metadata = { title: 'Model not found' };

// A model, version or check page whose model or version number is not in the member's firm.
export default function ModelNotFound() {
  return (
    <NotFoundScreen
      title="This model or version is not here"
      links={[{ href: '/app/models', label: 'All models' }]}
    >
      <p>The model may have been deleted, the version number may not exist yet, or the link belongs to another firm’s workspace.</p>
    </NotFoundScreen>
  );
}
