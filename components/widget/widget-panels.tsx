'use client';

import { useMemo } from 'react';
import type { OutputSummary, RunResult } from '@/lib/engine';
import type { SpecLimits, ValueMarker } from '@/lib/charts/spread';
import { decimalsForSignificant, formatPercent, formatPpm, formatValue, isCurrency } from '@/lib/charts/format';
import { CumulativeChart } from '@/components/charts/cumulative-chart';
import { DriversChart } from '@/components/charts/drivers-chart';
import { SpreadChart } from '@/components/charts/spread-chart';

export type ChartPanel = 'spread' | 'cumulative' | 'drivers';

/** The output a widget shows: the gap, the total, or a formula model's last output. */
export function widgetOutput(r: RunResult): OutputSummary {
  return r.template === 'formula' ? r.outputs[r.outputs.length - 1] : r.outputs[0];
}

function limitsOf(r: RunResult, o: OutputSummary): SpecLimits | undefined {
  const l = o.limits;
  if (!l || (l.lower === null && l.upper === null)) return undefined;
  return r.template === 'cost-range' ? { upper: l.upper, upperLabel: 'Budget' } : { lower: l.lower, upper: l.upper };
}

function format(o: OutputSummary) {
  if (isCurrency(o.unit) || !(o.sd && o.sd > 0)) return (v: number) => formatValue(v, o.unit, { significant: 4 });
  const decimals = Math.min(8, decimalsForSignificant(o.sd, 2));
  return (v: number) => formatValue(v, o.unit, { decimals });
}

/** One chart panel of a widget, configured for the run's template. */
export function WidgetChart({ result, panel }: { result: RunResult; panel: ChartPanel }) {
  const o = widgetOutput(result);
  const limits = useMemo(() => limitsOf(result, o), [result, o]);
  const cost = result.template === 'cost-range' ? result.cost : null;
  const f = format(o);

  const percentiles = useMemo(() => {
    if (cost) return [0.1, 0.5, 0.8, 0.9].map((p) => ({ p, value: p === 0.1 ? cost.p10 : p === 0.5 ? cost.p50 : p === 0.8 ? cost.p80 : cost.p90 }));
    return o.percentiles.filter((p) => [0.1, 0.5, 0.8, 0.9].includes(p.p)).map((p) => ({ p: p.p, value: p.value }));
  }, [cost, o.percentiles]);
  const allPercentiles = useMemo(() => o.percentiles.map((p) => ({ p: p.p, value: p.value })), [o.percentiles]);

  const curveMarkers = useMemo<ValueMarker[]>(() => {
    if (!cost) return [];
    const a = cost.analytic;
    return Math.abs(a.baseEstimate - a.sumMostLikely) <= 1e-9 * Math.max(1, Math.abs(a.sumMostLikely))
      ? [{ value: a.sumMostLikely, label: 'Base = sum of most likely', kind: 'most-likely-sum' }]
      : [
          { value: a.sumMostLikely, label: 'Sum of most likely', kind: 'most-likely-sum' },
          { value: a.baseEstimate, label: 'Base estimate', kind: 'base' },
        ];
  }, [cost]);

  const spreadMarkers = useMemo<ValueMarker[]>(() => {
    if (cost) return [{ value: cost.atConfidence.value, label: `P${Math.round(cost.confidence * 100)} ${f(cost.atConfidence.value)}`, kind: 'percentile' }];
    return o.mean !== null ? [{ value: o.mean, label: `Mean ${f(o.mean)}`, kind: 'mean' }] : [];
    // f depends only on the output
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [cost, o]);

  const outLabels = useMemo(() => {
    const l = o.limits;
    if (!l) return undefined;
    if (cost) return { upper: l.above ? `${formatPercent(l.above.p)} over budget` : null };
    const show = result.template === 'linear-stack' ? (p: number) => formatPpm(p * 1e6) : (p: number) => formatPercent(p);
    return { lower: l.below ? `${show(l.below.p)} below` : null, upper: l.above ? `${show(l.above.p)} above` : null };
  }, [o, cost, result.template]);

  const outShare = useMemo(() => (o.limits ? { below: o.limits.below?.p ?? 0, above: o.limits.above?.p ?? 0 } : undefined), [o.limits]);
  const drivers = useMemo(() => {
    if (result.stack) return result.stack.contributors.map((c) => ({ id: c.id, label: c.name, share: c.analyticShare, correlation: c.spearman }));
    return o.drivers.items.map((d) => ({ id: d.id, label: d.label, share: d.share, correlation: d.spearman }));
  }, [result.stack, o.drivers.items]);

  if (panel === 'spread')
    return <SpreadChart name={o.label} unit={o.unit} bins={o.histogram} total={o.valid} limits={limits} markers={spreadMarkers} outLabels={outLabels} outShare={outShare} headingLevel="h3" />;
  if (panel === 'cumulative')
    return (
      <CumulativeChart
        name={o.label}
        unit={o.unit}
        ecdf={o.ecdf}
        percentiles={percentiles}
        tablePercentiles={allPercentiles}
        markers={curveMarkers}
        limits={limits}
        limitRanks={Boolean(cost)}
        title={cost ? 'S-curve' : 'Cumulative (S-curve)'}
        headingLevel="h3"
      />
    );
  return <DriversChart name={o.label} drivers={drivers} title={result.stack ? 'What moves the gap most' : 'What moves the result most'} maxBars={6} headingLevel="h3" />;
}
