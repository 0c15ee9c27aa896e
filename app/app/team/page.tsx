import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { PageHeader } from '@/components/ui/page-header';
import { TeamManager } from '@/components/team/team-manager';

export const metadata: Metadata = { title: 'Team' };

export default async function TeamPage() {
  const member = await requirePageMember('team.manage', '/app/team');
  return (
    <>
      <PageHeader
        title="Team"
        description="Who works in your firm’s account. Authors build and publish models, checkers sign off versions, owners run the account. A role change or a removal applies on the person’s next click."
      />
      <TeamManager currentMembershipId={member.membershipId} />
    </>
  );
}
