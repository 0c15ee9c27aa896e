import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { modelExists } from '@/lib/server/models/service';
import { firmBrandColor } from '@/lib/server/firm/service';
import { ModelStudio } from '@/components/models/model-studio';
import { isUuid } from '@/lib/server/http/params';

export const metadata: Metadata = { title: 'Model studio' };

export default async function ModelStudioPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const member = await requirePageMember('models.read', `/app/models/${encodeURIComponent(id)}`);
  if (!isUuid(id) || !(await modelExists(member, id))) notFound();
  const brandColor = await firmBrandColor(member);
  return (
    <ModelStudio
      modelId={id}
      userId={member.userId}
      firmName={member.firmName}
      firmBrandColor={brandColor ?? '#1f887b'}
      abilities={{ edit: can(member.role, 'models.edit'), check: can(member.role, 'versions.check'), publish: can(member.role, 'widgets.publish') }}
    />
  );
}
