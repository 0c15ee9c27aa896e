// Two views of one model drawn over each other: the pinned view and the current one. The S-curves and the
// spreads are told apart by line style and a legend, never by colour alone: the current view solid and blue,
// the pinned view dashed and dark, each named in the legend and in the text alternative. Pure geometry: the
// widget draws the scene as SVG, the PDF snapshot through svg-string.ts.
import { coveringDomain, linear, linearAxis, makeBox, percentAxis, xTickCount, yTickCount } from './axis';
import { ecdfAt, quantileAt, thinEcdf, type EcdfPoints } from './cumulative';
import { axesNodes, translate } from './frame';
import { linePath } from './polyline';
import { formatPercent, formatValue } from './format';
import { chartColors } from './palette';
import { r2, textWidth, type Scene, type SceneNode } from './scene';
import type { HistogramBin, SpecLimits } from './spread';

export interface CompareSeries {
  /** "Pinned view" / "Current view". */
  label: string;
  ecdf: EcdfPoints;
  bins: readonly HistogramBin[];
}

export interface CompareInput {
  pinned: CompareSeries;
  current: CompareSeries;
  /** Output name ("Gap", "Total cost"). */
  name: string;
  unit?: string | null;
  limits?: SpecLimits;
  width: number;
  /** What the bars count, plural (default 'trials'). */
  noun?: string;
}

/** The two styles: the only difference between the series besides the legend text. */
export const COMPARE_STYLES = {
  current: { stroke: chartColors.series, width: 2.25, dash: undefined as string | undefined, legend: 'solid line' },
  pinned: { stroke: chartColors.strong, width: 2, dash: '7 4', legend: 'dashed line' },
} as const;

const LEGEND_ROW = 22;

/** The legend: a line sample and its name per series, on one row when it fits the width, else one row each. */
function legend(input: CompareInput, width: number): { nodes: SceneNode[]; height: number } {
  const items = (['current', 'pinned'] as const).map((key) => ({ key, s: COMPARE_STYLES[key], label: `${input[key].label} (${COMPARE_STYLES[key].legend})` }));
  const itemWidth = (label: string) => 34 + textWidth(label, 11.5, 'sans') + 22;
  const oneRow = items.reduce((w, i) => w + itemWidth(i.label), 0) <= width;
  const nodes: SceneNode[] = [];
  let x = 0;
  let y = 9;
  for (const { key, s, label } of items) {
    nodes.push({ type: 'line', key: `lg-${key}`, x1: x, x2: x + 28, y1: y, y2: y, stroke: s.stroke, strokeWidth: s.width + 0.5, dash: s.dash });
    nodes.push({ type: 'text', key: `lgt-${key}`, x: x + 34, y, text: label, font: 'sans', size: 11.5, fill: chartColors.strong, baseline: 'middle', weight: 500 });
    if (oneRow) x += itemWidth(label);
    else y += LEGEND_ROW;
  }
  return { nodes, height: oneRow ? LEGEND_ROW + 4 : 2 * LEGEND_ROW + 4 };
}

function limitNodes(limits: SpecLimits | undefined, x: (v: number) => number, h: number, domain: [number, number]): SceneNode[] {
  const out: SceneNode[] = [];
  for (const [side, v] of [['lower', limits?.lower], ['upper', limits?.upper]] as const) {
    if (v == null || v < domain[0] || v > domain[1]) continue;
    out.push({ type: 'line', key: `lim-${side}`, x1: r2(x(v)), x2: r2(x(v)), y1: 0, y2: h, stroke: chartColors.limit, strokeWidth: 1.5, dash: '2 3' });
  }
  return out;
}

function domainOf(input: CompareInput): [number, number] {
  const xs: number[] = [];
  for (const s of [input.pinned, input.current]) {
    if (s.ecdf.length) xs.push(s.ecdf[0]!.x, s.ecdf[s.ecdf.length - 1]!.x);
    if (s.bins.length) xs.push(s.bins[0]!.x0, s.bins[s.bins.length - 1]!.x1);
  }
  for (const v of [input.limits?.lower, input.limits?.upper]) if (v != null && Number.isFinite(v)) xs.push(v);
  return coveringDomain(xs.filter(Number.isFinite), 0.03);
}

