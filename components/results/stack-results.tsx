'use client';

import { memo, useDeferredValue, useMemo } from 'react';
import type { RunResult } from '@/lib/core/engine';
import { formatFixed, formatPpm } from '@/lib/core/charts/format';
import type { RangeRow } from '@/lib/core/charts/ranges';
import { CumulativeChart } from '@/components/charts/cumulative-chart';
import { DriversChart } from '@/components/charts/drivers-chart';
import { RangesChart } from '@/components/charts/ranges-chart';
import { SpreadChart } from '@/components/charts/spread-chart';
import { Term } from '@/components/ui/term';
import { Figure, Figures, StatusMark } from './figures';
import { AchievedCorrelations, StackCorrelationTerms } from './correlation-report';
import { fv, limitsOf, outLabelsOf, outputFormat, ScatterPanel, outShareOf } from './shared';
import { normalEstimateNote } from '@/lib/core/results/headline';

const PPK_MIN = 1.33; // common practice, no source: the usual minimum for an established process

function MethodCard({ title, range, within, note }: { title: React.ReactNode; range: string; within: boolean; note?: React.ReactNode }) {
  return (
    <div className="min-w-0 rounded-md border border-ink-200 bg-white px-3 py-2.5">
      <h4 className="text-[0.8125rem] font-semibold text-ink-900">{title}</h4>
      <p className="num mt-0.5 text-[0.9375rem] font-medium break-words text-ink-900">{range}</p>
      <p className="mt-0.5 text-xs">
        <StatusMark tone={within ? 'good' : 'bad'}>{within ? 'Within the limits' : 'Beyond a limit'}</StatusMark>
      </p>
      {note ? <p className="mt-0.5 text-xs leading-snug text-ink-600">{note}</p> : null}
    </div>
  );
}

/**
 * Results of a tolerance stack-up: out-of-spec first, the three methods side by side, then the charts. The charts
 * follow a deferred copy of the result: an edit paints the figures first and the charts in a render of their own.
 */
export function StackResults({ result }: { result: RunResult }) {
  const deferred = useDeferredValue(result);
  return (
    <div className="space-y-4">
      <StackFigures result={result} />
      <StackCharts result={deferred} />
    </div>
  );
}

function StackFigures({ result }: { result: RunResult }) {
  const s = result.stack!;
  const a = s.analytic;
  const gap = result.outputs[0];
  const unit = a.unit;
  const mc = s.monteCarlo;
  const l = gap.limits;
  const f = outputFormat(unit, mc.sd);
  const limits = limitsOf(gap);
  const mcLo = mc.mean !== null && mc.sd !== null ? mc.mean - 3 * mc.sd : null;
  const mcHi = mc.mean !== null && mc.sd !== null ? mc.mean + 3 * mc.sd : null;
  const within = (lo: number | null, hi: number | null) => lo !== null && hi !== null && (a.limits.lower === null || lo >= a.limits.lower) && (a.limits.upper === null || hi <= a.limits.upper);

  const rows = useMemo<RangeRow[]>(() => {
    const r: RangeRow[] = [
      { id: 'wc', label: 'Worst case', min: a.worstCase.min, max: a.worstCase.max, centre: a.nominalGap },
      { id: 'rss', label: 'RSS', min: a.rss.min, max: a.rss.max, centre: a.rss.mean },
    ];
    if (mcLo !== null && mcHi !== null) r.push({ id: 'mc', label: 'Monte Carlo ±3 s', min: mcLo, max: mcHi, centre: mc.mean });
    return r;
  }, [a, mcLo, mcHi, mc.mean]);
  const ppk = mc.ppk;

  return (
    <>
      <Figures label="Headline figures">
        <Figure
          lead
          label={
            <>
              Out of specification, observed (<Term term="ppm">ppm</Term>)
            </>
          }
          value={mc.ppmObserved !== null ? formatPpm(mc.ppmObserved) : '—'}
          sub={mc.ppmObservedCi ? `95 % interval ${formatPpm(mc.ppmObservedCi.low)} to ${formatPpm(mc.ppmObservedCi.high)}` : undefined}
        />
        <Figure label="Out of specification, normal estimate" value={mc.ppmNormal !== null ? formatPpm(mc.ppmNormal) : '—'} sub={normalEstimateNote(mc.ppmObserved, mc.ppmNormal) ?? 'Needs a limit and a spread'} />
        <Figure
          label={
            <>
              <Term term="Pp/Ppk">Pp / Ppk</Term> of the {gap.label.toLowerCase()}
            </>
          }
          value={`${mc.pp !== null ? formatFixed(mc.pp, 2) : '—'} / ${ppk !== null ? formatFixed(ppk, 2) : '—'}`}
          sub={ppk !== null ? <StatusMark tone={ppk >= PPK_MIN ? 'good' : 'warn'}>{ppk >= PPK_MIN ? `Ppk meets the common ${PPK_MIN} minimum` : `Ppk below the common ${PPK_MIN} minimum`}</StatusMark> : 'Needs two limits for Pp'}
        />
        <Figure label={`Mean ${gap.label.toLowerCase()} · standard deviation`} value={f(mc.mean)} sub={<span className="num">s = {fv(mc.sd, unit, 3)}</span>} />
      </Figures>

      <section aria-labelledby={`${gap.id}-methods`} className="space-y-2">
        <h3 id={`${gap.id}-methods`} className="text-sm font-semibold text-ink-900">
          <Term term="worst case">Worst case</Term>, <Term term="RSS">RSS</Term> and <Term term="Monte Carlo">Monte Carlo</Term> side by side
        </h3>
        <div className="grid grid-cols-1 gap-2 sm:grid-cols-3">
          <MethodCard title="Worst case" range={`${f(a.worstCase.min)} to ${f(a.worstCase.max)}`} within={a.worstCaseWithinLimits} note="Every dimension at its worst limit at once" />
          <MethodCard title="RSS" range={`${f(a.rss.min)} to ${f(a.rss.max)}`} within={a.rssWithinLimits} note={
              <>
                <span className="num">centre {f(a.rss.mean)} ± {f(a.rss.halfWidth)}</span>
                {a.correlated ? <span className="num block">with the correlation terms; ± {f(a.independent.rssHalfWidth)} without</span> : null}
              </>
            }
          />
          <MethodCard
            title="Monte Carlo"
            range={mcLo !== null && mcHi !== null ? `${f(mcLo)} to ${f(mcHi)}` : '—'}
            within={within(mcLo, mcHi)}
            note={
              <>
                mean ±3 s; <span className="num">{l ? `${formatPpm(l.ppmObserved)}` : '—'}</span> beyond the limits in {formatFixed(gap.valid, 0)} trials
              </>
            }
          />
        </div>
        <RangesChart name={gap.label} unit={unit} rows={rows} limits={limits} headingLevel="h4" />
        <StackCorrelationTerms a={a} format={f} />
        <AchievedCorrelations result={result} names={new Map(s.contributors.map((c) => [c.id, c.name]))} />
      </section>
    </>
  );
}

