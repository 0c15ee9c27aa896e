import { Loading } from '@/components/ui/loading';

/** A route segment's loading screen: the page's outline in quiet blocks and one polite status line. */
export function PageLoading({ label = 'Loading the page…' }: { label?: string }) {
  return (
    <div aria-busy="true">
      <div aria-hidden="true" className="mb-6 space-y-2">
        <div className="h-7 w-56 animate-pulse rounded bg-ink-100 motion-reduce:animate-none" />
        <div className="h-4 w-80 max-w-full animate-pulse rounded bg-ink-100 motion-reduce:animate-none" />
      </div>
      <Loading>{label}</Loading>
    </div>
  );
}
