'use client';

import { useMemo, useState, type ReactNode } from 'react';
import { Banner, Button, Checkbox, ConfirmButton, DateText, FieldError, FormError, Select, StatusPill, TextField } from '@/components/ui';
import { ApiError, errorMessage } from '@/lib/client/api';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import { CHECK_STATE_LABELS } from '@/lib/core/models/templates';
import type { TemplateId, VersionSummary, WidgetRecord } from '@/lib/core/models/types';
import { DEFAULT_PANELS, HEADLINES, PANEL_IDS, PANEL_LABELS, defaultHeadline, type PanelId } from '@/lib/core/models/widget-options';
import { publishWidget, unpublishWidget, updateWidget, useVersion, type WidgetBody } from './use-models';

export interface PublishPanelProps {
  modelId: string;
  modelTitle: string;
  template: TemplateId;
  versions: readonly VersionSummary[];
  widget: WidgetRecord | null;
  requireCheck: boolean;
  firmBrandColor: string;
  canPublish: boolean;
  onChanged: () => void;
  /** Renders the client's view of the chosen version with the chosen presentation. */
  renderPreview?: (p: { model: CheckedModel; widget: WidgetBody & { versionNumber: number }; signedOffAt: string | null }) => ReactNode;
}

function publishable(v: VersionSummary, requireCheck: boolean): boolean {
  return v.checkState === 'signed_off' || (!requireCheck && v.checkState === 'unchecked');
}

