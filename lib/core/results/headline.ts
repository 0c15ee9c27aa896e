// The one figure a client asks for (a widget's "headline"), read from a run. Ids are those the
// publishing form offers (lib/core/models/widget-options.ts); the widget and the PDF snapshot print the same text.
import type { OutputSummary, RunResult } from '@/lib/core/engine';
import { formatFixed, formatPercent, formatPpm, formatValue, percentileName } from '@/lib/core/charts/format';
import { outputFormatter } from './chart-inputs';

export interface HeadlineFigure {
  id: string;
  /** What the number is, in words ("Cost at P80"). */
  label: string;
  /** The number with its unit. */
  value: string;
  /** Interval or context, or null. */
  sub: string | null;
  /** Glossary term the label leans on, for an explanation on hover or focus. */
  term: 'ppm' | 'Ppk' | 'P50' | 'P80' | 'P90' | 'contingency' | null;
}

/** The output's shared formatter, printing '—' for missing values. */
function fmt(unit: string, sd: number | null): (v: number | null | undefined) => string {
  const f = outputFormatter({ unit, sd });
  return (v) => (v == null ? '—' : f(v));
}

const typed = (v: number, unit: string) => formatValue(v, unit, { significant: 6, trim: true });

function pValue(o: OutputSummary, p: number): number | null {
  return o.percentiles.find((x) => Math.abs(x.p - p) < 1e-9)?.value ?? null;
}

/**
 * What the normal estimate of ppm assumes and why it differs from the count: it treats the gap as normal with the
 * simulated mean and standard deviation, so it reads the tails of a bell curve, while the count reads the
 * simulated gap's own tails (uniform, triangular or shifted contributors make them shorter or longer).
 */
export function normalEstimateNote(observed: number | null, normal: number | null): string | null {
  if (normal === null) return null;
  const head = `a normal gap with this mean and standard deviation would give ${formatPpm(normal)}`;
  if (observed === null) return head;
  const hi = Math.max(observed, normal);
  const lo = Math.min(observed, normal);
  // Within a fifth (or a few ppm) the two agree well enough to say so.
  if (hi - lo <= Math.max(0.2 * hi, 5)) return `${head}, close to the count: the simulated gap is near normal`;
  return normal > observed
    ? `${head}; the count is lower because the simulated gap’s tails are shorter than a bell curve’s (bounded contributors such as uniform or triangular ones)`
    : `${head}; the count is higher because the simulated gap’s tails are longer than a bell curve’s (skewed or shifted contributors)`;
}

function lower(s: string): string {
  return s.charAt(0).toLowerCase() + s.slice(1);
}

function stackHeadline(r: RunResult, id: string): HeadlineFigure {
  const s = r.stack!;
  const gap = r.outputs[0];
  const f = fmt(gap.unit, gap.sd);
  const mc = s.monteCarlo;
  const name = lower(gap.label);
  switch (id) {
    case 'ppk':
      return {
        id,
        label: `Ppk of the ${name}`,
        value: mc.ppk !== null ? formatFixed(mc.ppk, 2) : '—',
        sub: `${mc.pp !== null ? `Pp ${formatFixed(mc.pp, 2)}; ` : ''}1.33 is a common minimum`,
        term: 'Ppk',
      };
    case 'mean':
      return { id, label: `Mean ${name}`, value: f(mc.mean), sub: `standard deviation ${mc.sd !== null ? formatValue(mc.sd, gap.unit, { significant: 3 }) : '—'}`, term: null };
    case 'sd':
      return { id, label: `Standard deviation of the ${name}`, value: mc.sd !== null ? formatValue(mc.sd, gap.unit, { significant: 3 }) : '—', sub: `mean ${f(mc.mean)}`, term: null };
    case 'ppm':
    default:
      return {
        id: 'ppm',
        label: 'Assemblies out of specification',
        value: mc.ppmObserved !== null ? formatPpm(mc.ppmObserved) : '—',
        sub:
          (mc.ppmObservedCi ? `95 % interval ${formatPpm(mc.ppmObservedCi.low)} to ${formatPpm(mc.ppmObservedCi.high)}` : '') +
          (mc.ppmNormal !== null ? `${mc.ppmObservedCi ? ' · ' : ''}${normalEstimateNote(mc.ppmObserved, mc.ppmNormal)}` : ''),
        term: 'ppm',
      };
  }
}

