'use client';

import { memo, useEffect, useMemo, useState } from 'react';
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
 * Stale results are dimmed only when the newer run takes this long: a quick run replaces the figures without a
 * flicker, and the page is not restyled (nor its results repainted for a fade) on every keystroke.
 */
const DIM_AFTER_MS = 300;

/** `on`, once it has stayed true for `ms`. */
function useLateFlag(on: boolean, ms: number): boolean {
  const [late, setLate] = useState(false);
  useEffect(() => {
    if (!on) return;
    const t = setTimeout(() => setLate(true), ms);
    return () => {
      clearTimeout(t);
      setLate(false);
    };
  }, [on, ms]);
  return on && late;
}

/**
 * A run's results, per template: headline figures first, then the charts that explain them, the
 * convergence verdict and invalid-trial count, the cautions, and the run in small print.
 * Memoised, and the body apart from the stale dimming: progress updates and the start of a run do
 * not render the charts again.
 */
export const ResultsView = memo(function ResultsView({ result, runMs, stale, csv = true, className }: ResultsViewProps) {
  const dim = useLateFlag(Boolean(stale), DIM_AFTER_MS);
  return (
    <div className={cx('space-y-4 transition-opacity', dim && 'opacity-60', className)} aria-busy={stale || undefined}>
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
