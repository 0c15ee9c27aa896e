import type { Metadata } from 'next';
import { requirePageMember } from '@/lib/server/auth/guard';
import { PERMISSION_LABELS, type Permission } from '@/lib/core/auth/permissions';
import { ROLE_LABELS } from '@/components/shell/roles';
import { LinkButton } from '@/components/ui/button';

export const metadata: Metadata = { title: 'Not available for your role' };

function isPermission(v: unknown): v is Permission {
  return typeof v === 'string' && Object.prototype.hasOwnProperty.call(PERMISSION_LABELS, v);
}

export default async function NoAccessPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  const member = await requirePageMember('firm.read', '/app/no-access');
  const { need } = await searchParams;
  const who = isPermission(need) ? PERMISSION_LABELS[need] : null;
  return (
    <div className="mx-auto max-w-xl rounded-lg border border-ink-200 bg-white px-5 py-8 sm:px-8">
      <svg aria-hidden="true" viewBox="0 0 40 40" className="h-10 w-10 text-warn-600">
        <rect x="9" y="17" width="22" height="17" rx="2.5" fill="none" stroke="currentColor" strokeWidth="2" />
        <path d="M14 17v-4a6 6 0 0 1 12 0v4" fill="none" stroke="currentColor" strokeWidth="2" />
        <path d="M20 23v5" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
      </svg>
      <h1 className="mt-3 text-xl font-semibold text-ink-900">This page is not available to your role</h1>
      <p className="mt-2 text-ink-700">
        {who ? (
          <>
            Only <strong className="font-semibold text-ink-900">{who}</strong> can open it.{' '}
          </>
        ) : null}
        You are signed in as <strong className="font-semibold text-ink-900">{ROLE_LABELS[member.role].toLowerCase()}</strong> of {member.firmName}.
      </p>
      <p className="mt-2 text-sm text-ink-600">
        {member.role === 'owner'
          ? 'Roles are changed on the Team page. A firm keeps at least one owner, so make someone else owner before changing your own role.'
          : 'If you need it for your work, ask your firm’s account owner to change your role on the Team page.'}
      </p>
      <div className="mt-6">
        <LinkButton href="/app/models" variant="secondary">
          Back to your dashboard
        </LinkButton>
      </div>
    </div>
  );
}
