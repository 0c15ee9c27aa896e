import { coveringDomain, linear, linearAxis, makeBox, percentAxis, xTickCount, type Axis, type Box } from './axis';
import { axesNodes, translate, type SceneText } from './frame';
import { formatPercent, formatValue, percentileName } from './format';
import { placeLabels, rowCount, type PlacedLabel } from './labels';
import { areaPath as closedArea, linePath } from './polyline';
import { chartColors } from './palette';
import { r2, textWidth, type Scene, type SceneNode } from './scene';
import { outPatterns, PATTERN_OUT_ZONE, type LimitLine, type MarkerKind, type OutRegion, type SpecLimits, type ValueMarker } from './spread';

/** One point of the empirical CDF: p is the share of trials at or below x. */
export interface EcdfPoint {
  x: number;
  p: number;
}

/** ECDF points with x ascending and p non-decreasing in 0..1 (the engine's `ecdf`). */
export type EcdfPoints = readonly EcdfPoint[];

/** A percentile as the engine computed it (its pinned definition), e.g. { p: 0.8, value: 12.3e6 }. */
export interface PercentileMark {
  p: number;
  value: number;
}

export interface CumulativeInput {
  ecdf: EcdfPoints;
  name: string;
  unit?: string | null;
  /** Markers on the curve, usually P10/P50/P80/P90. */
  percentiles?: readonly PercentileMark[];
  /** Reference values drawn as vertical lines meeting the curve (budget, base estimate, sum of most likely). */
  markers?: readonly ValueMarker[];
  /** Limits hatch the region beyond them, as on the spread chart. */
  limits?: SpecLimits;
  /** Add where each limit falls on the curve to its label ("Budget €600 k · P68"); for budgets. */
  limitRanks?: boolean;
  width: number;
  plotHeight?: number;
}

export interface CurvePoint {
  value: number;
  p: number;
}

export interface PercentileMarker {
  p: number;
  value: number;
  name: string;
  x: number;
  y: number;
  label: { text: string; x: number; y: number; anchor: 'start' | 'end' };
}

export interface ReferenceMarker {
  kind: MarkerKind;
  value: number;
  /** Share of trials at or below the value, read off the curve. */
  p: number;
  x: number;
  y: number;
  label: PlacedLabel;
}

export interface CumulativeGeometry {
  box: Box;
  xDomain: [number, number];
  /** The curve's points (thinned to what a screen can show), ascending. */
  points: CurvePoint[];
  /** SVG path of the curve, in plot coordinates. */
  path: string;
  /** Closed path of the area under the curve. */
  areaPath: string;
  percentiles: PercentileMarker[];
  references: ReferenceMarker[];
  outRegions: OutRegion[];
  limits: LimitLine[];
  xAxis: Axis;
  yAxis: Axis;
  name: string;
  unit: string | null;
}

const ROW = 15;

/** Keeps the ECDF's shape while dropping points closer than a fraction of a pixel or of a percent. */
export function thinEcdf(ecdf: EcdfPoints, xSpan: number, pixels: number): CurvePoint[] {
  const n = ecdf.length;
  const out: CurvePoint[] = [];
  const dx = (xSpan / Math.max(1, pixels)) * 0.5;
  for (let i = 0; i < n; i++) {
    const value = ecdf[i].x;
    const p = ecdf[i].p;
    if (!Number.isFinite(value) || !Number.isFinite(p)) continue;
    const last = out[out.length - 1];
    const isLast = i === n - 1;
    if (last && !isLast && value - last.value < dx && p - last.p < 0.002) continue;
    if (last && value === last.value) {
      // Ties: keep the largest p for that x so the curve stays a function.
      last.p = Math.max(last.p, p);
      continue;
    }
    out.push({ value, p });
  }
  return out;
}

/** Share of trials at or below `value`, interpolated linearly between curve points (0 before, 1 after). */
export function ecdfAt(points: readonly CurvePoint[], value: number): number {
  const n = points.length;
  if (!n) return NaN;
  if (value < points[0].value) return 0;
  if (value >= points[n - 1].value) return points[n - 1].p;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (points[mid].value <= value) lo = mid;
    else hi = mid;
  }
  const a = points[lo];
  const b = points[hi];
  return b.value === a.value ? b.p : a.p + ((b.p - a.p) * (value - a.value)) / (b.value - a.value);
}

