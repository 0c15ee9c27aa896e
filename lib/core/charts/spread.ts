import { bin as d3bin } from 'd3-array';
import { coveringDomain, linear, linearAxis, makeBox, percentAxis, xTickCount, yTickCount, type Axis, type Box } from './axis';
import { formatPercent, formatPpm, formatValue } from './format';
import { placeLabels, rowCount, type PlacedLabel } from './labels';
import { chartColors, HATCH } from './palette';
import { r2, textWidth, type PatternDef, type Scene, type SceneNode } from './scene';
import { axesNodes, translate, type SceneText } from './frame';

/** One histogram bin: [x0, x1) holding `count` trials (the last bin includes x1). */
export interface HistogramBin {
  x0: number;
  x1: number;
  count: number;
}

/** Specification limits, or a budget as an upper limit. */
export interface SpecLimits {
  lower?: number | null;
  upper?: number | null;
  /** Printed names, default "Lower limit" / "Upper limit" (e.g. "Budget"). */
  lowerLabel?: string;
  upperLabel?: string;
}

export type MarkerKind = 'mean' | 'nominal' | 'budget' | 'base' | 'most-likely-sum' | 'percentile';

/** A reference value drawn as a thin vertical line with a label. */
export interface ValueMarker {
  value: number;
  label: string;
  kind: MarkerKind;
}

export interface SpreadInput {
  bins: readonly HistogramBin[];
  /** Name of the output, used in the axis title ("Gap"). */
  name: string;
  unit?: string | null;
  limits?: SpecLimits;
  markers?: readonly ValueMarker[];
  /** Trials behind the bins (defaults to the sum of counts); the y axis shows the share of trials. */
  total?: number;
  /** What the counts are, plural: 'trials' for a simulation (default), 'measurements' for a dataset. */
  noun?: string;
  width: number;
  /** Plot height without the label rows (default: 0.42 × width, between 180 and 300). */
  plotHeight?: number;
  /**
   * Text printed inside each hatched region, e.g. "0.31 % below". Defaults to an estimate from the bins;
   * pass the engine's exact counts when known, or null to print nothing.
   */
  outLabels?: { lower?: string | null; upper?: string | null };
  /** Exact shares below / above the limits (the engine's counts); otherwise estimated from the bins. */
  outShare?: { below: number; above: number };
}

export interface BarSegment {
  x: number;
  y: number;
  width: number;
  height: number;
  /** Beyond a limit: drawn hatched. */
  out: boolean;
}

export interface SpreadBar {
  x0: number;
  x1: number;
  count: number;
  /** Share of all trials. */
  fraction: number;
  segments: BarSegment[];
}

export interface LimitLine {
  side: 'lower' | 'upper';
  value: number;
  /** Pixel x inside the plot area. */
  x: number;
  label: PlacedLabel;
}

export interface OutRegion {
  side: 'lower' | 'upper';
  x: number;
  width: number;
  /** Share beyond the limit, printed in the region when it fits. */
  text?: string | null;
}

export interface MarkerLine {
  kind: MarkerKind;
  value: number;
  x: number;
  label: PlacedLabel;
}

export interface SpreadGeometry {
  box: Box;
  /** Height of the label rows above the plot, inside margin.top. */
  labelRowHeight: number;
  xDomain: [number, number];
  yMax: number;
  total: number;
  bars: SpreadBar[];
  outRegions: OutRegion[];
  limits: LimitLine[];
  markers: MarkerLine[];
  xAxis: Axis;
  yAxis: Axis;
  /** Estimated share below the lower / above the upper limit, from the bins (uniform within a bin). */
  outShare: { below: number; above: number };
  name: string;
  unit: string | null;
  /** What the bars count, plural ('trials', 'measurements'). */
  noun: string;
}

const LABEL_SIZE = 11;
const ROW = 15;

function limitText(side: 'lower' | 'upper', limits: SpecLimits, value: number, unit: string | null | undefined): string {
  const name = side === 'lower' ? (limits.lowerLabel ?? 'Lower limit') : (limits.upperLabel ?? 'Upper limit');
  return `${name} ${formatValue(value, unit, { significant: 6, trim: true })}`;
}

/** Share of a bin lying beyond a cut, assuming trials spread evenly inside the bin. */
function shareBelow(b: HistogramBin, cut: number): number {
  if (cut <= b.x0) return 0;
  if (cut >= b.x1) return 1;
  return (cut - b.x0) / (b.x1 - b.x0);
}

