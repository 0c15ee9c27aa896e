import { PageLoading } from '@/components/segments/page-loading';

// The list alone sits in this route group, so the loading boundary wraps it and not the record pages beside it:
// a boundary makes Next stream the page, after which a record page's notFound() could no longer answer 404.
export default function ModelsListLoading() {
  return <PageLoading label="Loading models…" />;
}