function costHeadline(r: RunResult, id: string): HeadlineFigure {
  const c = r.cost!;
  const a = c.analytic;
  const u = a.currency;
  const money = (v: number) => formatValue(v, u, { significant: 4 });
  const conf = percentileName(c.confidence);
  const confTerm = conf === 'P50' || conf === 'P80' || conf === 'P90' ? conf : null;
  switch (id) {
    case 'contingency':
      return {
        id,
        label: `Contingency to ${conf}`,
        value: money(c.contingency),
        sub: `over the base estimate ${typed(a.baseEstimate, u)}${c.contingencyShareOfBase !== null ? ` (${formatPercent(c.contingencyShareOfBase)})` : ''}`,
        term: 'contingency',
      };
    case 'exceed-budget':
      return c.exceedBudget && a.budget !== null
        ? {
            id,
            label: `Chance of exceeding the budget of ${typed(a.budget, u)}`,
            value: formatPercent(c.exceedBudget.p),
            sub: `95 % interval ${formatPercent(c.exceedBudget.ci.low)} to ${formatPercent(c.exceedBudget.ci.high)}`,
            term: null,
          }
        : { id, label: 'Chance of exceeding the budget', value: '—', sub: 'The model sets no budget', term: null };
    case 'p50':
      return { id, label: 'P50 cost', value: money(c.p50), sub: 'an even chance of coming in below or above', term: 'P50' };
    case 'p90':
      return { id, label: 'P90 cost', value: money(c.p90), sub: 'a 90 % chance of not being exceeded', term: 'P90' };
    case 'at-confidence':
    default:
      return {
        id: 'at-confidence',
        label: `Cost at ${conf}`,
        value: money(c.atConfidence.value),
        sub: `contingency ${money(c.contingency)} over the base estimate ${typed(a.baseEstimate, u)}`,
        term: confTerm,
      };
  }
}

function formulaHeadline(r: RunResult, id: string): HeadlineFigure {
  const o = r.outputs[r.outputs.length - 1];
  const f = fmt(o.unit, o.sd);
  const name = lower(o.label);
  switch (id) {
    case 'p50':
      return { id, label: `P50 ${name}`, value: f(pValue(o, 0.5)), sub: 'half the trials fall below it', term: 'P50' };
    case 'p90':
      return { id, label: `P90 ${name}`, value: f(pValue(o, 0.9)), sub: 'a 90 % chance of not being exceeded', term: 'P90' };
    case 'outside-limits':
      return o.limits
        ? {
            id,
            label: `Chance the ${name} is outside its limits`,
            value: formatPercent(o.limits.outside.p),
            sub: `95 % interval ${formatPercent(o.limits.outside.ci.low)} to ${formatPercent(o.limits.outside.ci.high)}`,
            term: null,
          }
        : { id, label: `Chance the ${name} is outside its limits`, value: '—', sub: 'The output has no limits', term: null };
    case 'mean':
    default:
      return { id: 'mean', label: `Mean ${name}`, value: f(o.mean), sub: `P10 to P90: ${f(pValue(o, 0.1))} to ${f(pValue(o, 0.9))}`, term: null };
  }
}

/** The headline figure `id` of a run; an unknown id falls back to the template's first figure. */
export function headlineFigure(r: RunResult, id: string): HeadlineFigure {
  if (r.template === 'linear-stack' && r.stack) return stackHeadline(r, id);
  if (r.template === 'cost-range' && r.cost) return costHeadline(r, id);
  return formulaHeadline(r, id);
}