/** Both S-curves on one set of axes, with P10/P50/P90 of each named in the text alternative. */
export function compareCurvesScene(input: CompareInput): Scene {
  const width = Math.max(260, input.width);
  const lg = legend(input, width - 12);
  const margin = { top: lg.height + 8, right: 16, bottom: 46, left: 58 };
  const plotHeight = Math.max(180, Math.min(300, Math.round(width * 0.42)));
  const box = makeBox(width, plotHeight + margin.top + margin.bottom, margin);
  const xDomain = domainOf(input);
  const x = linear(xDomain, [0, box.innerWidth]);
  const y = linear([0, 1], [box.innerHeight, 0]);
  const nodes: SceneNode[] = [];
  const axes = axesNodes(box, linearAxis(x, xTickCount(box.innerWidth, input.unit), input.name, input.unit), percentAxis(y, yTickCount(box.innerHeight), 'Chance of not exceeding'));
  nodes.push(...axes, ...limitNodes(input.limits, x, box.innerHeight, xDomain));
  // Pinned first, current on top: where the curves coincide the solid line shows, the dashes stay visible beside it.
  for (const key of ['pinned', 'current'] as const) {
    const s = COMPARE_STYLES[key];
    const pts = thinEcdf(input[key].ecdf, xDomain[1] - xDomain[0], box.innerWidth);
    if (pts.length) nodes.push({ type: 'path', key: `curve-${key}`, d: linePath(pts.map((d) => [r2(x(d.value)), r2(y(d.p))] as const)), stroke: s.stroke, strokeWidth: s.width, dash: s.dash, strokeLinejoin: 'round' });
  }
  // The legend starts at the chart's left edge, above the plot.
  nodes.push({ type: 'group', key: 'legend', children: lg.nodes, dx: -margin.left + 8, dy: -lg.height - 4 });
  return {
    width: box.width,
    height: box.height,
    title: `S-curves of ${input.name}: ${input.current.label.toLowerCase()} and ${input.pinned.label.toLowerCase()}`,
    description: describeCurves(input),
    background: chartColors.background,
    patterns: [],
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}

/** P10, P50 and P90 of a series read off its curve. */
export function seriesPercentiles(s: CompareSeries): { p: number; value: number }[] {
  const pts = s.ecdf.map((d) => ({ value: d.x, p: d.p }));
  return pts.length ? [0.1, 0.5, 0.9].map((p) => ({ p, value: quantileAt(pts, p) })) : [];
}

function describeCurves(input: CompareInput): string {
  const f = (v: number) => formatValue(v, input.unit ?? null, { significant: 4 });
  const part = (key: 'current' | 'pinned') => {
    const q = seriesPercentiles(input[key]);
    return `${input[key].label} (${COMPARE_STYLES[key].legend}): ${q.map((m) => `P${Math.round(m.p * 100)} ${f(m.value)}`).join(', ')}`;
  };
  let text = `S-curves of ${input.name} for two views. ${part('current')}. ${part('pinned')}.`;
  const lim = input.limits?.upper ?? input.limits?.lower;
  if (lim != null) {
    const at = (key: 'current' | 'pinned') => ecdfAt(input[key].ecdf.map((d) => ({ value: d.x, p: d.p })), lim);
    text += ` At ${f(lim)}: ${formatPercent(at('current'))} of the current view and ${formatPercent(at('pinned'))} of the pinned view do not exceed it.`;
  }
  return text;
}

/** Both spreads as outlines of the share of trials per common bin width (bins of the two runs can differ). */
export function compareSpreadsScene(input: CompareInput): Scene {
  const noun = input.noun ?? 'trials';
  const width = Math.max(260, input.width);
  const lg = legend(input, width - 12);
  const margin = { top: lg.height + 8, right: 16, bottom: 46, left: 58 };
  const plotHeight = Math.max(160, Math.min(260, Math.round(width * 0.36)));
  const box = makeBox(width, plotHeight + margin.top + margin.bottom, margin);
  const xDomain = domainOf(input);
  const x = linear(xDomain, [0, box.innerWidth]);
  const widths = input.current.bins.map((b) => b.x1 - b.x0).filter((w) => w > 0).sort((a, b) => a - b);
  const ref = widths.length ? widths[Math.floor(widths.length / 2)]! : 1;
  const shares = (s: CompareSeries) => {
    const total = s.bins.reduce((t, b) => t + b.count, 0) || 1;
    return s.bins.map((b) => ({ x0: b.x0, x1: b.x1, v: b.x1 > b.x0 ? ((b.count / total) * ref) / (b.x1 - b.x0) : b.count / total }));
  };
  const series = { current: shares(input.current), pinned: shares(input.pinned) };
  const yMax = Math.max(1e-9, ...series.current.map((b) => b.v), ...series.pinned.map((b) => b.v)) * 1.08;
  const y = linear([0, yMax], [box.innerHeight, 0]);
  const nodes: SceneNode[] = [];
  const perText = `Share of ${noun} per ${formatValue(ref, input.unit ?? null, { significant: 3 })}`;
  nodes.push(...axesNodes(box, linearAxis(x, xTickCount(box.innerWidth, input.unit), input.name, input.unit), percentAxis(y, yTickCount(box.innerHeight), perText)));
  nodes.push(...limitNodes(input.limits, x, box.innerHeight, xDomain));
  // The current view also gets a light fill, so the two outlines never read as one shape.
  for (const key of ['current', 'pinned'] as const) {
    const s = COMPARE_STYLES[key];
    const bars = series[key];
    if (!bars.length) continue;
    let d = `M${r2(x(bars[0]!.x0))},${r2(y(0))}`;
    for (const b of bars) d += `V${r2(y(b.v))}H${r2(x(b.x1))}`;
    d += `V${r2(y(0))}`;
    if (key === 'current') nodes.push({ type: 'path', key: 'fill-current', d: `${d}Z`, fill: chartColors.seriesTint, opacity: 0.7 });
    nodes.push({ type: 'path', key: `step-${key}`, d, stroke: s.stroke, strokeWidth: s.width - 0.5, dash: s.dash, strokeLinejoin: 'miter' });
  }
  // The legend starts at the chart's left edge, above the plot.
  nodes.push({ type: 'group', key: 'legend', children: lg.nodes, dx: -margin.left + 8, dy: -lg.height - 4 });
  const f = (v: number) => formatValue(v, input.unit ?? null, { significant: 4 });
  const range = (s: CompareSeries) => (s.bins.length ? `${f(s.bins[0]!.x0)} to ${f(s.bins[s.bins.length - 1]!.x1)}` : 'no values');
  return {
    width: box.width,
    height: box.height,
    title: `Spreads of ${input.name}: ${input.current.label.toLowerCase()} and ${input.pinned.label.toLowerCase()}`,
    description: `Histograms of ${input.name} drawn as outlines. ${input.current.label} (${COMPARE_STYLES.current.legend}, shaded) spans ${range(input.current)}; ${input.pinned.label} (${COMPARE_STYLES.pinned.legend}) spans ${range(input.pinned)}.`,
    background: chartColors.background,
    patterns: [],
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}