export function spreadGeometry(input: SpreadInput): SpreadGeometry {
  const unit = input.unit ?? null;
  const bins = input.bins.filter((b) => Number.isFinite(b.x0) && Number.isFinite(b.x1) && b.x1 >= b.x0);
  const total = input.total ?? bins.reduce((s, b) => s + b.count, 0);
  const limits = input.limits ?? {};
  const lower = limits.lower != null && Number.isFinite(limits.lower) ? limits.lower : null;
  const upper = limits.upper != null && Number.isFinite(limits.upper) ? limits.upper : null;
  const markers = (input.markers ?? []).filter((m) => Number.isFinite(m.value));

  const width = Math.max(240, input.width);
  const margin = { top: 0, right: 14, bottom: 46, left: 58 };
  const innerWidth = width - margin.left - margin.right;

  const domainValues = [...bins.flatMap((b) => [b.x0, b.x1]), ...(lower !== null ? [lower] : []), ...(upper !== null ? [upper] : []), ...markers.map((m) => m.value)];
  const xDomain = coveringDomain(domainValues, 0.03);
  const x = linear(xDomain, [0, innerWidth]);

  // Label rows above the plot: limits first, then markers.
  const requests = [
    ...(lower !== null ? [{ x: x(lower), text: limitText('lower', limits, lower, unit), size: LABEL_SIZE, font: 'sans' as const, prefer: 'end' as const }] : []),
    ...(upper !== null ? [{ x: x(upper), text: limitText('upper', limits, upper, unit), size: LABEL_SIZE, font: 'sans' as const, prefer: 'start' as const }] : []),
    ...markers.map((m) => ({ x: x(m.value), text: m.label, size: LABEL_SIZE, font: 'sans' as const, prefer: 'middle' as const })),
  ];
  const placed = placeLabels(requests, innerWidth);
  const rows = Math.max(1, rowCount(placed));
  const labelRowHeight = rows * ROW + 6;
  margin.top = labelRowHeight + 4;

  const plotHeight = input.plotHeight ?? Math.max(180, Math.min(300, Math.round(width * 0.42)));
  const box = makeBox(width, plotHeight + margin.top + margin.bottom, margin);

  const maxFraction = total > 0 ? Math.max(0, ...bins.map((b) => b.count / total)) : 0;
  const y = linear([0, maxFraction > 0 ? maxFraction * 1.06 : 1], [box.innerHeight, 0]).nice(yTickCount(box.innerHeight));
  const yMax = y.domain()[1];

  const bars: SpreadBar[] = bins.map((b) => {
    const fraction = total > 0 ? b.count / total : 0;
    const top = y(fraction);
    const height = box.innerHeight - top;
    // Split the bar where a limit cuts it, so only the part beyond the limit is hatched.
    const cuts = [b.x0, ...[lower, upper].filter((c): c is number => c !== null && c > b.x0 && c < b.x1), b.x1].sort((p, q) => p - q);
    const segments: BarSegment[] = [];
    for (let i = 0; i + 1 < cuts.length; i++) {
      const a = cuts[i];
      const c = cuts[i + 1];
      const mid = (a + c) / 2;
      const out = (lower !== null && mid < lower) || (upper !== null && mid > upper);
      const px0 = x(a);
      const px1 = x(c);
      // A hairline gap between neighbouring bins keeps them countable; none inside a split bar.
      const gapL = i === 0 && px1 - px0 > 3 ? 0.5 : 0;
      const gapR = i + 2 === cuts.length && px1 - px0 > 3 ? 0.5 : 0;
      if (b.count > 0) segments.push({ x: px0 + gapL, y: top, width: Math.max(0.5, px1 - px0 - gapL - gapR), height, out });
    }
    return { x0: b.x0, x1: b.x1, count: b.count, fraction, segments };
  });

  const outRegions: OutRegion[] = [];
  if (lower !== null && x(lower) > 0) outRegions.push({ side: 'lower', x: 0, width: x(lower) });
  if (upper !== null && x(upper) < innerWidth) outRegions.push({ side: 'upper', x: x(upper), width: innerWidth - x(upper) });

  let li = 0;
  const limitLines: LimitLine[] = [];
  if (lower !== null) limitLines.push({ side: 'lower', value: lower, x: x(lower), label: placed[li++] });
  if (upper !== null) limitLines.push({ side: 'upper', value: upper, x: x(upper), label: placed[li++] });
  const markerLines: MarkerLine[] = markers.map((m) => ({ kind: m.kind, value: m.value, x: x(m.value), label: placed[li++] }));

  let below = 0;
  let above = 0;
  if (total > 0) {
    for (const b of bins) {
      if (lower !== null) below += b.count * shareBelow(b, lower);
      if (upper !== null) above += b.count * (1 - shareBelow(b, upper));
    }
    below /= total;
    above /= total;
  }
  if (input.outShare) ({ below, above } = input.outShare);

  for (const r of outRegions) {
    const given = input.outLabels?.[r.side];
    r.text = given !== undefined ? given : total > 0 ? `${formatPercent(r.side === 'lower' ? below : above)} ${r.side === 'lower' ? 'below' : 'above'}` : null;
  }

  return {
    box,
    labelRowHeight,
    xDomain,
    yMax,
    total,
    bars,
    outRegions,
    limits: limitLines,
    markers: markerLines,
    xAxis: linearAxis(x, xTickCount(innerWidth, unit), input.name, unit),
    yAxis: percentAxis(y, yTickCount(box.innerHeight), `Share of ${input.noun ?? 'trials'}`),
    outShare: { below, above },
    name: input.name,
    unit,
    noun: input.noun ?? 'trials',
  };
}

