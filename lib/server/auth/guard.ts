import 'server-only';
import { getServerSession } from 'next-auth';
import { redirect } from 'next/navigation';
import { cookies } from 'next/headers';
import { authOptions } from '@/lib/server/auth/options';
import { getActiveMember, touchLastActive, type SessionMember } from '@/db/users';
import { AppError } from '@/lib/server/http/errors';
import { can, PERMISSION_LABELS, type Permission } from '@/lib/core/auth/permissions';

export type Member = SessionMember;

/**
 * The one place that says who is asking. Role, membership and session version are re-read on every request,
 * so a role change or a removal takes effect on the member's very next request.
 */
export async function currentMember(): Promise<Member | null> {
  // Reading cookies first marks every guarded page as dynamic, so nothing signed-in is prerendered at build time.
  await cookies();
  const session = (await getServerSession(authOptions())) as { userId?: string; sv?: number } | null;
  if (!session?.userId) return null;
  const member = await getActiveMember(session.userId);
  if (!member || member.sessionVersion !== session.sv) return null;
  await touchLastActive(member.userId);
  return member;
}

/** Route handlers: 401 when nobody is signed in, 403 when the role lacks the permission. */
export async function requireMember(permission: Permission = 'firm.read'): Promise<Member> {
  const member = await currentMember();
  if (!member) throw new AppError('unauthorized', 'Sign in to continue. Your session may have ended.');
  if (!can(member.role, permission)) throw new AppError('forbidden', `Only ${PERMISSION_LABELS[permission]} can do this.`);
  return member;
}

/** Pages: redirect to sign-in, or to the no-access page naming who may see it. */
export async function requirePageMember(permission: Permission = 'firm.read', from = '/app'): Promise<Member> {
  const member = await currentMember();
  if (!member) redirect(`/sign-in?next=${encodeURIComponent(from)}`);
  if (!can(member.role, permission)) redirect(`/app/no-access?need=${encodeURIComponent(permission)}`);
  return member;
}
