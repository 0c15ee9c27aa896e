import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { versionExists } from '@/lib/server/models/service';
import { VersionView } from '@/components/models/version-view';
import { versionParams } from '@/lib/server/http/params';

export const metadata: Metadata = { title: 'Model version' };

export default async function VersionPage({ params: p }: { params: Promise<{ id: string; n: string }> }) {
  const raw = await p;
  const member = await requirePageMember('models.read', `/app/models/${encodeURIComponent(raw.id)}/versions/${encodeURIComponent(raw.n)}`);
  const parsed = versionParams.safeParse(raw);
  if (!parsed.success || !(await versionExists(member, parsed.data.id, parsed.data.n))) notFound();
  return <VersionView modelId={parsed.data.id} number={parsed.data.n} userId={member.userId} canCheck={can(member.role, 'versions.check')} />;
}