/**
 * Histogram bins for raw values (for outputs the engine did not bin, and for tests).
 * Bin edges are aligned so that a limit, when given, falls exactly on an edge.
 */
export function binValues(values: ArrayLike<number>, opts: { count?: number; limits?: SpecLimits } = {}): HistogramBin[] {
  const data: number[] = [];
  for (let i = 0; i < values.length; i++) if (Number.isFinite(values[i])) data.push(values[i]);
  if (!data.length) return [];
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of data) {
    if (v < lo) lo = v;
    if (v > hi) hi = v;
  }
  const count = Math.max(1, opts.count ?? Math.min(60, Math.max(10, Math.round(Math.sqrt(data.length) / 2))));
  if (lo === hi) return [{ x0: lo, x1: hi, count: data.length }];
  let step = (hi - lo) / count;
  const anchor = opts.limits?.lower ?? opts.limits?.upper ?? null;
  let start = lo;
  if (anchor != null && Number.isFinite(anchor)) {
    const lower = opts.limits?.lower;
    const upper = opts.limits?.upper;
    const across = lower != null && upper != null ? Math.round((upper - lower) / step) : NaN;
    if (Number.isFinite(across) && across >= 1 && across <= 4 * count) {
      // Both limits on edges: a whole number of steps across the specification width.
      step = ((upper as number) - (lower as number)) / across;
    }
    // Shift the grid so the limit is an edge; the first edge is at or below the minimum.
    const shifted = anchor - Math.ceil((anchor - lo) / step) * step;
    start = Number.isFinite(shifted) && shifted <= lo && lo - shifted <= step ? shifted : lo;
  }
  // Thresholds by index (never by repeated addition, which can stall at large magnitudes).
  const k = Math.min(2 * count + 2, Math.max(1, Math.ceil((hi - start) / step)));
  const thresholds: number[] = [];
  for (let j = 1; j < k; j++) {
    const t = start + j * step;
    if (t > (thresholds[thresholds.length - 1] ?? start) && t < hi) thresholds.push(t);
  }
  const end = Math.max(hi, start + k * step);
  const binner = d3bin()
    .domain([Math.min(start, lo), end])
    .thresholds(thresholds);
  return binner(data).map((b) => ({ x0: b.x0 as number, x1: b.x1 as number, count: b.length }));
}

export const PATTERN_OUT_ZONE = 'out-zone';
export const PATTERN_OUT_BAR = 'out-bar';

/** The two hatch patterns: a light one for the region behind the bars, a strong one for the bars beyond a limit. */
export function outPatterns(): PatternDef[] {
  return [
    { id: PATTERN_OUT_ZONE, kind: 'hatch', color: '#efb48c', background: chartColors.outTint, spacing: HATCH.spacing, strokeWidth: 1, angle: HATCH.angle },
    { id: PATTERN_OUT_BAR, kind: 'hatch', color: '#ffffff', background: chartColors.out, spacing: 5, strokeWidth: HATCH.strokeWidth, angle: HATCH.angle },
  ];
}