/** The value with share `p` at or below it, by inverse interpolation of the curve. */
export function quantileAt(points: readonly CurvePoint[], p: number): number {
  const n = points.length;
  if (!n) return NaN;
  if (p <= points[0].p) return points[0].value;
  if (p >= points[n - 1].p) return points[n - 1].value;
  let lo = 0;
  let hi = n - 1;
  while (hi - lo > 1) {
    const mid = (lo + hi) >> 1;
    if (points[mid].p < p) lo = mid;
    else hi = mid;
  }
  const a = points[lo];
  const b = points[hi];
  return b.p === a.p ? a.value : a.value + ((b.value - a.value) * (p - a.p)) / (b.p - a.p);
}

function refText(m: ValueMarker, p: number, unit: string | null): string {
  return `${m.label} ${formatValue(m.value, unit, { significant: 6, trim: true })} · ${percentileName(Math.round(p * 100) / 100)}`;
}

export function cumulativeGeometry(input: CumulativeInput): CumulativeGeometry {
  const unit = input.unit ?? null;
  const width = Math.max(240, input.width);
  const margin = { top: 0, right: 16, bottom: 46, left: 58 };
  const innerWidth = width - margin.left - margin.right;
  const rawX = input.ecdf.map((d) => d.x).filter((v) => Number.isFinite(v));
  const lower = input.limits?.lower ?? null;
  const upper = input.limits?.upper ?? null;
  const refs = (input.markers ?? []).filter((m) => Number.isFinite(m.value));
  const lo = rawX.length ? rawX[0] : 0;
  const hi = rawX.length ? rawX[rawX.length - 1] : 1;
  const xDomain = coveringDomain([lo, hi, ...refs.map((m) => m.value), ...(lower !== null ? [lower] : []), ...(upper !== null ? [upper] : [])], 0.03);
  const x = linear(xDomain, [0, innerWidth]);
  const points = thinEcdf(input.ecdf, xDomain[1] - xDomain[0], innerWidth);

  const refP = refs.map((m) => ecdfAt(points, m.value));
  const rank = (v: number) => (input.limitRanks && points.length ? ` · ${percentileName(Math.round(ecdfAt(points, v) * 100) / 100)}` : '');
  const limitReqs = [
    ...(lower !== null ? [{ x: x(lower), text: `${input.limits?.lowerLabel ?? 'Lower limit'} ${formatValue(lower, unit, { significant: 6, trim: true })}${rank(lower)}`, size: 11, font: 'sans' as const, prefer: 'end' as const }] : []),
    ...(upper !== null ? [{ x: x(upper), text: `${input.limits?.upperLabel ?? 'Upper limit'} ${formatValue(upper, unit, { significant: 6, trim: true })}${rank(upper)}`, size: 11, font: 'sans' as const, prefer: 'start' as const }] : []),
  ];
  const placed = placeLabels(
    [...limitReqs, ...refs.map((m, i) => ({ x: x(m.value), text: refText(m, refP[i], unit), size: 11, font: 'sans' as const, prefer: 'middle' as const }))],
    innerWidth,
  );
  const rows = rowCount(placed);
  margin.top = Math.max(12, rows * ROW + 10);
  const plotHeight = input.plotHeight ?? Math.max(190, Math.min(320, Math.round(width * 0.45)));
  const box = makeBox(width, plotHeight + margin.top + margin.bottom, margin);
  const y = linear([0, 1], [box.innerHeight, 0]);

  const xy = points.map((d) => [r2(x(d.value)), r2(y(d.p))] as const);
  const path = linePath(xy);
  const areaPath = closedArea(xy, box.innerHeight);

  // Percentile labels sit on their horizontal drop line, near the y axis: left of its point a rising
  // curve is always below that line, so the label never crosses the curve. When the point is too close
  // to the axis for the label, it goes right of the point at its height (there the curve is above it).
  const marks = [...(input.percentiles ?? [])].filter((m) => Number.isFinite(m.value) && m.p > 0 && m.p < 1).sort((a, b) => a.p - b.p);
  const percentiles: PercentileMarker[] = [];
  let lastLabelY = Infinity;
  for (const m of marks) {
    const px = x(m.value);
    const py = y(m.p);
    const name = percentileName(m.p);
    const text = `${name} ${formatValue(m.value, unit)}`;
    const w = textWidth(text, 11, 'mono');
    // Start right of a lower limit's line, so the label does not sit on the hatch.
    const lx = lower !== null && x(lower) > 0 && x(lower) < px ? x(lower) + 6 : 4;
    const left = px - 10 >= lx + w;
    let ly = left ? py - 4 : py + 4;
    if (ly > lastLabelY - 13) ly = lastLabelY - 13;
    lastLabelY = ly;
    percentiles.push({ p: m.p, value: m.value, name, x: px, y: py, label: { text, x: left ? lx : px + 9, y: ly, anchor: 'start' } });
  }

  let li = limitReqs.length;
  const references: ReferenceMarker[] = refs.map((m, i) => ({ kind: m.kind, value: m.value, p: refP[i], x: x(m.value), y: y(refP[i]), label: placed[li++] }));
  const outRegions: OutRegion[] = [];
  if (lower !== null && x(lower) > 0) outRegions.push({ side: 'lower', x: 0, width: x(lower) });
  if (upper !== null && x(upper) < innerWidth) outRegions.push({ side: 'upper', x: x(upper), width: innerWidth - x(upper) });
  const limits: LimitLine[] = [];
  let k = 0;
  if (lower !== null) limits.push({ side: 'lower', value: lower, x: x(lower), label: placed[k++] });
  if (upper !== null) limits.push({ side: 'upper', value: upper, x: x(upper), label: placed[k++] });

  return {
    box,
    xDomain,
    points,
    path,
    areaPath,
    percentiles,
    references,
    outRegions,
    limits,
    xAxis: linearAxis(x, xTickCount(innerWidth, unit), input.name, unit),
    yAxis: percentAxis(y, 5, 'Chance of not exceeding'),
    name: input.name,
    unit,
  };
}

