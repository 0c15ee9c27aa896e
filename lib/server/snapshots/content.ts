// What a snapshot PDF says, as plain data: the same formatting functions as the widget (headline, dial
// display, cautions), so every figure in the PDF is the text the viewer's screen showed.
import type { RunResult } from '@/lib/core/engine';
import { PERCENTILE_DEFINITION } from '@/lib/core/engine/stats';
import { setDials } from '@/lib/core/engine/set-dials';
import { DISTRIBUTION_PARAMS, type Distribution, type StochosModel } from '@/lib/core/engine/schema';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import { cautionsFor, lowTrialCaution, type Caution } from '@/lib/core/cautions';
import { formatCount, formatFixed, formatPercent, formatValue } from '@/lib/core/charts/format';
import { headlineFigure, type HeadlineFigure } from '@/lib/core/results/headline';
import { dialDisplay, type DialSpec } from '@/lib/core/widget/dial-values';
import { CHART_PANELS, type ChartPanel } from './panels';
import { compareFigures, type CompareRow } from '@/lib/core/results/compare';

export interface SnapshotMeta {
  firmName: string;
  brandColor: string;
  paperSize: 'A4' | 'Letter';
  widgetTitle: string;
  clientName: string;
  /** When the viewer asked (the PDF is dated by the request, not by the render). */
  requestedAt: string;
  versionNumber: number;
  checkState: 'unchecked' | 'signed_off' | 'sent_back';
  checkedAt: string | null;
  checkerName: string | null;
  authorName: string | null;
  panels: readonly string[];
  headline: string;
  dialIds: readonly string[];
}

export interface Table {
  title: string;
  columns: { header: string; align?: 'left' | 'right'; weight: number }[];
  rows: string[][];
  note?: string;
}

export interface SnapshotContent {
  title: string;
  firmName: string;
  brandColor: string;
  paperSize: 'A4' | 'Letter';
  clientName: string;
  dateText: string;
  versionText: string;
  dials: { label: string; value: string; unit: string }[];
  headline: HeadlineFigure | null;
  charts: ChartPanel[];
  assumptions: Table[];
  method: [string, string][];
  convergence: { output: string; verdict: string; enough: boolean }[];
  cautions: Caution[];
  trialsText: string;
  /** Present when the viewer pinned a view: its dial values and both views' figures with the difference. */
  compare: { pinnedDials: { label: string; value: string; unit: string }[]; rows: CompareRow[] } | null;
}

const DATE = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' });
const TIME = new Intl.DateTimeFormat('en-GB', { hour: '2-digit', minute: '2-digit', hourCycle: 'h23', timeZone: 'UTC' });

export function dateTimeText(iso: string): string {
  const d = new Date(iso);
  return `${DATE.format(d)}, ${TIME.format(d)} UTC`;
}
export const dateText = (iso: string) => DATE.format(new Date(iso));

/** A number as the author typed it (six significant digits, trailing zeros dropped). */
const typed = (v: number, unit = '') => formatValue(v, unit, { significant: 6, trim: true });

function distributionText(d: Distribution, unit: string): [string, string] {
  if (d.type === 'discrete') return ['Discrete', d.values.map((v, i) => `${typed(v, unit)} (${formatPercent(d.probabilities[i] ?? 0)})`).join(', ')];
  if (d.type === 'empirical' || d.type === 'drawn') {
    const n = 'data' in d && Array.isArray(d.data) ? d.data.length : 'points' in d && Array.isArray(d.points) ? d.points.length : null;
    return [d.type === 'empirical' ? 'Empirical' : 'Drawn', n !== null ? `${formatCount(n)} values` : ''];
  }
  const names: Record<string, string> = { mean: 'mean', sd: 'sd', min: 'min', max: 'max', mode: 'mode', mu: 'mu', sigma: 'sigma', rate: 'rate', shape: 'shape', scale: 'scale', p: 'p', value: 'value' };
  const unitless = new Set(['mu', 'sigma', 'rate', 'shape', 'p']);
  const parts = (DISTRIBUTION_PARAMS[d.type] ?? [])
    .filter((k) => typeof (d as Record<string, unknown>)[k] === 'number')
    .map((k) => `${names[k] ?? k} ${typed((d as unknown as Record<string, number>)[k]!, unitless.has(k) ? '' : unit)}`);
  return [d.type.charAt(0).toUpperCase() + d.type.slice(1), parts.join(', ')];
}

/** Correlated stack contributors, pair by pair (nonzero only). */
function stackCorrelationTable(m: Extract<StochosModel, { template: 'linear-stack' }>): Table[] {
  const c = m.correlation;
  if (!c) return [];
  const names = new Map(m.contributors.map((x) => [x.id, x.name]));
  const rows: string[][] = [];
  for (let i = 0; i < c.inputs.length; i++)
    for (let j = i + 1; j < c.inputs.length; j++) {
      const rho = c.matrix[i]?.[j] ?? 0;
      if (rho !== 0) rows.push([names.get(c.inputs[i]!) ?? c.inputs[i]!, names.get(c.inputs[j]!) ?? c.inputs[j]!, formatFixed(rho, 2)]);
    }
  if (!rows.length) return [];
  return [
    {
      title: 'Correlated contributors',
      columns: [
        { header: 'Contributor', weight: 3 },
        { header: 'With', weight: 3 },
        { header: 'Correlation', align: 'right', weight: 1.4 },
      ],
      rows,
      note: 'Drawn through a Gaussian copula; RSS and the normal estimate include the correlation terms.',
    },
  ];
}

