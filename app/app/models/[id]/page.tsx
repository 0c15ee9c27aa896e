import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { getModel } from '@/db/models';
import { getFirm } from '@/db/firms';
import { ModelStudio } from '@/components/models/model-studio';

export const metadata: Metadata = { title: 'Model studio' };

export default async function ModelStudioPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const member = await requirePageMember('models.read', `/app/models/${encodeURIComponent(id)}`);
  if (!z.uuid().safeParse(id).success || !(await getModel(member.firmId, id))) notFound();
  const firm = await getFirm(member.firmId);
  return (
    <ModelStudio
      modelId={id}
      userId={member.userId}
      firmName={member.firmName}
      firmBrandColor={firm?.brandColor ?? '#1f887b'}
      abilities={{ edit: can(member.role, 'models.edit'), check: can(member.role, 'versions.check'), publish: can(member.role, 'widgets.publish') }}
    />
  );
}
