'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import { Button, Checkbox, ConfirmButton, DataTable, DateText, EmptyState, LoadError, Loading, Select, StatusPill, TextField, type Column } from '@/components/ui';
import { Banner } from '@/components/ui/banner';
import { errorMessage } from '@/lib/client/api';
import { TEMPLATE_IDS, TEMPLATE_LABELS } from '@/lib/core/models/templates';
import type { ModelListRow, TemplateId } from '@/lib/core/models/types';
import { CheckStatePill } from './check-state-pill';
import { NewModelPanel } from './new-model-panel';
import { useModels } from './use-models';

type CheckFilter = 'any' | 'unchecked' | 'signed_off' | 'sent_back' | 'unsaved';
type PublishedFilter = 'any' | 'yes' | 'no';

export interface ModelsListProps {
  canEdit: boolean;
  isChecker: boolean;
}

/** The firm's models: filter, sort, create, duplicate and archive. */
export function ModelsList({ canEdit, isChecker }: ModelsListProps) {
  const [showArchived, setShowArchived] = useState(false);
  const { data, error, isLoading, mutate, duplicate, setArchived } = useModels(showArchived);
  const [query, setQuery] = useState('');
  const [template, setTemplate] = useState<'any' | TemplateId>('any');
  const [check, setCheck] = useState<CheckFilter>('any');
  const [published, setPublished] = useState<PublishedFilter>('any');
  const [creating, setCreating] = useState(false);
  const [actionError, setActionError] = useState<string | null>(null);

  const rows = useMemo(() => {
    const q = query.trim().toLowerCase();
    return (data?.models ?? []).filter((m) => {
      if (q && !m.title.toLowerCase().includes(q)) return false;
      if (template !== 'any' && m.template !== template) return false;
      if (check === 'unsaved' && m.latestVersion) return false;
      if (check !== 'any' && check !== 'unsaved' && m.latestVersion?.checkState !== check) return false;
      if (published === 'yes' && !m.published) return false;
      if (published === 'no' && m.published) return false;
      return true;
    });
  }, [data, query, template, check, published]);

  const act = async (fn: () => Promise<unknown>) => {
    setActionError(null);
    try {
      await fn();
    } catch (e) {
      setActionError(errorMessage(e));
      throw e;
    }
  };

  const columns: Column<ModelListRow>[] = [
    {
      key: 'title',
      header: 'Title',
      sortValue: (m) => m.title,
      cell: (m) => (
        <span className="flex flex-wrap items-center gap-2">
          <Link href={`/app/models/${m.id}`} className="font-medium text-accent-800 underline-offset-2 hover:underline">
            {m.title}
          </Link>
          {m.archivedAt ? <StatusPill kind="stopped">Archived</StatusPill> : null}
        </span>
      ),
    },
    { key: 'template', header: 'Template', sortValue: (m) => TEMPLATE_LABELS[m.template], cell: (m) => TEMPLATE_LABELS[m.template], hideBelow: 'md' },
    {
      key: 'version',
      header: 'Latest version',
      numeric: true,
      sortValue: (m) => m.latestVersion?.number ?? null,
      cell: (m) => (m.latestVersion ? `v${m.latestVersion.number}` : '—'),
    },
    {
      key: 'check',
      header: 'Check',
      sortValue: (m) => m.latestVersion?.checkState ?? 'zz',
      cell: (m) =>
        m.latestVersion?.checkState === 'unchecked' && isChecker ? (
          <Link href={`/app/models/${m.id}/versions/${m.latestVersion.number}/check`} aria-label={`Check version ${m.latestVersion.number} of ${m.title}`}>
            <CheckStatePill state="unchecked" />
          </Link>
        ) : (
          <CheckStatePill state={m.latestVersion?.checkState ?? null} />
        ),
    },
    {
      key: 'published',
      header: 'Published',
      sortValue: (m) => (m.published ? m.published.versionNumber : null),
      cell: (m) => (m.published ? <StatusPill kind="info">{`Published v${m.published.versionNumber}`}</StatusPill> : <span className="text-ink-500">Not published</span>),
    },
    {
      key: 'edited',
      header: 'Last edited',
      sortValue: (m) => m.updatedAt,
      hideBelow: 'sm',
      cell: (m) => (
        <span className="text-sm">
          {m.updatedByName ?? 'Former member'}, <DateText iso={m.updatedAt} />
        </span>
      ),
    },
  ];
  if (canEdit) {
    columns.push({
      key: 'actions',
      header: <span className="sr-only">Actions</span>,
      cell: (m) => (
        <span className="flex flex-nowrap justify-end gap-1.5 whitespace-nowrap">
          <Button size="sm" variant="ghost" aria-label={`Duplicate ${m.title}`} onClick={() => act(() => duplicate(m.id)).catch(() => undefined)}>
            Duplicate
          </Button>
          {m.archivedAt ? (
            <Button size="sm" variant="ghost" aria-label={`Restore ${m.title}`} onClick={() => act(() => setArchived(m.id, false)).catch(() => undefined)}>
              Restore
            </Button>
          ) : (
            <ConfirmButton
              variant="ghost"
              ariaLabel={`Archive ${m.title}`}
              prompt={`Archive “${m.title}”?`}
              confirmLabel="Yes, archive"
              pendingLabel="Archiving…"
              onConfirm={() => act(() => setArchived(m.id, true))}
            >
              Archive
            </ConfirmButton>
          )}
        </span>
      ),
    });
  }

  if (error) return <LoadError error={error} what="your firm’s models" onRetry={() => mutate()} />;
  if (isLoading || !data) return <Loading>Loading models…</Loading>;

  const total = data.models.length;
  const waiting = data.models.filter((m) => m.latestVersion?.checkState === 'unchecked').length;

  return (
    <div className="space-y-4">
      {canEdit ? (
        creating ? (
          <NewModelPanel onClose={() => setCreating(false)} />
        ) : (
          <div className="flex justify-end">
            <Button onClick={() => setCreating(true)}>New model</Button>
          </div>
        )
      ) : null}
      {isChecker && waiting > 0 ? (
        <Banner
          tone="info"
          title={`${waiting} ${waiting === 1 ? 'version is' : 'versions are'} awaiting a check`}
          action={
            check !== 'unchecked' ? (
              <Button size="sm" variant="secondary" onClick={() => setCheck('unchecked')}>
                Show only those
              </Button>
            ) : null
          }
        >
          Open one to compare it with the previous version and sign it off or send it back. You cannot check a version you wrote yourself.
        </Banner>
      ) : null}
      {actionError ? <Banner tone="danger">{actionError}</Banner> : null}

      {total === 0 && !showArchived ? (
        <EmptyState
          title="Your firm has no models yet"
          action={canEdit && !creating ? <Button onClick={() => setCreating(true)}>Create the first model</Button> : null}
        >
          {canEdit ? (
            <p>Start from one of the three templates: each comes with a worked example you can edit, or start blank. Every saved version stays on record, and a checker signs a version off before it can be published to a client.</p>
          ) : isChecker ? (
            <p>Authors in your firm build the models. When an author saves a version, it appears here for you to compare with the previous one and sign off.</p>
          ) : (
            <p>Authors in your firm build the models and checkers sign off each version. Invite authors and checkers on the Team page.</p>
          )}
        </EmptyState>
      ) : (
        <>
          <div className="grid gap-3 rounded-lg border border-ink-200 bg-white p-3 sm:grid-cols-2 lg:grid-cols-[2fr_1fr_1fr_1fr_auto] lg:items-end">
            <TextField label="Search titles" type="search" value={query} onChange={(e) => setQuery(e.target.value)} placeholder="e.g. shaft" />
            <Select
              label="Template"
              value={template}
              onChange={(e) => setTemplate(e.target.value as 'any' | TemplateId)}
              options={[{ value: 'any', label: 'Any template' }, ...TEMPLATE_IDS.map((t) => ({ value: t, label: TEMPLATE_LABELS[t] }))]}
            />
            <Select
              label="Check"
              value={check}
              onChange={(e) => setCheck(e.target.value as CheckFilter)}
              options={[
                { value: 'any', label: 'Any state' },
                { value: 'unchecked', label: 'Awaiting check' },
                { value: 'signed_off', label: 'Signed off' },
                { value: 'sent_back', label: 'Sent back' },
                { value: 'unsaved', label: 'Not saved yet' },
              ]}
            />
            <Select
              label="Published"
              value={published}
              onChange={(e) => setPublished(e.target.value as PublishedFilter)}
              options={[
                { value: 'any', label: 'Published or not' },
                { value: 'yes', label: 'Published' },
                { value: 'no', label: 'Not published' },
              ]}
            />
            <Checkbox label="Show archived" checked={showArchived} onChange={(e) => setShowArchived(e.target.checked)} className="pb-2" />
          </div>
          <p className="text-sm text-ink-600" role="status">
            {rows.length === total ? `${total} ${total === 1 ? 'model' : 'models'}` : `${rows.length} of ${total} models match the filters`}
          </p>
          <DataTable
            caption="Models"
            columns={columns}
            rows={rows}
            rowKey={(m) => m.id}
            initialSort={{ key: 'edited', dir: 'desc' }}
            empty={
              <EmptyState title="No model matches these filters" as="h3">
                <p>Clear the search or choose “Any” in the filters above{showArchived ? '' : ', or show archived models'}.</p>
              </EmptyState>
            }
          />
        </>
      )}
    </div>
  );
}
