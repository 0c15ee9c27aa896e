// The chart inputs of a widget's panels, built as components/widget/widget-panels.tsx builds them for the
// browser, so the PDF draws the same geometry. (That file is a client component; these are the same rules as
// pure functions, checked against each other in tests/unit/snapshots.)
import type { OutputSummary, RunResult } from '@/lib/engine';
import type { SpecLimits, ValueMarker, SpreadInput } from '@/lib/charts/spread';
import type { CumulativeInput } from '@/lib/charts/cumulative';
import type { DriversInput } from '@/lib/charts/drivers';
import { decimalsForSignificant, formatPercent, formatPpm, formatValue, isCurrency } from '@/lib/charts/format';

export type ChartPanel = 'spread' | 'cumulative' | 'drivers';
export const CHART_PANELS: readonly ChartPanel[] = ['spread', 'cumulative', 'drivers'];

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

export interface PanelSpec {
  panel: ChartPanel;
  title: string;
  input: SpreadInput | CumulativeInput | DriversInput;
}

/** One chart panel's title and geometry input at the given width. */
export function panelSpec(r: RunResult, panel: ChartPanel, width: number): PanelSpec {
  const o = widgetOutput(r);
  const limits = limitsOf(r, o);
  const cost = r.template === 'cost-range' ? r.cost : null;
  const f = format(o);
  if (panel === 'spread') {
    const markers: ValueMarker[] = cost
      ? [{ value: cost.atConfidence.value, label: `P${Math.round(cost.confidence * 100)} ${f(cost.atConfidence.value)}`, kind: 'percentile' }]
      : o.mean !== null
        ? [{ value: o.mean, label: `Mean ${f(o.mean)}`, kind: 'mean' }]
        : [];
    const l = o.limits;
    let outLabels: SpreadInput['outLabels'];
    if (l) {
      if (cost) outLabels = { upper: l.above ? `${formatPercent(l.above.p)} over budget` : null };
      else {
        const show = r.template === 'linear-stack' ? (p: number) => formatPpm(p * 1e6) : (p: number) => formatPercent(p);
        outLabels = { lower: l.below ? `${show(l.below.p)} below` : null, upper: l.above ? `${show(l.above.p)} above` : null };
      }
    }
    const outShare = l ? { below: l.below?.p ?? 0, above: l.above?.p ?? 0 } : undefined;
    return { panel, title: 'Spread', input: { bins: o.histogram, name: o.label, unit: o.unit, limits, markers, total: o.valid, width, outLabels, outShare } };
  }
  if (panel === 'cumulative') {
    const percentiles = cost
      ? [0.1, 0.5, 0.8, 0.9].map((p) => ({ p, value: p === 0.1 ? cost.p10 : p === 0.5 ? cost.p50 : p === 0.8 ? cost.p80 : cost.p90 }))
      : o.percentiles.filter((p) => [0.1, 0.5, 0.9].includes(p.p)).map((p) => ({ p: p.p, value: p.value }));
    let markers: ValueMarker[] = [];
    if (cost) {
      const a = cost.analytic;
      markers =
        Math.abs(a.baseEstimate - a.sumMostLikely) <= 1e-9 * Math.max(1, Math.abs(a.sumMostLikely))
          ? [{ value: a.sumMostLikely, label: 'Base = sum of most likely', kind: 'most-likely-sum' }]
          : [
              { value: a.sumMostLikely, label: 'Sum of most likely', kind: 'most-likely-sum' },
              { value: a.baseEstimate, label: 'Base estimate', kind: 'base' },
            ];
    }
    return {
      panel,
      title: cost ? 'S-curve' : 'Cumulative (S-curve)',
      input: { ecdf: o.ecdf, name: o.label, unit: o.unit, percentiles, markers, limits, limitRanks: Boolean(cost), width },
    };
  }
  const drivers = r.stack
    ? r.stack.contributors.map((c) => ({ id: c.id, label: c.name, share: c.analyticShare, correlation: c.spearman }))
    : o.drivers.items.map((d) => ({ id: d.id, label: d.label, share: d.share, correlation: d.spearman }));
  return { panel, title: r.stack ? 'What moves the gap most' : 'What moves the result most', input: { drivers, name: o.label, width, maxBars: 6 } };
}
