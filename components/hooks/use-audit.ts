'use client';

import useSWRInfinite from 'swr/infinite';
import { fetcher } from '@/lib/client/api';
import type { AuditPage } from '@/lib/core/api-types';

export type { AuditEntry, AuditPage } from '@/lib/core/api-types';

/** The audit log, newest first, one page at a time ("Load older" asks for the next page). */
export function useAudit() {
  const swr = useSWRInfinite<AuditPage>(
    (index, previous: AuditPage | null) => {
      if (index === 0) return '/api/audit';
      if (!previous?.nextBefore) return null;
      return `/api/audit?before=${previous.nextBefore}`;
    },
    fetcher,
    { revalidateFirstPage: true },
  );
  const pages = swr.data ?? [];
  const entries = pages.flatMap((p) => p.entries);
  const last = pages[pages.length - 1];
  const hasOlder = Boolean(last?.nextBefore);
  const loadingOlder = swr.isValidating && swr.size > pages.length;
  return { ...swr, entries, hasOlder, loadingOlder, loadOlder: () => swr.setSize(swr.size + 1) };
}
