'use client';

import Link from 'next/link';
import { useState } from 'react';
import { useTeam, type Invitation, type TeamMember } from '@/components/hooks/use-team';
import type { Role } from '@/lib/core/api-types';
import { errorMessage } from '@/lib/client/api';
import { Card } from '@/components/ui/card';
import { DataTable, type Column } from '@/components/ui/data-table';
import { EmptyState } from '@/components/ui/empty-state';
import { Banner } from '@/components/ui/banner';
import { Badge, StatusPill } from '@/components/ui/badge';
import { Button } from '@/components/ui/button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { Select } from '@/components/ui/field';
import { DateText } from '@/components/ui/date-text';
import { Loading } from '@/components/ui/loading';
import { LoadError } from '@/components/ui/load-error';
import { ROLE_LABELS } from '@/components/shell/roles';
import { InviteForm } from './invite-form';

const ROLE_OPTIONS = (['owner', 'author', 'checker'] as const).map((r) => ({ value: r, label: ROLE_LABELS[r] }));

type Notice = { tone: 'success' | 'danger'; text: string } | null;

function RoleControl({ member, onChange }: { member: TeamMember; onChange: (role: Role) => Promise<void> }) {
  const [role, setRole] = useState<Role>(member.role);
  const [pending, setPending] = useState(false);
  const changed = role !== member.role;
  return (
    <div className="flex items-center gap-2">
      <Select
        label={`Role of ${member.name}`}
        hideLabel
        options={ROLE_OPTIONS}
        value={role}
        onChange={(e) => setRole(e.target.value as Role)}
        className="w-32"
        selectClassName="h-8 text-sm"
      />
      {changed ? (
        <>
          <Button
            size="sm"
            pending={pending}
            aria-label={`Save role of ${member.name}`}
            onClick={async () => {
              setPending(true);
              try {
                await onChange(role);
              } catch {
                setRole(member.role);
              } finally {
                setPending(false);
              }
            }}
          >
            Save
          </Button>
          <Button size="sm" variant="ghost" disabled={pending} onClick={() => setRole(member.role)}>
            Undo
          </Button>
        </>
      ) : null}
    </div>
  );
}