function assumptionTables(m: StochosModel): Table[] {
  if (m.template === 'linear-stack') {
    const u = m.unit;
    const dist = (c: (typeof m.contributors)[number]) => {
      const d = c.distribution;
      if (d.type === 'normal') return `Normal, tolerance = ±${typed(d.k)} standard deviations`;
      if (d.type === 'empirical' || d.type === 'normal-fit') return `${d.type === 'empirical' ? 'Empirical' : 'Normal fitted'} to ${formatCount(d.data.length)} measurements`;
      return d.type === 'uniform' ? 'Uniform over the tolerance' : 'Triangular over the tolerance';
    };
    const limits = [m.limits.lower !== undefined ? `lower ${typed(m.limits.lower, u)}` : null, m.limits.upper !== undefined ? `upper ${typed(m.limits.upper, u)}` : null].filter(Boolean).join(', ');
    return [
      {
        title: 'Contributors',
        columns: [
          { header: 'Dimension', weight: 3 },
          { header: 'Nominal', align: 'right', weight: 1.6 },
          { header: 'Tolerance', align: 'right', weight: 1.8 },
          { header: 'Sense', align: 'right', weight: 0.8 },
          { header: 'Distribution', weight: 3 },
        ],
        rows: m.contributors.map((c) => [
          c.name,
          typed(c.nominal, u),
          `+${typed(c.plusTol)} / −${typed(c.minusTol)}`,
          c.direction === 1 ? '+1' : '−1',
          dist(c) + (c.meanShift ? `, mean shift ${typed(c.meanShift, u)}` : ''),
        ]),
        note: `Gap limits: ${limits}.`,
      },
      ...stackCorrelationTable(m),
    ];
  }
  if (m.template === 'cost-range') {
    const u = m.currency;
    const money = (v: number) => typed(v, u);
    const tables: Table[] = [
      {
        title: 'Line items',
        columns: [
          { header: 'Item', weight: 3.2 },
          { header: 'Distribution', weight: 1.4 },
          { header: 'Low', align: 'right', weight: 1.6 },
          { header: 'Most likely', align: 'right', weight: 1.6 },
          { header: 'High', align: 'right', weight: 1.6 },
        ],
        rows: m.items.map((i) => [i.name, cap(i.distribution), money(i.low), money(i.mostLikely), money(i.high)]),
        note: [
          m.baseEstimate !== undefined ? `Base estimate ${money(m.baseEstimate)}.` : null,
          m.budget !== undefined ? `Budget ${money(m.budget)}.` : null,
          `Confidence level P${+(m.confidence * 100).toFixed(2)}.`,
        ]
          .filter(Boolean)
          .join(' '),
      },
    ];
    if (m.riskEvents.length)
      tables.push({
        title: 'Risk events',
        columns: [
          { header: 'Risk', weight: 3.2 },
          { header: 'Probability', align: 'right', weight: 1.4 },
          { header: 'Impact low', align: 'right', weight: 1.6 },
          { header: 'Most likely', align: 'right', weight: 1.6 },
          { header: 'High', align: 'right', weight: 1.6 },
        ],
        rows: m.riskEvents.map((r) => [`${r.name} (${cap(r.impact.distribution)})`, formatPercent(r.probability), money(r.impact.low), money(r.impact.mostLikely), money(r.impact.high)]),
      });
    if (m.correlationGroups.length) {
      const names = new Map(m.items.map((i) => [i.id, i.name]));
      tables.push({
        title: 'Correlations',
        columns: [
          { header: 'Group', weight: 2 },
          { header: 'Items', weight: 5 },
          { header: 'Correlation', align: 'right', weight: 1.4 },
        ],
        rows: m.correlationGroups.map((g) => [g.name ?? g.id, g.items.map((id) => names.get(id) ?? id).join(', '), formatFixed(g.rho, 2)]),
      });
    }
    return tables;
  }
  const tables: Table[] = [
    {
      title: 'Inputs',
      columns: [
        { header: 'Input', weight: 2.6 },
        { header: 'Unit', weight: 0.8 },
        { header: 'Distribution', weight: 1.4 },
        { header: 'Parameters', weight: 4.2 },
      ],
      rows: m.inputs.map((i) => {
        const [kind, params] = distributionText(i.distribution, i.unit);
        return [i.name, i.unit || '—', kind, params];
      }),
    },
    {
      title: 'Outputs',
      columns: [
        { header: 'Output', weight: 2.6 },
        { header: 'Formula', weight: 5.2 },
        { header: 'Limits', weight: 1.8 },
      ],
      rows: m.outputs.map((o) => [
        `${o.name}${o.unit ? ` (${o.unit})` : ''}`,
        o.formula,
        [o.lower !== undefined ? `min ${typed(o.lower, o.unit)}` : null, o.upper !== undefined ? `max ${typed(o.upper, o.unit)}` : null].filter(Boolean).join(', ') || '—',
      ]),
    },
  ];
  const c = m.correlation;
  if (c) {
    const names = new Map(m.inputs.map((i) => [i.id, i.name]));
    const rows: string[][] = [];
    for (let i = 0; i < c.inputs.length; i++)
      for (let j = i + 1; j < c.inputs.length; j++) {
        const rho = c.matrix[i]?.[j] ?? 0;
        if (rho !== 0) rows.push([names.get(c.inputs[i]!) ?? c.inputs[i]!, names.get(c.inputs[j]!) ?? c.inputs[j]!, formatFixed(rho, 2)]);
      }
    tables.push({
      title: 'Correlations',
      columns: [
        { header: 'Input', weight: 3 },
        { header: 'With', weight: 3 },
        { header: 'Correlation', align: 'right', weight: 1.4 },
      ],
      rows,
      note: rows.length ? undefined : 'The inputs are sampled independently.',
    });
  }
  return tables;
}

