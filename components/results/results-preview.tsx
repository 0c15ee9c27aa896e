'use client';

import type { SampleSelection } from '@/lib/core/engine/simulate';
import { pathText } from '@/lib/core/engine/errors';
import { formatCount, formatDuration } from '@/lib/core/charts/format';
import { Banner } from '@/components/ui/banner';
import { Button } from '@/components/ui/button';
import { EmptyState } from '@/components/ui/empty-state';
import { ProgressBar } from '@/components/ui/progress-bar';
import { cx } from '@/components/ui/cx';
import { ResultsView } from './results-view';
import { useSimulation, type SimulationState } from './use-simulation';
import { createStudioEngine } from '@/lib/core/engine/studio-engine';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

export interface ResultsPreviewProps {
  /** The checked model (null: nothing to run); the engine checks it again with the dial values applied. */
  model: CheckedModel | null;
  /** Dial values by dial id; missing dials take the author's defaults. */
  dialValues?: Record<string, number>;
  /** Sample columns to bring back; by default 'all' (the scatter chart) when the run is small enough, see samplesFor. */
  samples?: SampleSelection;
  debounceMs?: number;
  className?: string;
}

/** Sample values the scatter may bring back from the worker (8 bytes each): about 32 MB. */
export const SAMPLE_BUDGET = 4_000_000;

/**
 * 'all' sample columns when the run is small enough to send them to the page, else none: the scatter
 * needs only a few thousand points, but the worker sends whole columns.
 */
export function samplesFor(model: CheckedModel | null): SampleSelection {
  if (!model) return 'all';
  const columns =
    (model.template === 'linear-stack'
      ? model.contributors.length
      : model.template === 'cost-range'
        ? model.items.length + 3 * model.riskEvents.length
        : model.inputs.length + model.outputs.length) + 1;
  return model.settings.trials * columns <= SAMPLE_BUDGET ? 'all' : 'none';
}

/** Progress of the run in flight, the state between runs, and the last run's time. */
export function RunStatus({ sim, className }: { sim: SimulationState; className?: string }) {
  const p = sim.progress;
  return (
    <div className={cx('min-h-10', className)}>
      {sim.status === 'running' ? (
        <div className="flex items-end gap-3">
          <ProgressBar
            className="min-w-0 flex-1"
            label={p?.runPhase === 'statistics' ? 'Computing statistics' : 'Trials done'}
            value={p ? p.done : undefined}
            max={p ? p.total : 100}
            valueText={p ? `${formatCount(p.done)} of ${formatCount(p.total)} trials · ${formatDuration(p.elapsedMs)}` : 'Starting…'}
          />
          <Button variant="secondary" size="sm" onClick={sim.cancel}>
            Stop
          </Button>
        </div>
      ) : sim.status === 'waiting' ? (
        <p className="text-sm text-ink-600">Inputs changed; the run starts in a moment.</p>
      ) : sim.lastRunMs !== null && sim.result ? (
        <p className="text-xs text-ink-600">
          Last run: <span className="num">{formatCount(sim.result.run.trials)}</span> trials in <span className="num">{formatDuration(sim.lastRunMs)}</span>
        </p>
      ) : null}
      <p role="status" className="sr-only">
        {sim.status === 'done' && sim.runs > 0 ? `Results updated (run ${sim.runs}).` : sim.status === 'error' ? 'The run failed.' : ''}
      </p>
    </div>
  );
}

/** The engine's error with its located issues, and what to do next. */
export function RunError({ sim }: { sim: SimulationState }) {
  if (!sim.error) return null;
  const issues = sim.error.issues.slice(0, 8);
  return (
    <Banner
      tone="danger"
      title="The model could not be run"
      action={
        <Button variant="secondary" size="sm" onClick={sim.rerun}>
          Run again
        </Button>
      }
    >
      {issues.length ? (
        <>
          <p>Correct these fields, then the results update by themselves:</p>
          <ul className="mt-1 list-disc space-y-0.5 pl-5">
            {issues.map((i, k) => (
              <li key={k}>
                <code className="text-[0.8125rem]">{pathText(i.path)}</code>: {i.message}
              </li>
            ))}
          </ul>
          {sim.error.issues.length > issues.length ? <p className="mt-1">…and {sim.error.issues.length - issues.length} more.</p> : null}
        </>
      ) : (
        <p>{sim.error.message}</p>
      )}
      {sim.result ? <p className="mt-1">The results below are from the last run that worked.</p> : null}
    </Banner>
  );
}

/** Live results of a model: reruns in the browser's engine worker as the model or dials change. */
export function ResultsPreview({ model, dialValues, samples, debounceMs, className }: ResultsPreviewProps) {
  const sim = useSimulation(model, dialValues, { samples: samples ?? samplesFor(model), debounceMs, createClient: createStudioEngine });
  return (
    <div className={cx('space-y-3', className)}>
      <RunStatus sim={sim} />
      <RunError sim={sim} />
      {sim.result ? (
        <ResultsView result={sim.result} runMs={sim.lastRunMs} stale={sim.stale} />
      ) : sim.status === 'running' || sim.status === 'waiting' ? null : sim.status === 'idle' ? (
        <EmptyState as="h3" title="No results yet">
          <p>Complete the model and its results appear here, recomputed in your browser as you edit.</p>
        </EmptyState>
      ) : null}
    </div>
  );
}
