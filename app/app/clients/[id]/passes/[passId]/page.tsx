import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { getPass } from '@/db/passes';
import { PassDetail } from '@/components/clients/pass-detail';

export const metadata: Metadata = { title: 'Pass' };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

export default async function PassPage({ params }: { params: Promise<{ id: string; passId: string }> }) {
  const { id, passId } = await params;
  const member = await requirePageMember('firm.read', `/app/clients/${id}/passes/${passId}`);
  if (!UUID.test(id) || !UUID.test(passId)) notFound();
  const pass = await getPass(member.firmId, passId);
  if (!pass || pass.clientId !== id) notFound();
  return <PassDetail id={passId} clientId={id} canManage={can(member.role, 'clients.manage')} />;
}
