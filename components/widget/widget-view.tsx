'use client';

import { lazy, Suspense, useCallback, useId, useMemo, useState, type CSSProperties, type ReactNode } from 'react';
import { cautionsFor, lowTrialCaution } from '@/lib/core/cautions';
import { formatCount, formatDuration } from '@/lib/core/charts/format';
import { headlineFigure } from '@/lib/core/results/headline';
import { Banner } from '@/components/ui/banner';
import { cx } from '@/components/ui/cx';
import { formatDate } from '@/components/ui/format';
import { ProgressBar } from '@/components/ui/progress-bar';
import { TermTip } from '@/components/ui/term-tip';
import { HEADLINE_GLOSSARY } from '@/components/ui/glossary-headline';
import { CautionsList } from '@/components/results/cautions-list';
import { useSimulation } from '@/components/results/use-simulation';
import type { RunClient } from '@/components/results/simulation-controller';
import { brandColors } from '@/lib/core/widget/brand';
import { DialControl } from './dial-control';
import { atDefaults, initialDialValues, type DialSpec } from '@/lib/core/widget/dial-values';
import { modelOutline } from '@/lib/core/widget/model-outline';
import { WidgetChart, type ChartPanel } from './widget-panels';
import { PinnedViewContext } from './pin-context';
import type { RunResult } from '@/lib/core/engine';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

export type WidgetPanel = 'spread' | 'cumulative' | 'drivers' | 'headline';

export interface WidgetConfig {
  title: string;
  /** Panels in the order shown; unknown ids are ignored. */
  panels: readonly (WidgetPanel | string)[];
  /** Headline figure id (lib/core/models/widget-options.ts HEADLINES). */
  headline: string;
  /** Dials the viewer may move, in this order. */
  dialIds: readonly string[];
}

export interface WidgetBranding {
  firmName: string;
  /** The firm's accent colour (#rrggbb); darkened where needed for contrast. */
  brandColor: string;
  logoUrl?: string | null;
}

export interface WidgetVersionInfo {
  number: number;
  /** ISO time of the checker's sign-off; absent for a version published without one. */
  signedOffAt?: string | null;
}

export interface WidgetViewProps {
  /** The published version's model, checked on the server when it was saved. */
  model: CheckedModel;
  widget: WidgetConfig;
  branding: WidgetBranding;
  versionInfo: WidgetVersionInfo;
  /** Called after every dial change (dialId null for a reset), with all dial values. */
  onDialChange?: (values: Record<string, number>, dialId: string | null) => void;
  /** Start from these values (e.g. restored from a link); out-of-range values are ignored. */
  initialDialValues?: Record<string, number>;
  /** Extra actions in the footer (e.g. "E-mail me this view"). */
  actions?: ReactNode;
  /** Heading level of the title (h1 when the widget is the whole page). */
  headingLevel?: 'h1' | 'h2';
  /**
   * The result at the author's values as the server computed it for this version (the embed's first figures): shown
   * at once, until the viewer moves a dial; the footer says where it came from.
   */
  firstFigures?: { result: RunResult; computedAt: string } | null;
  /** The engine pool: createEmbedEngine on the embed page (no schema), createStudioEngine elsewhere. */
  createEngine: () => RunClient;
  className?: string;
}

// The side-by-side comparison is fetched when a viewer first pins a view, not with the page.
const CompareView = lazy(() => import('./compare-view').then((m) => ({ default: m.CompareView })));

const CHART_PANELS = new Set<string>(['spread', 'cumulative', 'drivers']);

/**
 * What a client viewer sees: the firm's branding, the title, the dials they may move, the headline
 * figure, the chosen charts and the cautions, with the version and its sign-off. Every dial move
 * reruns the model in the browser with the same seed and sub-streams, so only what the dial touches
 * changes. No dashboard or sign-in code: the embed page uses this as it is.
 */
