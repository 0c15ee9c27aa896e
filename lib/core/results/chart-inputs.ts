// The chart inputs of a run's widget panels, without React: the client widget draws them, and the
// PDF snapshot passes the same inputs to lib/core/charts/svg-string.ts so both show the same pictures.
import type { OutputSummary, RunResult } from '@/lib/core/engine';
import type { CumulativeInput } from '@/lib/core/charts/cumulative';
import type { DriversInput } from '@/lib/core/charts/drivers';
import { decimalsForSignificant, formatPercent, formatPpm, formatValue, isCurrency, percentileName } from '@/lib/core/charts/format';
import type { SpecLimits, SpreadInput, ValueMarker } from '@/lib/core/charts/spread';

export interface PanelChartInputs {
  /** The output the panels show: the gap, the total, or a formula model's last output. */
  output: OutputSummary;
  spread: Omit<SpreadInput, 'width'>;
  cumulative: Omit<CumulativeInput, 'width'>;
  drivers: Omit<DriversInput, 'width'>;
  /** Panel titles as the widget prints them. */
  titles: { spread: string; cumulative: string; drivers: string };
}

/** The output a widget shows. */
export function panelOutput(r: RunResult): OutputSummary {
  return r.template === 'formula' ? r.outputs[r.outputs.length - 1] : r.outputs[0];
}

/** Shared decimals for an output's figures: two significant digits of its standard deviation (money: four significant digits). */
export function outputFormatter(o: Pick<OutputSummary, 'unit' | 'sd'>): (v: number) => string {
  if (isCurrency(o.unit) || !(o.sd && o.sd > 0)) return (v) => formatValue(v, o.unit, { significant: 4 });
  const decimals = Math.min(8, decimalsForSignificant(o.sd, 2));
  return (v) => formatValue(v, o.unit, { decimals });
}

export function panelChartInputs(r: RunResult): PanelChartInputs {
  const o = panelOutput(r);
  const f = outputFormatter(o);
  const cost = r.template === 'cost-range' ? r.cost : null;
  const l = o.limits;
  const limits: SpecLimits | undefined =
    !l || (l.lower === null && l.upper === null) ? undefined : cost ? { upper: l.upper, upperLabel: 'Budget' } : { lower: l.lower, upper: l.upper };
  const outShare = l ? { below: l.below?.p ?? 0, above: l.above?.p ?? 0 } : undefined;

  const percentiles = cost
    ? [
        { p: 0.1, value: cost.p10 },
        { p: 0.5, value: cost.p50 },
        { p: 0.8, value: cost.p80 },
        { p: 0.9, value: cost.p90 },
      ]
    : o.percentiles.filter((p) => [0.1, 0.5, 0.8, 0.9].includes(p.p)).map((p) => ({ p: p.p, value: p.value }));

  let curveMarkers: ValueMarker[] = [];
  if (cost) {
    const a = cost.analytic;
    curveMarkers =
      Math.abs(a.baseEstimate - a.sumMostLikely) <= 1e-9 * Math.max(1, Math.abs(a.sumMostLikely))
        ? [{ value: a.sumMostLikely, label: 'Base = sum of most likely', kind: 'most-likely-sum' }]
        : [
            { value: a.sumMostLikely, label: 'Sum of most likely', kind: 'most-likely-sum' },
            { value: a.baseEstimate, label: 'Base estimate', kind: 'base' },
          ];
  }

  const spreadMarkers: ValueMarker[] = cost
    ? [{ value: cost.atConfidence.value, label: `${percentileName(cost.confidence)} ${f(cost.atConfidence.value)}`, kind: 'percentile' }]
    : o.mean !== null
      ? [{ value: o.mean, label: `Mean ${f(o.mean)}`, kind: 'mean' }]
      : [];

  let outLabels: SpreadInput['outLabels'];
  if (l) {
    if (cost) outLabels = { upper: l.above ? `${formatPercent(l.above.p)} over budget` : null };
    else {
      const show = r.template === 'linear-stack' ? (p: number) => formatPpm(p * 1e6) : (p: number) => formatPercent(p);
      outLabels = { lower: l.below ? `${show(l.below.p)} below` : null, upper: l.above ? `${show(l.above.p)} above` : null };
    }
  }

  const drivers = r.stack
    ? r.stack.contributors.map((c) => ({ id: c.id, label: c.name, share: c.analyticShare, correlation: c.spearman }))
    : o.drivers.items.map((d) => ({ id: d.id, label: d.label, share: d.share, correlation: d.spearman }));

  return {
    output: o,
    spread: { bins: o.histogram, name: o.label, unit: o.unit, limits, markers: spreadMarkers, total: o.valid, outLabels, outShare },
    cumulative: { ecdf: o.ecdf, name: o.label, unit: o.unit, percentiles, markers: curveMarkers, limits, limitRanks: Boolean(cost) },
    drivers: { drivers, name: o.label, maxBars: 6 },
    titles: {
      spread: 'Spread',
      cumulative: cost ? 'S-curve' : 'Cumulative (S-curve)',
      drivers: r.stack ? `What moves the ${o.label.toLowerCase()} most` : 'What moves the result most',
    },
  };
}
