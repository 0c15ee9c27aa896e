import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { PageFrame } from '@/components/segments/page-frame';

export const metadata: Metadata = { title: 'Error screen check', robots: { index: false, follow: false } };
// Read the environment at request time, not at build time.
export const dynamic = 'force-dynamic';

// Demo and test stacks only: fails on purpose the first `times` requests for a `key` (default once), so the error
// screen, its logged reference and its "Try again" can be seen and tested. Counts live in this server process.
const failures = new Map<string, number>();

export default async function FailOnPurposePage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  if (process.env.NODE_ENV === 'production' && !['1', 'true'].includes(process.env.STOCHOS_DEMO ?? '')) notFound();
  const q = await searchParams;
  const key = typeof q.key === 'string' ? q.key.slice(0, 64) : 'default';
  const times = typeof q.times === 'string' && /^\d{1,3}$/.test(q.times) ? Number(q.times) : 1;
  const failed = failures.get(key) ?? 0;
  if (failed < times) {
    if (failures.size > 1000) failures.clear();
    failures.set(key, failed + 1);
    throw new Error(`Failure on purpose ${failed + 1} of ${times} for "${key}" (/dev/fail, demo stacks only).`);
  }
  return (
    <PageFrame>
      <div className="mx-auto max-w-2xl">
        <h1 className="text-xl font-semibold text-ink-900">Rendered after {failed} failure{failed === 1 ? '' : 's'} on purpose</h1>
        <p className="mt-2 text-ink-700">This development page fails its first requests so the error screen can be checked.</p>
      </div>
    </PageFrame>
  );
}
