import { argsort } from '@/lib/core/engine/sort';
import { coveringDomain, linear, linearAxis, makeBox, xTickCount, yTickCount, type Axis, type Box } from './axis';
import { axesNodes, translate, type SceneText } from './frame';
import { formatPercent, formatValue } from './format';
import { chartColors } from './palette';
import { r2, type Scene, type SceneNode } from './scene';
import { outPatterns, PATTERN_OUT_ZONE, type SpecLimits } from './spread';

export interface ScatterInput {
  /** The input's sampled values, one per trial. */
  x: ArrayLike<number>;
  /** The output's values, same trials in the same order. */
  y: ArrayLike<number>;
  xName: string;
  xUnit?: string | null;
  yName: string;
  yUnit?: string | null;
  /** Limits on the output (horizontal lines, hatched beyond). */
  limits?: SpecLimits;
  width: number;
  plotHeight?: number;
  /** At most this many points are drawn (default 1500). */
  maxPoints?: number;
}

export interface ScatterPoint {
  i: number;
  xv: number;
  yv: number;
  px: number;
  py: number;
  out: boolean;
}

export interface ScatterGeometry {
  box: Box;
  points: ScatterPoint[];
  /** Trials available and trials drawn. */
  total: number;
  drawn: number;
  limitLines: Array<{ side: 'lower' | 'upper'; value: number; y: number; label: string }>;
  outRegions: Array<{ side: 'lower' | 'upper'; y: number; height: number }>;
  xAxis: Axis;
  yAxis: Axis;
  xName: string;
  yName: string;
  xUnit: string | null;
  yUnit: string | null;
}

/**
 * Indices of an evenly strided subsample of n trials, at most `max` of them. Trials are exchangeable,
 * so a stride is an unbiased sample, and it is deterministic (no random choice, same picture every time).
 */
export function downsampleIndices(n: number, max: number): number[] {
  if (n <= 0 || max <= 0) return [];
  if (n <= max) return Array.from({ length: n }, (_, i) => i);
  const out: number[] = [];
  for (let k = 0; k < max; k++) out.push(Math.floor((k * n) / max));
  return out;
}

function isOut(v: number, limits: SpecLimits | undefined): boolean {
  if (!limits) return false;
  return (limits.lower != null && v < limits.lower) || (limits.upper != null && v > limits.upper);
}

export function scatterGeometry(input: ScatterInput): ScatterGeometry {
  const width = Math.max(240, input.width);
  const xUnit = input.xUnit ?? null;
  const yUnit = input.yUnit ?? null;
  const n = Math.min(input.x.length, input.y.length);
  const idx = downsampleIndices(n, input.maxPoints ?? 1500).filter((i) => Number.isFinite(input.x[i]) && Number.isFinite(input.y[i]));
  const xs = idx.map((i) => input.x[i]);
  const ys = idx.map((i) => input.y[i]);
  const lower = input.limits?.lower ?? null;
  const upper = input.limits?.upper ?? null;
  const margin = { top: 14, right: 16, bottom: 46, left: 64 };
  const plotHeight = input.plotHeight ?? Math.max(190, Math.min(300, Math.round(width * 0.45)));
  const box = makeBox(width, plotHeight + margin.top + margin.bottom, margin);
  const x = linear(coveringDomain(xs, 0.04), [0, box.innerWidth]);
  const y = linear(coveringDomain([...ys, ...(lower !== null ? [lower] : []), ...(upper !== null ? [upper] : [])], 0.06), [box.innerHeight, 0]);

  const points: ScatterPoint[] = idx.map((i, k) => ({ i, xv: xs[k], yv: ys[k], px: x(xs[k]), py: y(ys[k]), out: isOut(ys[k], input.limits) }));
  const limitLines: ScatterGeometry['limitLines'] = [];
  const outRegions: ScatterGeometry['outRegions'] = [];
  if (lower !== null) {
    limitLines.push({ side: 'lower', value: lower, y: y(lower), label: `${input.limits?.lowerLabel ?? 'Lower limit'} ${formatValue(lower, yUnit, { significant: 6, trim: true })}` });
    if (y(lower) < box.innerHeight) outRegions.push({ side: 'lower', y: y(lower), height: box.innerHeight - y(lower) });
  }
  if (upper !== null) {
    limitLines.push({ side: 'upper', value: upper, y: y(upper), label: `${input.limits?.upperLabel ?? 'Upper limit'} ${formatValue(upper, yUnit, { significant: 6, trim: true })}` });
    if (y(upper) > 0) outRegions.push({ side: 'upper', y: 0, height: y(upper) });
  }

  return {
    box,
    points,
    total: n,
    drawn: points.length,
    limitLines,
    outRegions,
    xAxis: linearAxis(x, xTickCount(box.innerWidth, xUnit), input.xName, xUnit),
    yAxis: linearAxis(y, yTickCount(box.innerHeight), input.yName, yUnit),
    xName: input.xName,
    yName: input.yName,
    xUnit,
    yUnit,
  };
}

