'use client';

import { ErrorScreen } from '@/components/segments/error-screen';

// A dashboard page failed while rendering: the shell and its navigation stay, the page gives way to this.
export default function DashboardError({ error, retry }: { error: unknown; retry: () => void }) {
  return <ErrorScreen error={error} retry={retry} back={{ href: '/app/models', label: 'Back to your models' }} />;
}
