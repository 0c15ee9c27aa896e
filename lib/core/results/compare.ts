// Two views of one widget side by side (a pinned view and the current one): the figures a client compares,
// with the difference, as text. The widget and the PDF snapshot print exactly these strings.
import type { RunResult } from '@/lib/core/engine';
import { formatFixed, formatPercent, formatPpm } from '@/lib/core/charts/format';
import { HEADLINES } from '@/lib/core/models/widget-options';
import { headlineFigure } from './headline';
import { outputFormatter, panelChartInputs, panelOutput } from './chart-inputs';
import type { CompareInput } from '@/lib/core/charts/compare';

export interface CompareRow {
  id: string;
  label: string;
  pinned: string;
  current: string;
  /** Current minus pinned, signed, in the figure's unit ("—" when either is missing). */
  difference: string;
}

type Kind = 'value' | 'ppm' | 'percent' | 'index';

/** The raw number behind a headline figure and how to print a difference of two of them. */
function figureNumber(r: RunResult, id: string): { v: number | null; kind: Kind } {
  if (r.template === 'linear-stack' && r.stack) {
    const mc = r.stack.monteCarlo;
    if (id === 'ppk') return { v: mc.ppk, kind: 'index' };
    if (id === 'mean') return { v: mc.mean, kind: 'value' };
    if (id === 'sd') return { v: mc.sd, kind: 'value' };
    return { v: mc.ppmObserved, kind: 'ppm' };
  }
  if (r.template === 'cost-range' && r.cost) {
    const c = r.cost;
    if (id === 'contingency') return { v: c.contingency, kind: 'value' };
    if (id === 'exceed-budget') return { v: c.exceedBudget ? c.exceedBudget.p : null, kind: 'percent' };
    if (id === 'p50') return { v: c.p50, kind: 'value' };
    if (id === 'p90') return { v: c.p90, kind: 'value' };
    return { v: c.atConfidence.value, kind: 'value' };
  }
  const o = r.outputs[r.outputs.length - 1]!;
  const pv = (p: number) => o.percentiles.find((x) => Math.abs(x.p - p) < 1e-9)?.value ?? null;
  if (id === 'p50') return { v: pv(0.5), kind: 'value' };
  if (id === 'p90') return { v: pv(0.9), kind: 'value' };
  if (id === 'outside-limits') return { v: o.limits ? o.limits.outside.p : null, kind: 'percent' };
  return { v: o.mean, kind: 'value' };
}

const MINUS = '\u2212';

function signed(text: string, d: number): string {
  if (d === 0) return `±${text.replace(/^[-\u2212+]/, '')}`;
  const bare = text.replace(/^[-\u2212+]/, '');
  return `${d > 0 ? '+' : MINUS}${bare}`;
}

/** Current minus pinned, printed with the figure's own formatting. */
function differenceText(a: number | null, b: number | null, kind: Kind, r: RunResult): string {
  if (a === null || b === null || !Number.isFinite(a) || !Number.isFinite(b)) return '—';
  const d = b - a;
  const mag = Math.abs(d);
  if (kind === 'ppm') return signed(formatPpm(mag), d);
  if (kind === 'percent') return `${signed(formatPercent(mag), d)} points`;
  if (kind === 'index') return signed(formatFixed(mag, 2), d);
  const f = outputFormatter(panelOutput(r));
  return signed(f(mag), d);
}

/** Every headline figure of the template, the widget's own headline first, for both views. */
export function compareFigures(pinned: RunResult, current: RunResult, headline: string): CompareRow[] {
  const ids = HEADLINES[current.template].map((h) => h.id);
  const first = ids.includes(headline) ? headline : ids[0]!;
  return [first, ...ids.filter((i) => i !== first)].map((id) => {
    const a = headlineFigure(pinned, id);
    const b = headlineFigure(current, id);
    const na = figureNumber(pinned, id);
    const nb = figureNumber(current, id);
    return { id, label: b.label, pinned: a.value, current: b.value, difference: differenceText(na.v, nb.v, nb.kind, current) };
  });
}

export const PINNED_LABEL = 'Pinned view';
export const CURRENT_LABEL = 'Current view';

/** The inputs of the two overlay charts; the widget and the PDF snapshot draw the same. */
export function compareInput(pinned: RunResult, current: RunResult, width: number): CompareInput {
  const p = panelChartInputs(pinned);
  const c = panelChartInputs(current);
  return {
    pinned: { label: PINNED_LABEL, ecdf: p.cumulative.ecdf, bins: p.spread.bins },
    current: { label: CURRENT_LABEL, ecdf: c.cumulative.ecdf, bins: c.spread.bins },
    name: c.output.label,
    unit: c.output.unit,
    limits: c.spread.limits,
    width,
  };
}