const cap = (s: string) => (s === 'pert' ? 'PERT' : s.charAt(0).toUpperCase() + s.slice(1));

const DESIGN: Record<string, string> = { 'monte-carlo': 'Simple random sampling (Monte Carlo)', 'latin-hypercube': 'Latin hypercube sampling (McKay, Beckman & Conover 1979)' };
const NORMAL: Record<string, string> = { 'box-muller': 'Box–Muller transform (Box & Muller 1958)', ziggurat: 'Ziggurat method (Marsaglia & Tsang 2000)' };
const CORR: Record<string, string> = { copula: 'Gaussian copula', 'iman-conover': 'Rank correlation by Iman & Conover (1982)' };

/**
 * The PDF's content from a run of the widget's model with the viewer's dial values. The run has checked the model
 * with exactly these dial values applied, so they are written into the tables without checking it again.
 */
export function snapshotContent(model: CheckedModel, result: RunResult, meta: SnapshotMeta, pinned: RunResult | null = null): SnapshotContent {
  const applied = setDials(model, result.run.dialValues, null).model;
  const byId = new Map(model.dials.map((d) => [d.id, d]));
  const dialsOf = (r: RunResult) =>
    meta.dialIds.flatMap((id) => {
      const d = byId.get(id);
      if (!d) return [];
      const spec: DialSpec = { id: d.id, label: d.label, unit: d.unit, min: d.min, max: d.max, step: d.step, default: d.default };
      const v = r.run.dialValues[id] ?? d.default;
      return [{ label: d.label, value: dialDisplay(spec, v), unit: d.unit }];
    });
  const dials = dialsOf(result);
  const panels = meta.panels.filter((p) => p === 'headline' || (CHART_PANELS as readonly string[]).includes(p));
  const low = lowTrialCaution(result.outputs);
  const signOff =
    meta.checkState === 'signed_off' && meta.checkedAt
      ? `checked and signed off${meta.checkerName ? ` by ${meta.checkerName}` : ''} on ${dateText(meta.checkedAt)}`
      : 'not signed off by a checker';
  return {
    title: meta.widgetTitle,
    firmName: meta.firmName,
    brandColor: meta.brandColor,
    paperSize: meta.paperSize,
    clientName: meta.clientName,
    dateText: dateTimeText(meta.requestedAt),
    versionText: `Version ${meta.versionNumber} · ${signOff}${meta.authorName ? ` · model by ${meta.authorName}` : ''}`,
    dials,
    // The headline is printed even when the widget hides its panel: the e-mail and the PDF lead with it.
    headline: headlineFigure(result, meta.headline),
    charts: panels.filter((p): p is ChartPanel => p !== 'headline'),
    assumptions: assumptionTables(applied),
    method: [
      ['Sampling design', DESIGN[result.run.design] ?? result.run.design],
      ['Trials', formatCount(result.run.trials)],
      ['Seed', String(result.run.seed)],
      ['Normal variates', NORMAL[result.run.normalMethod] ?? result.run.normalMethod],
      ['Correlation', CORR[result.run.correlationMethod] ?? result.run.correlationMethod],
      ['Random numbers', result.run.rng],
      ['Percentiles', PERCENTILE_DEFINITION.text],
      ['Engine', `${result.engine}, the same engine and settings as the widget in the browser`],
    ],
    convergence: result.outputs.map((o) => ({ output: o.label, verdict: o.convergence.verdict, enough: o.convergence.enough })),
    cautions: [...(low ? [low] : []), ...cautionsFor(model.template)],
    trialsText: `${formatCount(result.run.trials)} trials`,
    compare: pinned ? { pinnedDials: dialsOf(pinned), rows: compareFigures(pinned, result, meta.headline) } : null,
  };
}
