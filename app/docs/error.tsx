'use client';

import { ErrorScreen } from '@/components/segments/error-screen';
import { PageFrame } from '@/components/segments/page-frame';

export default function DocsError({ error, retry }: { error: unknown; retry: () => void }) {
  return (
    <PageFrame>
      <ErrorScreen error={error} retry={retry} back={{ href: '/', label: 'Stochos home' }} />
    </PageFrame>
  );
}
