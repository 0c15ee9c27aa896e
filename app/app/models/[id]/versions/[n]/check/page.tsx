import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { z } from 'zod';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { getVersionByNumber } from '@/db/models';
import { CheckView } from '@/components/models/check-view';

export const metadata: Metadata = { title: 'Check a version' };

const params = z.object({ id: z.uuid(), n: z.coerce.number().int().min(1) });

export default async function CheckPage({ params: p }: { params: Promise<{ id: string; n: string }> }) {
  const raw = await p;
  const member = await requirePageMember('models.read', `/app/models/${encodeURIComponent(raw.id)}/versions/${encodeURIComponent(raw.n)}/check`);
  const parsed = params.safeParse(raw);
  if (!parsed.success || !(await getVersionByNumber(member.firmId, parsed.data.id, parsed.data.n))) notFound();
  return <CheckView modelId={parsed.data.id} number={parsed.data.n} userId={member.userId} canCheck={can(member.role, 'versions.check')} />;
}