/** Turns a checked version into a widget, changes its presentation, moves it to a later version on request, or takes it down. */
export function PublishPanel({ modelId, modelTitle, template, versions, widget, requireCheck, firmBrandColor, canPublish, onChanged, renderPreview }: PublishPanelProps) {
  const candidates = versions.filter((v) => publishable(v, requireCheck));
  const newestCandidate = candidates[0] ?? null;
  const [versionNumber, setVersionNumber] = useState<number | null>(widget?.versionNumber ?? newestCandidate?.number ?? null);
  const [title, setTitle] = useState(widget?.title ?? modelTitle);
  const [panels, setPanels] = useState<PanelId[]>((widget?.panels as PanelId[]) ?? DEFAULT_PANELS);
  const [headline, setHeadline] = useState(widget?.headline ?? defaultHeadline(template));
  const [dialIds, setDialIds] = useState<string[] | null>(widget?.dialIds ?? null);
  const [brandColor, setBrandColor] = useState(widget?.brandColor ?? firmBrandColor);
  const [showLogo, setShowLogo] = useState(widget?.showLogo ?? true);
  const [fields, setFields] = useState<Record<string, string[]>>({});
  const [messages, setMessages] = useState<string[]>([]);
  const [done, setDone] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  // Keep the form in step when the widget changes underneath (after a save or a reload).
  const widgetKey = widget ? `${widget.id}:${widget.updatedAt}` : 'none';
  const [seenKey, setSeenKey] = useState(widgetKey);
  if (seenKey !== widgetKey) {
    setSeenKey(widgetKey);
    if (widget) {
      setVersionNumber(widget.versionNumber);
      setTitle(widget.title);
      setPanels(widget.panels as PanelId[]);
      setHeadline(widget.headline);
      setDialIds(widget.dialIds);
      setBrandColor(widget.brandColor);
      setShowLogo(widget.showLogo);
    }
  }
  const chosenNumber = versionNumber ?? newestCandidate?.number ?? null;
  const chosen = versions.find((v) => v.number === chosenNumber) ?? null;
  const { data: chosenData } = useVersion(modelId, chosen?.number ?? null);
  const chosenModel = chosenData?.version.model ?? null;
  const modelDials = useMemo(() => chosenModel?.dials ?? [], [chosenModel]);
  // Until the author picks, every dial of the version is offered to the client.
  const effectiveDials = dialIds ?? modelDials.map((d) => d.id);

  const body: WidgetBody = { title, panels, headline, dialIds: effectiveDials.filter((id) => modelDials.some((d) => d.id === id)), brandColor, showLogo };

  async function run(what: string, fn: () => Promise<unknown>) {
    setPending(true);
    setFields({});
    setMessages([]);
    setDone(null);
    try {
      await fn();
      setDone(what);
      onChanged();
    } catch (err) {
      if (err instanceof ApiError && err.fields) {
        setFields(err.fields);
        const known = new Set(['title', 'panels', 'headline', 'brandColor', 'showLogo', 'versionId']);
        setMessages(Object.entries(err.fields).filter(([k]) => !known.has(k.split('.')[0]!)).flatMap(([k, m]) => m.map((x) => (k === '_' ? x : `${k}: ${x}`))));
        if (!Object.keys(err.fields).length) setMessages([err.message]);
      } else setMessages([errorMessage(err)]);
      throw err;
    } finally {
      setPending(false);
    }
  }

  const fieldMsg = (k: string) => {
    const direct = fields[k];
    const nested = Object.entries(fields)
      .filter(([p]) => p.startsWith(`${k}.`))
      .flatMap(([, m]) => m);
    const all = [...(direct ?? []), ...nested];
    return all.length ? all.join(' ') : undefined;
  };

  const versionOptions = versions.map((v) => ({
    value: String(v.number),
    label: `v${v.number} · ${CHECK_STATE_LABELS[v.checkState]}${v.number === widget?.versionNumber ? ' · published now' : ''}`,
    disabled: !publishable(v, requireCheck),
  }));

  if (!versions.length) {
    return (
      <Banner tone="info" title="Nothing to publish yet">
        Save a version of this model first. {requireCheck ? 'A checker then signs it off, and it can be published.' : 'It can then be published.'}
      </Banner>
    );
  }

  const newerCheckedThanLive = widget && newestCandidate && newestCandidate.number > widget.versionNumber ? newestCandidate : null;

  return (
    <div className="space-y-4">
      {widget ? (
        <Banner
          tone="success"
          title={`Published as “${widget.title}”, showing version ${widget.versionNumber}`}
          action={
            canPublish ? (
              <ConfirmButton
                prompt="Take this widget down? Clients see a notice instead of the model until it is published again."
                confirmLabel="Yes, take it down"
                pendingLabel="Taking down…"
                onConfirm={() => run('The widget was taken down.', () => unpublishWidget(widget.id))}
              >
                Take down
              </ConfirmButton>
            ) : null
          }
        >
          By {widget.publishedByName ?? 'a former member'}, <DateText iso={widget.publishedAt} />. Clients with a pass see this version until someone publishes another one here.
        </Banner>
      ) : (
        <Banner tone="info" title="Not published">
          {requireCheck
            ? 'Only a version a checker has signed off can be published. Your firm’s owner can relax this rule in Settings.'
            : 'Your firm allows publishing versions that have not been checked yet; a version that was sent back can never be published.'}
        </Banner>
      )}
      {newerCheckedThanLive ? (
        <Banner tone="warn" title={`Version ${newerCheckedThanLive.number} is ${CHECK_STATE_LABELS[newerCheckedThanLive.checkState].toLowerCase()} and not published`}>
          Clients still see version {widget!.versionNumber}. Choose version {newerCheckedThanLive.number} below and publish it when you are ready.
        </Banner>
      ) : null}
      {done ? <Banner tone="success">{done}</Banner> : null}
      <FormError messages={messages} />

      <form
        noValidate
        className="grid gap-5 lg:grid-cols-2"
        onSubmit={(e) => {
          e.preventDefault();
          if (!chosen) return;
          if (widget) {
            const moving = chosen.id !== widget.versionId;
            void run(moving ? `Version ${chosen.number} is now published.` : 'The widget was updated.', () => updateWidget(widget.id, { ...body, ...(moving ? { versionId: chosen.id } : {}) })).catch(() => undefined);
          } else {
            void run(`Version ${chosen.number} is published.`, () => publishWidget({ ...body, modelId, versionId: chosen.id })).catch(() => undefined);
          }
        }}
      >
        <fieldset disabled={!canPublish || pending} className="space-y-4">
          <Select
            label="Version to publish"
            value={chosenNumber === null ? '' : String(chosenNumber)}
            onChange={(e) => setVersionNumber(Number(e.target.value))}
            options={versionOptions}
            error={fieldMsg('versionId')}
            hint={requireCheck ? 'Versions awaiting a check or sent back cannot be chosen.' : 'Sent-back versions cannot be chosen.'}
          />
          <TextField label="Widget title" value={title} onChange={(e) => setTitle(e.target.value)} maxLength={120} error={fieldMsg('title')} />
          <fieldset>
            <legend className="mb-1 text-sm font-medium text-ink-800">Panels</legend>
            <div className="space-y-1.5">
              {PANEL_IDS.map((p) => (
                <Checkbox
                  key={p}
                  label={PANEL_LABELS[p]}
                  checked={panels.includes(p)}
                  onChange={(e) => setPanels((cur) => (e.target.checked ? PANEL_IDS.filter((x) => x === p || cur.includes(x)) : cur.filter((x) => x !== p)))}
                />
              ))}
            </div>
            {fieldMsg('panels') ? <FieldError>{fieldMsg('panels')}</FieldError> : null}
          </fieldset>
          <Select label="Headline figure" value={headline} onChange={(e) => setHeadline(e.target.value)} options={HEADLINES[template].map((h) => ({ value: h.id, label: h.label }))} error={fieldMsg('headline')} />
          <fieldset>
            <legend className="mb-1 text-sm font-medium text-ink-800">Dials clients may move</legend>
            {modelDials.length ? (
              <div className="space-y-1.5">
                {modelDials.map((d) => (
                  <Checkbox
                    key={d.id}
                    label={`${d.label}${d.unit ? ` (${d.unit})` : ''}`}
                    hint={`From ${d.min} to ${d.max} in steps of ${d.step}; starts at ${d.default}.`}
                    checked={effectiveDials.includes(d.id)}
                    onChange={(e) => setDialIds(e.target.checked ? [...effectiveDials, d.id] : effectiveDials.filter((x) => x !== d.id))}
                  />
                ))}
              </div>
            ) : (
              <p className="text-sm text-ink-600">This version has no dials. Add dials in the editor’s Dials section and save a version to offer them.</p>
            )}
            {fieldMsg('dialIds') ? <FieldError>{fieldMsg('dialIds')}</FieldError> : null}
          </fieldset>
          <div className="grid grid-cols-[auto_1fr] items-end gap-3">
            <div>
              <label htmlFor="widget-brand" className="mb-1 block text-sm font-medium text-ink-800">
                Accent colour
              </label>
              <input id="widget-brand" type="color" value={brandColor} onChange={(e) => setBrandColor(e.target.value)} className="h-10 w-16 rounded border border-ink-300 bg-white p-1" />
            </div>
            <Checkbox label="Show the firm’s logo slot" checked={showLogo} onChange={(e) => setShowLogo(e.target.checked)} className="pb-2" />
          </div>
          {fieldMsg('brandColor') ? <FieldError>{fieldMsg('brandColor')}</FieldError> : null}
          {canPublish ? (
            <Button type="submit" pending={pending} pendingLabel="Publishing…" disabled={!chosen || !publishable(chosen, requireCheck)}>
              {!widget ? `Publish version ${chosen?.number ?? ''}` : chosen && chosen.id !== widget.versionId ? `Publish version ${chosen.number} instead of ${widget.versionNumber}` : 'Save widget changes'}
            </Button>
          ) : (
            <p className="text-sm text-ink-600">Authors and the account owner publish widgets.</p>
          )}
        </fieldset>
        <section aria-labelledby="client-preview-heading" className="min-w-0">
          <h3 id="client-preview-heading" className="mb-2 flex items-center gap-2 text-sm font-semibold text-ink-900">
            As a client will see it <StatusPill kind="info">Preview</StatusPill>
          </h3>
          {chosenModel && renderPreview ? (
            <div className="rounded-lg border border-dashed border-ink-300 p-2">{renderPreview({ model: chosenModel, widget: { ...body, versionNumber: chosen!.number }, signedOffAt: chosen!.checkState === 'signed_off' ? chosen!.checkedAt : null })}</div>
          ) : (
            <p className="text-sm text-ink-600">Choose a version to preview.</p>
          )}
        </section>
      </form>
    </div>
  );
}
