import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { isUuid } from '@/lib/server/http/params';
import { clientExists } from '@/lib/server/embed/service';
import { widgetList } from '@/lib/server/models/service';
import { ClientDetail } from '@/components/clients/client-detail';

export const metadata: Metadata = { title: 'Client' };

export default async function ClientPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  const member = await requirePageMember('firm.read', `/app/clients/${id}`);
  if (!isUuid(id) || !(await clientExists(member, id))) notFound();
  const widgets = (await widgetList(member)).map((w) => ({ id: w.id, title: w.title, modelTitle: w.modelTitle, versionNumber: w.versionNumber }));
  return <ClientDetail id={id} canManage={can(member.role, 'clients.manage')} widgets={widgets} />;
}
