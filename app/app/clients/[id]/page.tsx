import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/auth/guard';
import { can } from '@/lib/auth/permissions';
import { getClient } from '@/db/clients';
import { listWidgets } from '@/db/widgets';
import { ClientDetail } from '@/components/clients/client-detail';

export const metadata: Metadata = { title: 'Client' };

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/;

export default async function ClientPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const member = await requirePageMember('firm.read', `/app/clients/${id}`);
  if (!UUID.test(id) || !(await getClient(member.firmId, id))) notFound();
  const widgets = (await listWidgets(member.firmId)).map((w) => ({ id: w.id, title: w.title, modelTitle: w.modelTitle, versionNumber: w.versionNumber }));
  return <ClientDetail id={id} canManage={can(member.role, 'clients.manage')} widgets={widgets} />;
}
