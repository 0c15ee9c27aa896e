import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { getVersionByNumber } from '@/db/models';
import { VersionView } from '@/components/models/version-view';

export const metadata: Metadata = { title: 'Model version' };

const params = z.object({ id: z.uuid(), n: z.coerce.number().int().min(1) });

export default async function VersionPage({ params: p }: { params: Promise<{ id: string; n: string }> }) {
  const raw = await p;
  const member = await requirePageMember('models.read', `/app/models/${encodeURIComponent(raw.id)}/versions/${encodeURIComponent(raw.n)}`);
  const parsed = params.safeParse(raw);
  if (!parsed.success || !(await getVersionByNumber(member.firmId, parsed.data.id, parsed.data.n))) notFound();
  return <VersionView modelId={parsed.data.id} number={parsed.data.n} userId={member.userId} canCheck={can(member.role, 'versions.check')} />;
}
