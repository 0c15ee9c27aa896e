import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { PageHeader } from '@/components/ui/page-header';
import { AuditLog } from '@/components/audit/audit-log';

export const metadata: Metadata = { title: 'Audit log' };

export default async function AuditPage() {
  await requirePageMember('audit.read', '/app/audit');
  return (
    <>
      <PageHeader title="Audit log" description="Every change to your firm’s account, who made it and when. Entries cannot be edited or deleted." />
      <AuditLog />
    </>
  );
}
