import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { datasetDetail } from '@/lib/server/datasets/service';
import { AppError } from '@/lib/server/http/errors';
import { DatasetDetailView } from '@/components/datasets/dataset-detail';
import { isUuid } from '@/lib/server/http/params';

export const metadata: Metadata = { title: 'Dataset' };

export default async function DatasetPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const member = await requirePageMember('models.read', `/app/datasets/${id}`);
  if (!isUuid(id)) notFound();
  const detail = await datasetDetail(member, id).catch((err) => {
    if (err instanceof AppError && err.code === 'not_found') return null;
    throw err;
  });
  if (!detail) notFound();
  return (
    <>
      <PageHeader title={detail.dataset.name} description={`${detail.dataset.rowCount} measured values${detail.dataset.unit ? ` in ${detail.dataset.unit}` : ''}. Summary, fitted laws and how to use them in a model.`} />
      <DatasetDetailView detail={detail} canEdit={can(member.role, 'models.edit')} />
    </>
  );
}