export interface ScatterGroup {
  from: number;
  to: number;
  trials: number;
  meanY: number;
  outShare: number;
}

const ordersByColumn = new WeakMap<object, { n: number; order: Uint32Array }>();

/** Indices i < n of the finite x values, ascending by x (ties in index order): a radix argsort, cached per column. */
function orderByX(xv: ArrayLike<number>, n: number): Uint32Array {
  // Only typed arrays (the engine's columns, never edited) are cached.
  const cache = ArrayBuffer.isView(xv);
  const kept = cache ? ordersByColumn.get(xv) : undefined;
  if (kept && kept.n === n) return kept.order;
  const finite: number[] = [];
  for (let i = 0; i < n; i++) if (Number.isFinite(xv[i])) finite.push(i);
  const values = Float64Array.from(finite, (i) => xv[i]);
  const order = argsort(values).map((k) => finite[k]);
  if (cache) ordersByColumn.set(xv, { n, order });
  return order;
}

/** The table behind a scatter: the input split into equal-count groups, with the output's mean and share beyond the limits in each. */
export function scatterGroups(xv: ArrayLike<number>, yv: ArrayLike<number>, limits?: SpecLimits, groups = 10): ScatterGroup[] {
  const n = Math.min(xv.length, yv.length);
  // Trials by x (stable), kept with an input's column: after a dial move only the output changed.
  const byX = orderByX(xv, n);
  const order: number[] = [];
  for (let j = 0; j < byX.length; j++) if (Number.isFinite(yv[byX[j]])) order.push(byX[j]);
  const g = Math.max(1, Math.min(groups, order.length));
  const out: ScatterGroup[] = [];
  for (let k = 0; k < g; k++) {
    const s = Math.floor((k * order.length) / g);
    const e = Math.floor(((k + 1) * order.length) / g);
    if (e <= s) continue;
    let sum = 0;
    let bad = 0;
    for (let j = s; j < e; j++) {
      const v = yv[order[j]];
      sum += v;
      if (isOut(v, limits)) bad++;
    }
    out.push({ from: xv[order[s]], to: xv[order[e - 1]], trials: e - s, meanY: sum / (e - s), outShare: bad / (e - s) });
  }
  return out;
}

export function describeScatter(g: ScatterGeometry): string {
  if (!g.points.length) return `No trials to plot for ${g.xName} against ${g.yName}.`;
  const out = g.points.filter((p) => p.out).length;
  const parts = [`Scatter of ${g.yName} against ${g.xName}: ${g.drawn} of ${g.total} trials drawn.`];
  if (g.limitLines.length) parts.push(`${formatPercent(out / g.points.length)} of the drawn trials fall beyond the limits (crosses).`);
  return parts.join(' ');
}

export function scatterScene(g: ScatterGeometry, text?: Partial<SceneText>): Scene {
  const { box } = g;
  const w = box.innerWidth;
  const axes = axesNodes(box, g.xAxis, g.yAxis);
  const nodes: SceneNode[] = [...axes.filter((n) => n.key?.startsWith('yg'))];
  for (const r of g.outRegions) nodes.push({ type: 'rect', key: `zone-${r.side}`, x: 0, y: r2(r.y), width: w, height: r2(r.height), fill: { pattern: PATTERN_OUT_ZONE } });
  nodes.push(...axes.filter((n) => !n.key?.startsWith('yg')));
  const rIn = 2.2;
  const rOut = 2.8;
  let dIn = '';
  let dOut = '';
  for (const p of g.points) {
    const x = r2(p.px);
    const y = r2(p.py);
    if (p.out) dOut += `M${r2(x - rOut)},${r2(y - rOut)}l${rOut * 2},${rOut * 2}m0,${-rOut * 2}l${-rOut * 2},${rOut * 2}`;
    else dIn += `M${r2(x - rIn)},${y}a${rIn},${rIn} 0 1,0 ${rIn * 2},0a${rIn},${rIn} 0 1,0 ${-rIn * 2},0`;
  }
  if (dIn) nodes.push({ type: 'path', key: 'pts-in', d: dIn, fill: chartColors.series, opacity: 0.45 });
  if (dOut) nodes.push({ type: 'path', key: 'pts-out', d: dOut, stroke: chartColors.out, strokeWidth: 1.5 });
  for (const l of g.limitLines) {
    nodes.push({ type: 'line', key: `lim-${l.side}`, x1: 0, x2: w, y1: r2(l.y), y2: r2(l.y), stroke: chartColors.limit, strokeWidth: 2, dash: '6 3' });
    nodes.push({ type: 'text', key: `limt-${l.side}`, x: w - 4, y: r2(l.side === 'upper' ? l.y - 5 : l.y + 14), text: l.label, font: 'sans', size: 11, fill: chartColors.limit, weight: 600, anchor: 'end' });
  }
  return {
    width: box.width,
    height: box.height,
    title: text?.title ?? `${g.yName} against ${g.xName}`,
    description: text?.description ?? describeScatter(g),
    background: chartColors.background,
    patterns: g.outRegions.length ? outPatterns().slice(0, 1) : [],
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}