/** Default text alternative for a histogram, from the geometry alone. */
export function describeSpread(g: SpreadGeometry): string {
  if (!g.bars.length) return `No results to show for ${g.name}.`;
  const lo = g.bars[0].x0;
  const hi = g.bars[g.bars.length - 1].x1;
  const peak = g.bars.reduce((a, b) => (b.count > a.count ? b : a), g.bars[0]);
  const parts = [
    `Histogram of ${g.name} from ${formatValue(lo, g.unit, { trim: true })} to ${formatValue(hi, g.unit, { trim: true })} in ${g.bars.length} bins; the most frequent bin is ${formatValue(peak.x0, g.unit, { trim: true })} to ${formatValue(peak.x1, g.unit, { trim: true })} with ${formatPercent(peak.fraction)} of ${g.noun}.`,
  ];
  for (const l of g.limits) parts.push(`${l.label.text}.`);
  if (g.limits.length) {
    const out = g.outShare.below + g.outShare.above;
    const share = out > 0 && out < 0.001 ? formatPpm(out * 1e6) : formatPercent(out);
    parts.push(`${share.charAt(0).toUpperCase() + share.slice(1)} of ${g.noun} fall beyond ${g.limits.length > 1 ? 'the limits' : 'the limit'} (hatched).`);
  }
  return parts.join(' ');
}

export function spreadScene(g: SpreadGeometry, text?: Partial<SceneText>): Scene {
  const { box } = g;
  const plot: SceneNode[] = [];
  const h = box.innerHeight;

  const zoneText: SceneNode[] = [];
  for (const r of g.outRegions) {
    plot.push({ type: 'rect', key: `zone-${r.side}`, x: r2(r.x), y: 0, width: r2(r.width), height: h, fill: { pattern: PATTERN_OUT_ZONE } });
    const tw = r.text ? textWidth(r.text, 11, 'mono') : 0;
    if (r.text && tw + 10 <= r.width) {
      const cx = r.x + r.width / 2;
      zoneText.push({ type: 'rect', key: `zt-bg-${r.side}`, x: r2(cx - tw / 2 - 4), y: 6, width: r2(tw + 8), height: 17, fill: '#ffffff', rx: 2, opacity: 0.92 });
      zoneText.push({ type: 'text', key: `zt-${r.side}`, x: r2(cx), y: 18.5, text: r.text, font: 'mono', size: 11, fill: chartColors.limit, anchor: 'middle', weight: 500 });
    }
  }

  const bars: SceneNode[] = [];
  g.bars.forEach((b, i) =>
    b.segments.forEach((s, j) =>
      bars.push({
        type: 'rect',
        key: `bar${i}-${j}`,
        x: r2(s.x),
        y: r2(s.y),
        width: r2(s.width),
        height: r2(s.height),
        fill: s.out ? { pattern: PATTERN_OUT_BAR } : chartColors.series,
        stroke: s.out ? chartColors.out : undefined,
        strokeWidth: s.out ? 0.75 : undefined,
      }),
    ),
  );

  const lines: SceneNode[] = [];
  const labelY = (row: number) => -box.margin.top + 4 + row * 15 + 11;
  for (const m of g.markers) {
    lines.push({ type: 'line', key: `mk-${m.kind}-${m.value}`, x1: r2(m.x), x2: r2(m.x), y1: labelY(m.label.row) + 3, y2: h, stroke: m.kind === 'mean' ? chartColors.mean : chartColors.reference, strokeWidth: 1.25, dash: '2 3' });
    lines.push({ type: 'text', key: `mkt-${m.kind}-${m.value}`, x: r2(m.label.left), y: labelY(m.label.row), text: m.label.text, font: 'sans', size: 11, fill: m.kind === 'mean' ? chartColors.strong : chartColors.refText });
  }
  for (const l of g.limits) {
    lines.push({ type: 'line', key: `lim-${l.side}`, x1: r2(l.x), x2: r2(l.x), y1: labelY(l.label.row) + 3, y2: h, stroke: chartColors.limit, strokeWidth: 2, dash: '6 3' });
    lines.push({ type: 'text', key: `limt-${l.side}`, x: r2(l.label.left), y: labelY(l.label.row), text: l.label.text, font: 'sans', size: 11, fill: chartColors.limit, weight: 600 });
  }

  const nodes: SceneNode[] = [
    {
      type: 'group',
      key: 'plot',
      children: [
        ...axesNodes(box, g.xAxis, g.yAxis).filter((n) => n.key?.startsWith('yg')),
        ...plot,
        ...bars,
        ...axesNodes(box, g.xAxis, g.yAxis).filter((n) => !n.key?.startsWith('yg')),
        ...zoneText,
        ...lines,
      ],
    },
  ];
  return {
    width: box.width,
    height: box.height,
    title: text?.title ?? `Spread of ${g.name}`,
    description: text?.description ?? describeSpread(g),
    background: chartColors.background,
    patterns: outPatterns(),
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}