const StackCharts = memo(function StackCharts({ result }: { result: RunResult }) {
  const s = result.stack!;
  const gap = result.outputs[0];
  const unit = s.analytic.unit;
  const mc = s.monteCarlo;
  const f = outputFormat(unit, mc.sd);
  const limits = useMemo(() => limitsOf(gap), [gap]);
  const outShare = useMemo(() => outShareOf(gap), [gap]);
  const drivers = useMemo(() => s.contributors.map((c) => ({ id: c.id, label: c.name, share: c.analyticShare, correlation: c.spearman })), [s.contributors]);
  const markers = useMemo(() => (mc.mean !== null ? [{ value: mc.mean, label: `Mean ${f(mc.mean)}`, kind: 'mean' as const }] : []), [mc.mean, f]);
  const outLabels = useMemo(() => outLabelsOf(gap, 'ppm'), [gap]);
  const percentiles = useMemo(() => gap.percentiles.filter((p) => [0.1, 0.5, 0.8, 0.9].includes(p.p)).map((p) => ({ p: p.p, value: p.value })), [gap.percentiles]);
  const allPercentiles = useMemo(() => gap.percentiles.map((p) => ({ p: p.p, value: p.value })), [gap.percentiles]);
  const candidates = useMemo(() => s.contributors.map((c) => ({ id: c.id, label: c.name, unit })), [s.contributors, unit]);

  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
      <SpreadChart className="xl:col-span-2" name={gap.label} unit={unit} bins={gap.histogram} total={gap.valid} limits={limits} markers={markers} outLabels={outLabels} outShare={outShare} />
      <CumulativeChart name={gap.label} unit={unit} ecdf={gap.ecdf} percentiles={percentiles} tablePercentiles={allPercentiles} limits={limits} />
      <DriversChart
        name={gap.label}
        drivers={drivers}
        title="Contributors by share of variance"
        shareLabel="Share of variance (σᵢ² / Σσ²)"
        caption={`Contributors ranked by their share of the ${gap.label.toLowerCase()}'s variance under the chosen distributions. An up arrow means a larger dimension widens the ${gap.label.toLowerCase()}; a down arrow means it narrows it.`}
      />
      <div className="xl:col-span-2">
        <ScatterPanel result={result} output={gap} limits={limits} candidates={candidates} />
      </div>
    </div>
  );
});
