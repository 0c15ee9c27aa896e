'use client';

import Link from 'next/link';
import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { ModelEditor } from '@/components/editor';
import { ResultsPreview } from '@/components/results';
import { WidgetView } from '@/components/widget';
import { createStudioEngine } from '@/lib/core/engine/studio-engine';
import { Badge, Banner, Button, Card, DateText, LoadError, Loading, PageHeader, StatusPill, Tabs } from '@/components/ui';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import type { ModelDraft } from '@/components/editor/form-values';
import { editorFieldErrors } from '@/lib/core/models/field-errors';
import { TEMPLATE_LABELS } from '@/lib/core/models/templates';
import { DEFAULT_PANELS, defaultHeadline } from '@/lib/core/models/widget-options';
import { CheckStatePill } from './check-state-pill';
import { PublishPanel } from './publish-panel';
import { SaveVersionBar } from './save-version-bar';
import { useModel } from './use-models';
import { VersionHistory } from './version-history';

export interface ModelStudioProps {
  modelId: string;
  userId: string;
  firmName: string;
  firmBrandColor: string;
  abilities: { edit: boolean; check: boolean; publish: boolean };
}

interface Working {
  /** What the editor was last loaded with (a version, or the starting model). */
  loaded: CheckedModel;
  /** The version the edit started from; 0 before the first save. */
  base: number;
  /** JSON of the base, to tell whether there are unsaved changes. */
  baseJson: string;
  current: CheckedModel | ModelDraft;
  valid: boolean;
  /** The last model that passed every check: the preview keeps running it while the editor shows problems. */
  lastValid: CheckedModel | null;
}

