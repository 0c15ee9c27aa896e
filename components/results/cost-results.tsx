'use client';

import { memo, useDeferredValue, useMemo } from 'react';
import type { RunResult } from '@/lib/core/engine';
import { formatPercent, percentileName } from '@/lib/core/charts/format';
import type { ValueMarker } from '@/lib/core/charts/spread';
import { CumulativeChart } from '@/components/charts/cumulative-chart';
import { DriversChart } from '@/components/charts/drivers-chart';
import { SpreadChart } from '@/components/charts/spread-chart';
import { GLOSSARY, Term, type GlossaryTerm } from '@/components/ui/term';
import { Figure, Figures } from './figures';
import { fa, fv, ScatterPanel, outShareOf } from './shared';

function pTerm(p: number) {
  const name = percentileName(p);
  return name in GLOSSARY ? <Term term={name as GlossaryTerm}>{name}</Term> : <Term explain={`The value with a ${formatPercent(p)} chance of not being exceeded.`}>{name}</Term>;
}

/**
 * Results of a cost range: value at the chosen confidence and contingency first, then the S-curve. The charts follow
 * a deferred copy of the result: an edit paints the figures first and the charts in a render of their own.
 */
export function CostResults({ result }: { result: RunResult }) {
  const deferred = useDeferredValue(result);
  return (
    <div className="space-y-4">
      <CostPart result={result} part="figures" />
      <CostPart result={deferred} part="charts" />
    </div>
  );
}

const CostPart = memo(function CostPart({ result, part }: { result: RunResult; part: 'figures' | 'charts' }) {
  const c = result.cost!;
  const a = c.analytic;
  const total = result.outputs[0];
  const unit = a.currency;
  const conf = percentileName(c.confidence);
  const budget = a.budget;

  const percentiles = useMemo(
    () => [
      { p: 0.1, value: c.p10 },
      { p: 0.5, value: c.p50 },
      { p: 0.8, value: c.p80 },
      { p: 0.9, value: c.p90 },
    ],
    [c.p10, c.p50, c.p80, c.p90],
  );
  const allPercentiles = useMemo(() => total.percentiles.map((p) => ({ p: p.p, value: p.value })), [total.percentiles]);
  const markers = useMemo<ValueMarker[]>(() => {
    const same = Math.abs(a.baseEstimate - a.sumMostLikely) <= 1e-9 * Math.max(1, Math.abs(a.sumMostLikely));
    return same
      ? [{ value: a.sumMostLikely, label: 'Base = sum of most likely', kind: 'most-likely-sum' }]
      : [
          { value: a.sumMostLikely, label: 'Sum of most likely', kind: 'most-likely-sum' },
          { value: a.baseEstimate, label: 'Base estimate', kind: 'base' },
        ];
  }, [a.baseEstimate, a.sumMostLikely]);
  const limits = useMemo(() => (budget !== null ? { upper: budget, upperLabel: 'Budget' } : undefined), [budget]);
  const spreadMarkers = useMemo<ValueMarker[]>(() => [{ value: c.atConfidence.value, label: `${conf} ${fv(c.atConfidence.value, unit)}`, kind: 'percentile' }], [c.atConfidence.value, conf, unit]);
  const outLabels = useMemo(() => (c.exceedBudget ? { upper: `${formatPercent(c.exceedBudget.p)} over budget` } : undefined), [c.exceedBudget]);
  const outShare = useMemo(() => outShareOf(total), [total]);
  const drivers = useMemo(() => total.drivers.items.map((d) => ({ id: d.id, label: d.label, share: d.share, correlation: d.spearman })), [total.drivers.items]);
  const candidates = useMemo(() => total.drivers.items.map((d) => ({ id: d.id, label: d.label, unit })), [total.drivers.items, unit]);

  if (part === 'figures')
    return (
      <>
        <Figures label="Headline figures">
          <Figure
            lead
            label={<>Total at the chosen confidence ({pTerm(c.confidence)})</>}
            value={fv(c.atConfidence.value, unit)}
            sub={c.atConfidence.ci ? <span className="num">95 % interval {fv(c.atConfidence.ci.low, unit)} to {fv(c.atConfidence.ci.high, unit)}</span> : undefined}
          />
          <Figure
            label={
              <>
                <Term term="contingency">Contingency</Term> to {conf}
              </>
            }
            value={fv(c.contingency, unit)}
            sub={
              <>
                over the base estimate <span className="num">{fa(a.baseEstimate, unit)}</span>
                {c.contingencyShareOfBase !== null ? <span className="num"> ({formatPercent(c.contingencyShareOfBase)})</span> : null}
              </>
            }
          />
          <Figure
            label={budget !== null ? <>Chance of exceeding the budget of <span className="num whitespace-nowrap">{fa(budget, unit)}</span></> : 'Chance of exceeding the budget'}
            value={c.exceedBudget ? formatPercent(c.exceedBudget.p) : '—'}
            sub={c.exceedBudget ? <span className="num">95 % interval {formatPercent(c.exceedBudget.ci.low)} to {formatPercent(c.exceedBudget.ci.high)}</span> : 'No budget set in the model'}
          />
          <Figure
            label={<>Sum of most-likely values, <span className="num whitespace-nowrap">{fa(a.sumMostLikely, unit)}</span></>}
            value={`${percentileName(Math.round(c.sumMostLikelyRank * 100) / 100)} on the S-curve`}
            sub={`Only ${formatPercent(c.sumMostLikelyRank)} of outcomes are at or below it${c.sumMostLikelyRank < 0.5 ? ': the single-figure estimate is optimistic' : ''}.`}
          />
        </Figures>

        <dl aria-label="Percentiles" className="grid grid-cols-2 gap-px overflow-hidden rounded-md border border-ink-200 bg-ink-200 sm:grid-cols-4">
          {percentiles.map((p) => (
            <div key={p.p} className="bg-white px-3 py-2">
              <dt className="text-xs font-medium text-ink-600">{pTerm(p.p)}</dt>
              <dd className="num text-base font-semibold whitespace-nowrap text-ink-900">{fv(p.value, unit)}</dd>
            </div>
          ))}
        </dl>
      </>
    );
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
      <CumulativeChart
        className="xl:col-span-2"
        title={<Term term="S-curve">S-curve</Term>}
        name={total.label}
        unit={unit}
        ecdf={total.ecdf}
        percentiles={percentiles}
        tablePercentiles={allPercentiles}
        markers={markers}
        limits={limits}
        limitRanks
      />
      <DriversChart name={total.label} drivers={drivers} title="Drivers of the total" caption={`Line items and risks ranked by their share of the variance of the total (squared rank correlations, normalised). An up arrow means a higher value raises the total.`} />
      <SpreadChart name={total.label} unit={unit} bins={total.histogram} total={total.valid} limits={limits} markers={spreadMarkers} outLabels={outLabels} outShare={outShare} />
      <div className="xl:col-span-2">
        <ScatterPanel result={result} output={total} candidates={candidates} />
      </div>
    </div>
  );
});
