import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { PageHeader } from '@/components/ui/page-header';
import { ModelsList } from '@/components/models/models-list';

export const metadata: Metadata = { title: 'Models' };

export default async function ModelsPage() {
  const member = await requirePageMember('models.read', '/app/models');
  return (
    <>
      <PageHeader
        title="Models"
        description="Your firm’s parametric risk models: the latest version of each, whether a checker has signed it off, and whether clients can see it."
      />
      <ModelsList canEdit={can(member.role, 'models.edit')} isChecker={can(member.role, 'versions.check')} />
    </>
  );
}
