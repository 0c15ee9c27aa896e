'use client';

import { ErrorScreen } from '@/components/segments/error-screen';
import { PageFrame } from '@/components/segments/page-frame';

// A page outside the dashboard failed while rendering (the dashboard, the docs and the embed have their own). It sits
// in the (site) group, not at the root, so that the embed page, which has its own boundary, does not load it.
export default function RootError({ error, retry }: { error: unknown; retry: () => void }) {
  return (
    <PageFrame>
      <ErrorScreen error={error} retry={retry} back={{ href: '/', label: 'Stochos home' }} />
    </PageFrame>
  );
}
