import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { datasetList } from '@/lib/server/datasets/service';
import { DatasetLibrary } from '@/components/datasets/dataset-library';
import { UploadForm } from '@/components/datasets/upload-form';

export const metadata: Metadata = { title: 'Datasets' };

export default async function DatasetsPage() {
  const member = await requirePageMember('models.read', '/app/datasets');
  const rows = await datasetList(member);
  return (
    <>
      <PageHeader title="Datasets" description="Measured data your firm has uploaded: parts from a supplier, cost growth of past projects. Fit a law to it or use it as it stands in a model." />
      <div className="space-y-6">
        {can(member.role, 'models.edit') && <UploadForm />}
        <DatasetLibrary rows={rows} />
      </div>
    </>
  );
}
