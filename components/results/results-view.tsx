'use client';

import { memo, useMemo } from 'react';
import type { RunResult } from '@/lib/core/engine';
import { cautionsFor } from '@/lib/core/cautions';
import { cx } from '@/components/ui/cx';
import { CautionsList } from './cautions-list';
import { CostResults } from './cost-results';
import { FormulaResults } from './formula-results';
import { Convergence, CsvButton, SmallPrint } from './shared';
import { StackResults } from './stack-results';

export interface ResultsViewProps {
  result: RunResult;
  /** Duration to print in the small print (ms); defaults to the engine's own timing. */
  runMs?: number | null;
  /** Dim the figures while a newer run is on its way. */
  stale?: boolean;
  /** Hide the CSV export (e.g. where the viewer may not download). */
  csv?: boolean;
  className?: string;
}

/**
 * A run's results, per template: headline figures first, then the charts that explain them, the
 * convergence verdict and invalid-trial count, the cautions, and the run in small print.
 * Memoised, and the body apart from the stale dimming: progress updates and the start of a run do
 * not render the charts again.
 */
export const ResultsView = memo(function ResultsView({ result, runMs, stale, csv = true, className }: ResultsViewProps) {
  return (
    // Dimmed only when a newer run takes a while: a quick one replaces the figures without a flicker (and without
    // repainting the whole results for a fade).
    <div className={cx('space-y-4 transition-opacity', stale && 'opacity-60 delay-300', className)} aria-busy={stale || undefined}>
      <ResultsBody result={result} runMs={runMs} csv={csv} />
    </div>
  );
});

const ResultsBody = memo(function ResultsBody({ result, runMs, csv }: { result: RunResult; runMs?: number | null; csv: boolean }) {
  // The low-trial flag is not repeated here: the convergence verdict beside the cautions says it.
  const cautions = useMemo(() => cautionsFor(result.template), [result.template]);
  return (
    <>
      {result.template === 'linear-stack' && result.stack ? (
        <StackResults result={result} />
      ) : result.template === 'cost-range' && result.cost ? (
        <CostResults result={result} />
      ) : (
        <FormulaResults result={result} />
      )}
      <div className="grid grid-cols-1 gap-3 lg:grid-cols-[minmax(0,3fr)_minmax(0,2fr)]">
        <Convergence outputs={result.outputs} warnings={result.warnings} />
        <CautionsList cautions={cautions} />
      </div>
      <div className="flex flex-wrap items-center justify-between gap-2 border-t border-ink-200 pt-2">
        <SmallPrint result={result} runMs={runMs} />
        {csv ? <CsvButton result={result} /> : null}
      </div>
    </>
  );
});
