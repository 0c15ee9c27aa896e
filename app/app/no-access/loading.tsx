import { PageLoading } from '@/components/segments/page-loading';

export default function NoAccessLoading() {
  return <PageLoading />;
}
