import { PageLoading } from '@/components/segments/page-loading';
import { PageFrame } from '@/components/segments/page-frame';

export default function DocsLoading() {
  return (
    <PageFrame>
      <div className="mx-auto max-w-3xl">
        <PageLoading label="Loading the documentation…" />
      </div>
    </PageFrame>
  );
}