export interface Readout {
  value: number;
  p: number;
  /** Plot coordinates of the point on the curve. */
  x: number;
  y: number;
  text: string;
}

function readout(g: CumulativeGeometry, value: number, p: number): Readout {
  const x = linear(g.xDomain, [0, g.box.innerWidth]);
  const y = linear([0, 1], [g.box.innerHeight, 0]);
  return { value, p, x: x(value), y: y(p), text: `${formatPercent(p)} chance of not exceeding ${formatValue(value, g.unit)}` };
}

/** The point on the curve under a pointer at plot x `px` (clamped to the curve's range). */
export function readoutAtPixel(g: CumulativeGeometry, px: number): Readout | null {
  if (!g.points.length) return null;
  const x = linear(g.xDomain, [0, g.box.innerWidth]);
  const first = g.points[0].value;
  const last = g.points[g.points.length - 1].value;
  const value = Math.max(first, Math.min(last, x.invert(px)));
  return readout(g, value, ecdfAt(g.points, value));
}

/** The point on the curve at a value (clamped to the curve's range). */
export function readoutAtValue(g: CumulativeGeometry, value: number): Readout | null {
  if (!g.points.length || !Number.isFinite(value)) return null;
  const v = Math.max(g.points[0].value, Math.min(g.points[g.points.length - 1].value, value));
  return readout(g, v, ecdfAt(g.points, v));
}

/** The point on the curve at share p (keyboard stepping moves p). */
export function readoutAtProbability(g: CumulativeGeometry, p: number): Readout | null {
  if (!g.points.length) return null;
  const pp = Math.max(0, Math.min(1, p));
  const value = quantileAt(g.points, pp);
  return readout(g, value, ecdfAt(g.points, value));
}

export type ReadoutKey = 'ArrowLeft' | 'ArrowRight' | 'ArrowUp' | 'ArrowDown' | 'PageUp' | 'PageDown' | 'Home' | 'End';

/**
 * Keyboard stepping of the readout: arrows move one percentage point, Page keys ten,
 * Home/End jump to the first and last percent. Starts at P50.
 */
export function stepReadout(g: CumulativeGeometry, current: Readout | null, key: ReadoutKey): Readout | null {
  if (!g.points.length) return null;
  const pNow = current ? Math.round(current.p * 100) / 100 : 0.5;
  if (!current) return readoutAtProbability(g, 0.5);
  let p = pNow;
  switch (key) {
    case 'ArrowRight':
    case 'ArrowUp':
      p = pNow + 0.01;
      break;
    case 'ArrowLeft':
    case 'ArrowDown':
      p = pNow - 0.01;
      break;
    case 'PageUp':
      p = pNow + 0.1;
      break;
    case 'PageDown':
      p = pNow - 0.1;
      break;
    case 'Home':
      p = 0.01;
      break;
    case 'End':
      p = 0.99;
      break;
  }
  return readoutAtProbability(g, Math.max(0.01, Math.min(0.99, Math.round(p * 100) / 100)));
}

