import { PageLoading } from '@/components/segments/page-loading';

// Only where the page cannot answer "not found" or send the member elsewhere: a loading boundary makes Next
// stream the page, after which notFound() and redirect() can no longer set the 404 or 307 status.
export default function SettingsLoading() {
  return <PageLoading label="Loading settings…" />;
}
