import type { Metadata } from 'next';
import { InviteAcceptance } from '@/components/auth/invite-acceptance';

export const metadata: Metadata = { title: 'Your invitation', referrer: 'no-referrer' };

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  return <InviteAcceptance token={token} />;
}