/** The studio: the editor beside a live preview, saving versions, the version history and publishing. */
export function ModelStudio({ modelId, userId, firmName, firmBrandColor, abilities }: ModelStudioProps) {
  const { data, error, mutate, saveVersion } = useModel(modelId);
  const [work, setWork] = useState<Working | null>(null);
  const [serverErrors, setServerErrors] = useState<Record<string, string[]> | undefined>(undefined);
  const [tab, setTab] = useState('versions');
  const [clientPreview, setClientPreview] = useState(false);
  const [narrow, setNarrow] = useState(false);

  // The editor starts from the latest version, or from the model's starting point before the first save.
  if (data && !work) {
    const start = data.latest?.model ?? data.model.draft;
    setWork({ loaded: start, base: data.latest?.number ?? 0, baseJson: JSON.stringify(start), current: start, valid: true, lastValid: start });
  }

  const archived = Boolean(data?.model.archivedAt);
  const canEdit = abilities.edit && !archived;
  const dirty = work ? JSON.stringify(work.current) !== work.baseJson : false;

  useEffect(() => {
    if (!dirty || !canEdit) return;
    const warn = (e: BeforeUnloadEvent) => {
      e.preventDefault();
    };
    window.addEventListener('beforeunload', warn);
    return () => window.removeEventListener('beforeunload', warn);
  }, [dirty, canEdit]);

  // The editor reports a change once typing pauses. A save clicked within that pause must wait for it, or it
  // would store the model as it was before the last keystrokes.
  const current = useRef<{ model: CheckedModel; valid: true } | { model: ModelDraft; valid: false } | null>(null);
  const lastInputAt = useRef(0);
  const lastEmitAt = useRef(0);
  const waiters = useRef<(() => void)[]>([]);
  const markInput = useCallback(() => {
    lastInputAt.current = performance.now();
  }, []);
  const editorSettled = useCallback(
    () =>
      lastInputAt.current <= lastEmitAt.current
        ? Promise.resolve()
        : new Promise<void>((resolve) => {
            waiters.current.push(resolve);
            setTimeout(resolve, 2000);
          }),
    [],
  );

  const onEditorChange = useCallback((...[model, valid]: [model: CheckedModel, valid: true] | [model: ModelDraft, valid: false]) => {
    current.current = valid ? { model, valid: true } : { model, valid: false };
    lastEmitAt.current = performance.now();
    for (const w of waiters.current.splice(0)) w();
    setWork((w) => (w ? { ...w, current: model, valid, lastValid: valid ? model : w.lastValid } : w));
  }, []);

  const reloadLatest = useCallback(async () => {
    const fresh = await mutate();
    if (!fresh) return;
    const start = fresh.latest?.model ?? fresh.model.draft;
    setServerErrors(undefined);
    current.current = null;
    setWork({ loaded: start, base: fresh.latest?.number ?? 0, baseJson: JSON.stringify(start), current: start, valid: true, lastValid: start });
  }, [mutate]);

  const previewWidget = useMemo(() => {
    const w = data?.widget;
    const dials = (work?.lastValid?.dials ?? []).map((d) => d.id);
    return {
      title: w?.title ?? work?.lastValid?.title ?? data?.model.title ?? '',
      panels: w?.panels ?? DEFAULT_PANELS,
      headline: w?.headline ?? defaultHeadline(data?.model.template ?? 'formula'),
      dialIds: w ? w.dialIds.filter((id) => dials.includes(id)) : dials,
      brandColor: w?.brandColor ?? firmBrandColor,
      showLogo: w?.showLogo ?? true,
    };
  }, [data, work?.lastValid, firmBrandColor]);

  // Stable elements: typing in the editor re-renders the studio, but neither the editor (it keeps its own state)
  // nor the version history and publishing tabs need to render again for it.
  const loaded = work?.loaded;
  const editor = useMemo(
    () => (loaded ? <ModelEditor value={loaded} onChange={onEditorChange} readOnly={!canEdit} errors={serverErrors} /> : null),
    [loaded, onEditorChange, canEdit, serverErrors],
  );
  const record = useMemo(() => {
    if (!data) return null;
    const isArchived = Boolean(data.model.archivedAt);
    return (
      <Tabs
        label="Model record"
        value={tab}
        onChange={setTab}
        tabs={[
          {
            id: 'versions',
            label: `Versions (${data.versions.length})`,
            content: <VersionHistory modelId={modelId} versions={data.versions} publishedNumber={data.widget?.versionNumber ?? null} userId={userId} canCheck={abilities.check} />,
          },
          {
            id: 'publish',
            label: data.widget ? 'Widget' : 'Publish',
            content: (
              <PublishPanel
                modelId={modelId}
                modelTitle={data.model.title}
                template={data.model.template}
                versions={data.versions}
                widget={data.widget}
                requireCheck={data.requireCheck}
                firmBrandColor={firmBrandColor}
                canPublish={abilities.publish && !isArchived}
                onChanged={() => void mutate()}
                renderPreview={({ model: m, widget: w, signedOffAt }) => (
                  <WidgetView model={m} widget={w} branding={{ firmName, brandColor: w.brandColor, logoUrl: null }} versionInfo={{ number: w.versionNumber, signedOffAt }} createEngine={createStudioEngine} />
                )}
              />
            ),
          },
        ]}
      />
    );
  }, [data, tab, modelId, userId, abilities.check, abilities.publish, firmBrandColor, firmName, mutate]);

  if (error) return <LoadError error={error} what="this model" onRetry={() => mutate()} />;
  if (!data || !work) return <Loading>Loading the model…</Loading>;

  const { model, versions, latest, widget } = data;
  const newer = latest && latest.number > work.base ? latest : null;

  return (
    <>
      <PageHeader
        eyebrow={<Link href="/app/models">Models</Link>}
        title={work.current.title || model.title}
        description={
          <span className="flex flex-wrap items-center gap-2 text-sm">
            <Badge>{TEMPLATE_LABELS[model.template]}</Badge>
            {latest ? (
              <>
                <span>
                  Latest: <span className="num">v{latest.number}</span>
                </span>
                <CheckStatePill state={latest.checkState} />
              </>
            ) : (
              <CheckStatePill state={null} />
            )}
            {widget ? <StatusPill kind="info">{`Published v${widget.versionNumber}`}</StatusPill> : null}
            {archived ? <StatusPill kind="stopped">Archived</StatusPill> : null}
          </span>
        }
        actions={
          <>
            <Button variant={clientPreview ? 'primary' : 'secondary'} aria-pressed={clientPreview} onClick={() => setClientPreview((v) => !v)}>
              {clientPreview ? 'Back to the editor' : 'Preview as client'}
            </Button>
            {latest && abilities.check && latest.checkState === 'unchecked' && latest.authorId !== userId ? (
              <Link href={`/app/models/${modelId}/versions/${latest.number}/check`} className="inline-flex h-10 items-center rounded-md bg-accent-700 px-4 font-medium text-white hover:bg-accent-800">
                Check v{latest.number}
              </Link>
            ) : null}
          </>
        }
      />

      {archived ? (
        <Banner tone="warn" title="This model is archived" className="mb-4">
          It is read-only. Restore it from the <Link href="/app/models">models list</Link> (show archived) to edit it again.
        </Banner>
      ) : null}
      {newer && newer.authorId !== userId ? (
        <Banner
          tone="warn"
          title={`Version ${newer.number} was saved by ${newer.authorName ?? 'a former member'}`}
          className="mb-4"
          action={
            <Button size="sm" variant="secondary" onClick={() => void reloadLatest()}>
              Load version {newer.number}
            </Button>
          }
        >
          Saved <DateText iso={newer.createdAt} />. Your editor started from {work.base ? `version ${work.base}` : 'the starting model'}; saving now would be refused so nothing is overwritten.
        </Banner>
      ) : null}

      {latest?.checkState === 'sent_back' && !newer ? (
        <Banner tone="warn" title={`Version ${latest.number} was sent back by ${latest.checkerName ?? 'its checker'}`} className="mb-4">
          {latest.checkNote ? <p className="italic">“{latest.checkNote}”</p> : null}
          {latest.comments.length ? (
            <ul className="mt-1 list-disc pl-5">
              {latest.comments.map((c) => (
                <li key={`${c.path}-${c.text}`}>
                  <code className="text-xs">{c.path || 'model'}</code>: {c.text}
                </li>
              ))}
            </ul>
          ) : null}
          <p className="mt-1">Make the changes and save a new version; it goes to a checker again.</p>
        </Banner>
      ) : null}
      {clientPreview ? (
        <Card
          title="Preview as client"
          description="The widget as a client viewer sees it, with the dials you offer. Nothing here is published."
          actions={
            <Button size="sm" variant="secondary" aria-pressed={narrow} onClick={() => setNarrow((n) => !n)}>
              {narrow ? 'Wide column' : 'Narrow column (360 px)'}
            </Button>
          }
        >
          {work.lastValid ? (
            <div className={narrow ? 'mx-auto w-[360px] max-w-full' : 'mx-auto max-w-3xl'}>
              <WidgetView
                createEngine={createStudioEngine}
                model={work.lastValid}
                widget={previewWidget}
                branding={{ firmName, brandColor: previewWidget.brandColor, logoUrl: null }}
                versionInfo={{ number: dirty || !work.base ? work.base + 1 : work.base, signedOffAt: !dirty ? (versions.find((v) => v.number === work.base)?.checkedAt ?? null) : null }}
              />
            </div>
          ) : (
            <Banner tone="warn">Fix the problems in the editor to preview the widget.</Banner>
          )}
        </Card>
      ) : (
        <div className="grid gap-5 xl:grid-cols-[minmax(0,5fr)_minmax(0,3fr)]">
          <section aria-label="Model" className="min-w-0 space-y-4">
            {canEdit ? (
              <Card>
                <SaveVersionBar
                  baseVersion={work.base}
                  dirty={dirty}
                  valid={work.valid}
                  onFieldErrors={(f) => setServerErrors(editorFieldErrors(f))}
                  onReload={() => void reloadLatest()}
                  onSave={async (note) => {
                    await editorSettled();
                    const latest = current.current ?? (work.valid && work.lastValid ? { model: work.lastValid, valid: true } : null);
                    if (!latest?.valid) throw new Error('The model was not saved: fix the problems listed in the editor first.');
                    const v = await saveVersion({ baseVersion: work.base, note, model: latest.model });
                    setServerErrors(undefined);
                    setWork((w) => (w ? { ...w, base: v.number, baseJson: JSON.stringify(v.model) } : w));
                    return v.number;
                  }}
                />
              </Card>
            ) : abilities.edit ? null : (
              <Banner tone="info">
                {abilities.check ? 'Checkers read models here and sign off versions from the version history.' : 'Authors edit models; you can read this one and run its preview.'}
              </Banner>
            )}
            <div onInputCapture={markInput} onChangeCapture={markInput}>
              {editor}
            </div>
          </section>
          <section aria-label="Live preview" className="min-w-0 xl:sticky xl:top-4 xl:self-start">
            {/* The editor already waits for typing to pause, so the preview starts almost at once. */}
            <ResultsPreview model={work.lastValid} debounceMs={30} />
            {!work.valid && work.lastValid ? (
              <p className="mt-2 text-sm text-warn-700" role="status">
                The preview shows the last model without problems; fix the editor’s problems to see your latest edit.
              </p>
            ) : null}
          </section>
        </div>
      )}

      <div className="mt-8">{record}      </div>
    </>
  );
}