export function describeCumulative(g: CumulativeGeometry): string {
  if (!g.points.length) return `No results to show for ${g.name}.`;
  const parts = [`S-curve of ${g.name}: the chance that the outcome is at or below each value, from ${formatValue(g.points[0].value, g.unit, { trim: true })} to ${formatValue(g.points[g.points.length - 1].value, g.unit, { trim: true })}.`];
  if (g.percentiles.length) parts.push(g.percentiles.map((m) => `${m.name} ${formatValue(m.value, g.unit)}`).join(', ') + '.');
  for (const r of g.references) parts.push(`${r.label.text.replace(/ · P.*$/, '')} falls at about ${formatPercent(r.p)}.`);
  return parts.join(' ');
}

export function cumulativeScene(g: CumulativeGeometry, text?: Partial<SceneText>): Scene {
  const { box } = g;
  const h = box.innerHeight;
  const axes = axesNodes(box, g.xAxis, g.yAxis);
  const nodes: SceneNode[] = [...axes.filter((n) => n.key?.startsWith('yg'))];
  const labelY = (row: number) => -box.margin.top + 4 + row * ROW + 11;
  // The hatch goes over the tint under the curve, so the region beyond a limit keeps its pattern.
  if (g.areaPath) nodes.push({ type: 'path', key: 'area', d: g.areaPath, fill: chartColors.seriesTint, opacity: 0.55 });
  g.outRegions.forEach((r) => nodes.push({ type: 'rect', key: `zone-${r.side}`, x: r2(r.x), y: 0, width: r2(r.width), height: h, fill: { pattern: PATTERN_OUT_ZONE }, opacity: 0.85 }));
  // Drop lines from each percentile point to both axes.
  for (const m of g.percentiles) {
    nodes.push({ type: 'path', key: `drop-${m.p}`, d: `M0,${r2(m.y)}H${r2(m.x)}V${h}`, stroke: chartColors.marker, strokeWidth: 1, dash: '2 3' });
  }
  nodes.push(...axes.filter((n) => !n.key?.startsWith('yg')));
  if (g.path) nodes.push({ type: 'path', key: 'curve', d: g.path, stroke: chartColors.series, strokeWidth: 2.25, strokeLinejoin: 'round' });
  for (const l of g.limits) {
    nodes.push({ type: 'line', key: `lim-${l.side}`, x1: r2(l.x), x2: r2(l.x), y1: labelY(l.label.row) + 3, y2: h, stroke: chartColors.limit, strokeWidth: 2, dash: '6 3' });
    nodes.push({ type: 'text', key: `limt-${l.side}`, x: r2(l.label.left), y: labelY(l.label.row), text: l.label.text, font: 'sans', size: 11, fill: chartColors.limit, weight: 600 });
  }
  for (const r of g.references) {
    nodes.push({ type: 'line', key: `ref-${r.kind}-${r.value}`, x1: r2(r.x), x2: r2(r.x), y1: labelY(r.label.row) + 3, y2: h, stroke: chartColors.reference, strokeWidth: 1.5, dash: '5 3' });
    nodes.push({ type: 'path', key: `refpt-${r.kind}-${r.value}`, d: `M${r2(r.x)},${r2(r.y - 5)}L${r2(r.x + 5)},${r2(r.y)}L${r2(r.x)},${r2(r.y + 5)}L${r2(r.x - 5)},${r2(r.y)}Z`, fill: chartColors.reference, stroke: '#ffffff', strokeWidth: 1 });
    nodes.push({ type: 'text', key: `reft-${r.kind}-${r.value}`, x: r2(r.label.left), y: labelY(r.label.row), text: r.label.text, font: 'sans', size: 11, fill: chartColors.refText, weight: 500 });
  }
  for (const m of g.percentiles) {
    nodes.push({ type: 'circle', key: `pm-${m.p}`, cx: r2(m.x), cy: r2(m.y), r: 4, fill: chartColors.marker, stroke: '#ffffff', strokeWidth: 1.5 });
    nodes.push({ type: 'text', key: `pmt-${m.p}`, x: r2(m.label.x), y: r2(m.label.y), text: m.label.text, font: 'mono', size: 11, fill: chartColors.markerText, weight: 600, anchor: m.label.anchor });
  }
  return {
    width: box.width,
    height: box.height,
    title: text?.title ?? `S-curve of ${g.name}`,
    description: text?.description ?? describeCumulative(g),
    background: chartColors.background,
    patterns: g.outRegions.length ? outPatterns().slice(0, 1) : [],
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}
