import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { isUuid } from '@/lib/server/http/params';
import { passClientId } from '@/lib/server/embed/service';
import { PassDetail } from '@/components/clients/pass-detail';

export const metadata: Metadata = { title: 'Pass' };

export default async function PassPage({ params }: { params: Promise<{ id: string; passId: string }> }) {
  const { id, passId } = await params;
  const member = await requirePageMember('firm.read', `/app/clients/${id}/passes/${passId}`);
  if (!isUuid(id) || !isUuid(passId)) notFound();
  if ((await passClientId(member, passId)) !== id) notFound();
  return <PassDetail id={passId} clientId={id} canManage={can(member.role, 'clients.manage')} />;
}