export function TeamManager({ currentMembershipId }: { currentMembershipId: string }) {
  const team = useTeam();
  const [notice, setNotice] = useState<Notice>(null);

  async function act(run: () => Promise<unknown>, done: string) {
    setNotice(null);
    try {
      await run();
      setNotice({ tone: 'success', text: done });
    } catch (err) {
      setNotice({ tone: 'danger', text: errorMessage(err) });
      throw err;
    }
  }

  const memberColumns: Column<TeamMember>[] = [
    {
      key: 'name',
      header: 'Name',
      sortValue: (m) => m.name,
      cell: (m) => (
        <span className="flex flex-wrap items-center gap-1.5">
          <span className="font-medium text-ink-900">{m.name}</span>
          {m.id === currentMembershipId ? <Badge tone="accent">You</Badge> : null}
        </span>
      ),
    },
    { key: 'email', header: 'E-mail', sortValue: (m) => m.email, cell: (m) => <span className="break-all text-ink-700">{m.email}</span>, hideBelow: 'md' },
    {
      key: 'role',
      header: 'Role',
      sortValue: (m) => m.role,
      cell: (m) =>
        m.status === 'active' ? (
          <RoleControl key={`${m.id}-${m.role}`} member={m} onChange={(role) => act(() => team.changeRole(m.id, role), `${m.name} is now ${ROLE_LABELS[role].toLowerCase()}.`)} />
        ) : (
          <span className="text-ink-700">{ROLE_LABELS[m.role]}</span>
        ),
    },
    {
      key: 'status',
      header: 'Status',
      sortValue: (m) => m.status,
      cell: (m) => (m.status === 'active' ? <StatusPill kind="ok">Active</StatusPill> : <StatusPill kind="stopped">Removed</StatusPill>),
    },
    {
      key: 'lastActive',
      header: 'Last active',
      sortValue: (m) => (m.lastActiveAt ? Date.parse(m.lastActiveAt) : null),
      cell: (m) => <DateText iso={m.lastActiveAt} empty="Never" />,
      hideBelow: 'sm',
    },
    {
      key: 'actions',
      header: <span className="sr-only">Actions</span>,
      className: 'text-right',
      cell: (m) =>
        m.status === 'active' ? (
          <ConfirmButton
            ariaLabel={`Remove ${m.name}`}
            prompt={m.id === currentMembershipId ? 'Remove yourself? You will be signed out.' : `Remove ${m.name}? They are signed out at once.`}
            confirmLabel="Yes, remove"
            pendingLabel="Removing…"
            onConfirm={() => act(() => team.remove(m.id), `${m.name} was removed. Their seat is free again.`)}
          >
            Remove
          </ConfirmButton>
        ) : (
          <Button size="sm" variant="secondary" aria-label={`Reactivate ${m.name}`} onClick={() => act(() => team.reactivate(m.id), `${m.name} is active again.`).catch(() => undefined)}>
            Reactivate
          </Button>
        ),
    },
  ];

  const invitationColumns: Column<Invitation>[] = [
    { key: 'email', header: 'E-mail', sortValue: (i) => i.email, cell: (i) => <span className="break-all font-medium text-ink-900">{i.email}</span> },
    { key: 'role', header: 'Role', sortValue: (i) => i.role, cell: (i) => ROLE_LABELS[i.role] },
    { key: 'by', header: 'Invited by', sortValue: (i) => i.invitedByName, cell: (i) => i.invitedByName ?? '—', hideBelow: 'md' },
    { key: 'sent', header: 'Sent', sortValue: (i) => Date.parse(i.createdAt), cell: (i) => <DateText iso={i.createdAt} />, hideBelow: 'lg' },
    {
      key: 'expires',
      header: 'Expires',
      sortValue: (i) => Date.parse(i.expiresAt),
      cell: (i) => (
        <span className="inline-flex items-center gap-2">
          <StatusPill kind="waiting">Pending</StatusPill>
          <DateText iso={i.expiresAt} />
        </span>
      ),
      hideBelow: 'sm',
    },
    {
      key: 'actions',
      header: <span className="sr-only">Actions</span>,
      className: 'text-right',
      cell: (i) => (
        <ConfirmButton
          ariaLabel={`Revoke invitation for ${i.email}`}
          prompt="Revoke? The link stops working."
          confirmLabel="Yes, revoke"
          pendingLabel="Revoking…"
          onConfirm={() => act(() => team.revokeInvitation(i.id), 'Invitation revoked. Its link no longer works.')}
        >
          Revoke
        </ConfirmButton>
      ),
    },
  ];

  const seats = team.data?.seats;
  const seatsFull = seats ? seats.used + seats.pendingInvitations >= seats.allowed : false;

  return (
    <div className="space-y-6">
      <Card
        id="invite"
        title="Invite a colleague"
        description="Authors build models and publish checked versions; checkers review versions and sign them off. Each takes a seat. The link is e-mailed, works once and expires after 7 days."
      >
        <InviteForm onInvite={team.invite} />
        {seats ? (
          <p className="mt-4 border-t border-ink-100 pt-3 text-sm text-ink-600">
            Seats in use: <span className="num font-medium text-ink-900">{seats.used}</span> of <span className="num font-medium text-ink-900">{seats.allowed}</span>
            {seats.pendingInvitations ? (
              <>
                , <span className="num font-medium text-ink-900">{seats.pendingInvitations}</span> held by pending invitation{seats.pendingInvitations === 1 ? '' : 's'}
              </>
            ) : null}
            {seats.reason ? <> ({seats.reason})</> : null}.{' '}
            {seatsFull ? (
              <>
                All seats are taken: <Link href="/app/billing" className="font-medium text-accent-800 underline">add seats on the Billing page</Link>
                {seats.pendingInvitations ? ' or revoke a pending invitation' : ''}.
              </>
            ) : null}
          </p>
        ) : null}
      </Card>

      {notice ? (
        <Banner tone={notice.tone} className="scroll-mt-4">
          {notice.text}
        </Banner>
      ) : null}

      <section aria-labelledby="members-heading" className="space-y-3">
        <h2 id="members-heading" className="text-base font-semibold text-ink-900">
          Members
        </h2>
        {team.error ? (
          <LoadError error={team.error} what="the team" onRetry={() => team.mutate()} />
        ) : !team.data ? (
          <Loading>Loading the team…</Loading>
        ) : (
          <DataTable
            caption="Members"
            columns={memberColumns}
            rows={team.data.members}
            rowKey={(m) => m.id}
            rowClassName={(m) => (m.status === 'removed' ? 'bg-ink-50 text-ink-600' : undefined)}
            empty={<EmptyState as="h3" compact title="No members">Invite authors and checkers with the form above.</EmptyState>}
          />
        )}
      </section>

      <section aria-labelledby="invitations-heading" className="space-y-3">
        <h2 id="invitations-heading" className="text-base font-semibold text-ink-900">
          Pending invitations
        </h2>
        {team.data ? (
          <DataTable
            caption="Pending invitations"
            columns={invitationColumns}
            rows={team.data.invitations}
            rowKey={(i) => i.id}
            empty={
              <EmptyState as="h3" compact title="No pending invitations">
                <p>Invite an author or a checker with the form above. Accepted, revoked and expired invitations leave this list; accepted ones appear under Members.</p>
              </EmptyState>
            }
          />
        ) : null}
      </section>
    </div>
  );
}
