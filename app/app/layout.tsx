import { requirePageMember } from '@/lib/server/auth/guard';
import { can } from '@/lib/core/auth/permissions';
import { DashboardShell } from '@/components/shell/dashboard-shell';
import { NAV } from '@/components/shell/nav';
import { ROLE_LABELS } from '@/components/shell/roles';
import { BillingBanner } from '@/components/billing/billing-banner';
import { authoringBlockedMessage, billingStatus } from '@/lib/server/billing/access';

export default async function DashboardLayout({ children }: { children: React.ReactNode }) {
  const member = await requirePageMember('firm.read');
  const billing = await billingStatus(member.firmId);
  const nav = NAV.filter((item) => can(member.role, item.permission)).map(({ href, label, icon }) => ({ href, label, icon }));
  return (
    <DashboardShell firmName={member.firmName} userName={member.name} userEmail={member.email} roleLabel={ROLE_LABELS[member.role]} nav={nav} showReviewCount={can(member.role, 'versions.check')} notice={<BillingBanner status={billing} blockedMessage={authoringBlockedMessage(billing)} role={member.role} />}>
      {children}
    </DashboardShell>
  );
}