export function WidgetView({ model, widget, branding, versionInfo, onDialChange, initialDialValues: given, actions, headingLevel: H = 'h2', className, createEngine, firstFigures }: WidgetViewProps) {
  const outline = useMemo(() => modelOutline(model), [model]);
  const dials = useMemo<DialSpec[]>(() => {
    const byId = new Map(outline.dials.map((d) => [d.id, d]));
    return widget.dialIds.flatMap((id) => {
      const d = byId.get(id);
      return d ? [d] : [];
    });
  }, [outline, widget.dialIds]);

  const [values, setValues] = useState<Record<string, number>>(() => initialDialValues(dials, given));
  // Bumped by a reset so each dial's half-typed text and message are cleared too.
  const [resets, setResets] = useState(0);
  // A view the viewer pinned to compare with: its result as computed on screen (the dial values are in it).
  const [pin, setPin] = useState<RunResult | null>(null);
  // Dials can change with a new model; keep only theirs, with defaults for new ones.
  const current = useMemo(() => {
    const out: Record<string, number> = {};
    for (const d of dials) out[d.id] = values[d.id] ?? d.default;
    return out;
  }, [dials, values]);

  // The server's first figures stand for the author's values until the viewer first moves a dial or resets. The
  // browser still runs those values meanwhile, unseen: its workers warm up and keep the input columns, so the first
  // dial move redoes only what it touches.
  const [moved, setMoved] = useState(false);
  const first = firstFigures && !moved && atDefaults(dials, current) ? firstFigures : null;
  // A dial move is one discrete step: a short wait is enough to merge a burst of key presses.
  const sim = useSimulation(model, current, { samples: 'none', debounceMs: 30, createClient: createEngine });
  // A model the engine refuses at the author's own values cannot be shown at all (not just these settings).
  const broken = !first && sim.error && !sim.result && atDefaults(dials, current) ? (sim.error.issues[0]?.message ?? sim.error.message) : null;
  const colors = useMemo(() => brandColors(branding.brandColor), [branding.brandColor]);

  const setDial = useCallback(
    (id: string, v: number) => {
      const next = { ...current, [id]: v };
      setMoved(true);
      setValues(next);
      onDialChange?.(next, id);
    },
    [current, onDialChange],
  );
  const reset = useCallback(() => {
    const next = initialDialValues(dials);
    setMoved(true);
    setValues(next);
    setResets((n) => n + 1);
    setPin(null);
    onDialChange?.(next, null);
  }, [dials, onDialChange]);

  // After the first move, until the browser's first result is back, the server's figures stay on screen, dimmed.
  const carried = !first && !sim.result && firstFigures ? firstFigures.result : null;
  const result = first ? first.result : (sim.result ?? carried);
  const fromServer = first !== null || carried !== null;
  const stale = first ? false : sim.stale || carried !== null;
  const pending = first ? null : sim.pending;
  const failed = first ? null : sim.error;
  const panels = widget.panels.filter((p) => p === 'headline' || CHART_PANELS.has(p));
  const chartPanels = panels.filter((p): p is ChartPanel => CHART_PANELS.has(p));
  const uid = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  const titleId = `${uid}-title`;
  // Only a settled result can be pinned: its figures belong to the dial values on screen.
  const canPin = Boolean(result) && !stale && (first !== null || (sim.status !== 'running' && sim.status !== 'waiting')) && !failed;
  const pinnedValues = useMemo(() => (pin ? { ...pin.run.dialValues } : null), [pin]);
  const headline = result && panels.includes('headline') ? headlineFigure(result, widget.headline) : null;
  const cautions = useMemo(() => {
    const template = outline.template;
    const low = result ? lowTrialCaution(result.outputs) : null;
    return [...(low ? [low] : []), ...cautionsFor(template)];
  }, [outline, result]);
  const invalid = result ? result.outputs.reduce((s, o) => s + o.invalid.total, 0) : 0;

  const style = {
    '--st-brand': colors.accent,
    '--st-brand-text': colors.accentText,
    '--st-focus': colors.accentText,
  } as CSSProperties;

  return (
    <section aria-labelledby={titleId} style={style} className={cx('@container min-w-0', className)}>
      <div className="overflow-hidden rounded-xl border border-ink-200 bg-white shadow-[0_1px_2px_rgb(20_28_34/0.06)]">
        <header className="flex flex-wrap items-center justify-between gap-x-4 gap-y-1 border-t-4 border-b border-b-ink-100 px-3 py-2.5 @md:px-4" style={{ borderTopColor: 'var(--st-brand)' }}>
          <div className="flex min-w-0 items-center gap-2.5">
            {branding.logoUrl ? (
              // A firm's logo from its own settings (any size or origin the app allows); next/image would need every host configured.
              // eslint-disable-next-line @next/next/no-img-element
              <img src={branding.logoUrl} alt={`${branding.firmName} logo`} className="h-7 w-auto max-w-[8rem] object-contain" />
            ) : null}
            <span className="truncate text-sm font-semibold" style={{ color: 'var(--st-brand-text)' }}>
              {branding.firmName}
            </span>
          </div>
          <p className="text-xs text-ink-600">
            Version <span className="num">{versionInfo.number}</span> ·{' '}
            {versionInfo.signedOffAt ? (
              <>
                checked and signed off <time dateTime={versionInfo.signedOffAt}>{formatDate(versionInfo.signedOffAt)}</time>
              </>
            ) : (
              'not signed off by a checker'
            )}
          </p>
        </header>

        <div className="space-y-4 px-3 py-3 @md:px-4 @md:py-4">
          <H id={titleId} className="text-lg leading-snug font-semibold text-ink-900 @2xl:text-xl">
            {widget.title}
          </H>

          {broken ? (
            <Banner tone="danger" title="This model cannot be shown">
              <p>The published model did not pass its checks ({broken}). Ask the firm that shared it to publish it again.</p>
            </Banner>
          ) : null}

          <div className={cx('grid grid-cols-1 gap-4', dials.length > 0 && panels.includes('headline') && '@3xl:grid-cols-[minmax(0,1fr)_minmax(0,1fr)]')}>
            {dials.length && !broken ? (
              <fieldset className="min-w-0 space-y-3 rounded-lg border border-ink-200 bg-ink-50 px-3 pt-2 pb-3">
                <legend className="px-1 text-sm font-semibold text-ink-900">Try other values</legend>
                {dials.map((d) => (
                  <DialControl key={`${d.id}-${resets}`} dial={d} value={current[d.id]} onChange={(v) => setDial(d.id, v)} />
                ))}
                <button
                  type="button"
                  onClick={reset}
                  disabled={atDefaults(dials, current)}
                  className="inline-flex h-8 items-center gap-1.5 rounded-md border border-ink-300 bg-white px-3 text-[0.8125rem] font-medium shadow-sm hover:border-ink-500 disabled:cursor-not-allowed disabled:opacity-60"
                  style={{ color: 'var(--st-brand-text)' }}
                >
                  <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round">
                    <path d="M3 8a5 5 0 1 0 1.5-3.6M3 2.5v2.8h2.8" />
                  </svg>
                  Reset to the author’s values
                </button>
                <div className="flex flex-wrap items-center gap-2 border-t border-ink-200 pt-2">
                  <button
                    type="button"
                    onClick={() => result && setPin(result)}
                    disabled={!canPin}
                    className="inline-flex h-8 items-center gap-1.5 rounded-md border border-ink-300 bg-white px-3 text-[0.8125rem] font-medium shadow-sm hover:border-ink-500 disabled:cursor-not-allowed disabled:opacity-60"
                    style={{ color: 'var(--st-brand-text)' }}
                  >
                    <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round">
                      <path d="M6 2h4l-.5 4 2.5 2.5H4L6.5 6zM8 8.5V14" />
                    </svg>
                    {pin ? 'Pin this view instead' : 'Pin this view'}
                  </button>
                  {pin ? (
                    <button type="button" onClick={() => setPin(null)} className="inline-flex h-8 items-center rounded-md px-2 text-[0.8125rem] font-medium text-ink-700 underline underline-offset-2 hover:text-ink-900">
                      Clear the pin
                    </button>
                  ) : null}
                  <p role="status" className="w-full text-xs text-ink-600">
                    {pin ? 'A view is pinned: move the dials to see it beside the current view.' : 'Pin a view, then move the dials to compare the two.'}
                  </p>
                </div>
              </fieldset>
            ) : null}

            {panels.includes('headline') ? (
              <div className="min-w-0 space-y-2">
                <div className={cx('rounded-lg border border-l-4 border-ink-200 bg-white px-4 py-3 transition-opacity', stale && 'opacity-60')} style={{ borderLeftColor: 'var(--st-brand)' }} aria-live="polite" aria-atomic="true">
                  {headline ? (
                    <>
                      <p className="text-sm text-ink-700">{headline.term ? <TermTip explain={HEADLINE_GLOSSARY[headline.term]}>{headline.label}</TermTip> : headline.label}</p>
                      <p className="num mt-0.5 text-3xl font-semibold whitespace-nowrap text-ink-900 @2xl:text-4xl">{headline.value}</p>
                      {headline.sub ? <p className="mt-1 text-[0.8125rem] text-ink-600">{headline.sub}</p> : null}
                    </>
                  ) : (
                    <p className="py-3 text-sm text-ink-600">{sim.status === 'error' ? 'No figure: the run failed.' : 'Computing…'}</p>
                  )}
                </div>
                <WidgetProgress sim={sim} quiet={first !== null} />
              </div>
            ) : null}
          </div>

          {!panels.includes('headline') ? <WidgetProgress sim={sim} quiet={first !== null} /> : null}

          {failed && !broken ? (
            <Banner
              tone="danger"
              title="These settings cannot be computed"
              action={
                dials.length ? (
                  <button type="button" onClick={reset} className="inline-flex h-8 items-center rounded-md border border-ink-300 bg-white px-3 text-[0.8125rem] font-medium text-ink-800">
                    Reset to the author’s values
                  </button>
                ) : null
              }
            >
              <p>{failed.issues[0]?.message ?? failed.message}</p>
              {result ? <p className="mt-1">The figures below are from the last settings that worked.</p> : null}
            </Banner>
          ) : null}

          {result ? (
            <div className={cx('grid grid-cols-1 gap-4 transition-opacity @3xl:grid-cols-2', (stale || pending) && 'opacity-60')} aria-busy={pending ? true : undefined}>
              {chartPanels.map((p, i) => (
                <div key={p} className={chartPanels.length % 2 === 1 && i === 0 ? '@3xl:col-span-2' : undefined}>
                  <WidgetChart result={result} panel={p} />
                </div>
              ))}
            </div>
          ) : null}

          {pin && result ? (
            <Suspense fallback={<p className="text-xs text-ink-600">Preparing the comparison…</p>}>
              <CompareView pinned={pin} current={result} headline={widget.headline} dials={dials} titleId={`${uid}-compare`} />
            </Suspense>
          ) : null}

          <CautionsList cautions={cautions} />

          <footer className="flex flex-wrap items-center justify-between gap-2 border-t border-ink-100 pt-2">
            <p className="text-xs text-ink-600">
              {result && fromServer && firstFigures ? (
                <>
                  <span className="num">{formatCount(result.run.trials)}</span> trials · computed by Stochos for the author’s values on{' '}
                  <time dateTime={firstFigures.computedAt}>{formatDate(firstFigures.computedAt)}</time>
                </>
              ) : result ? (
                <>
                  <span className="num">{formatCount(result.run.trials)}</span> trials · <span className="num">{formatDuration(sim.lastRunMs ?? result.timing.totalMs)}</span>
                  {invalid > 0 ? (
                    <>
                      {' '}
                      · <span className="num">{formatCount(invalid)}</span> invalid trials left out
                    </>
                  ) : null}{' '}
                  · computed in your browser
                </>
              ) : (
                'Computed in your browser'
              )}
            </p>
            {actions ? (
              <PinnedViewContext.Provider value={pinnedValues}>
                <div className="flex flex-wrap gap-2">{actions}</div>
              </PinnedViewContext.Provider>
            ) : null}
          </footer>
        </div>
      </div>
    </section>
  );
}

/** `quiet`: the run in flight is the unseen one behind the server's first figures. */
function WidgetProgress({ sim, quiet }: { sim: ReturnType<typeof useSimulation>; quiet?: boolean }) {
  const p = sim.progress;
  return (
    <div className="min-h-7">
      {quiet ? null : sim.status === 'running' ? (
        <ProgressBar
          label="Updating"
          value={p ? p.done : undefined}
          max={p ? p.total : 100}
          valueText={p ? `${formatCount(p.done)} of ${formatCount(p.total)} trials · ${formatDuration(p.elapsedMs)}` : 'Starting…'}
        />
      ) : sim.status === 'waiting' ? (
        <p className="text-xs text-ink-600">Updating…</p>
      ) : null}
    </div>
  );
}
