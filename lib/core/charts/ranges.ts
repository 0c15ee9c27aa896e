import { coveringDomain, linear, linearAxis, makeBox, xTickCount, type Axis, type Box } from './axis';
import { barValueAxisNodes, translate, type SceneText } from './frame';
import { formatValue } from './format';
import { chartColors } from './palette';
import { fitText, r2, textWidth, type Scene, type SceneNode } from './scene';
import { outPatterns, PATTERN_OUT_BAR, type SpecLimits } from './spread';

/** One method's predicted range of the output, e.g. worst case, RSS, Monte Carlo ±3 s. */
export interface RangeRow {
  id: string;
  label: string;
  min: number;
  max: number;
  /** A centre tick (mean or nominal). */
  centre?: number | null;
}

export interface RangesInput {
  rows: readonly RangeRow[];
  name: string;
  unit?: string | null;
  limits?: SpecLimits;
  width: number;
}

export interface RangeBar {
  id: string;
  label: string;
  shownLabel: string;
  min: number;
  max: number;
  centre: number | null;
  y: number;
  /** Pieces of the bar: inside the limits, or beyond them (hatched). */
  segments: Array<{ x: number; width: number; out: boolean }>;
  centreX: number | null;
  /** Does the whole range sit within the limits? */
  within: boolean;
  rangeText: string;
}

export interface RangesGeometry {
  box: Box;
  layout: 'side' | 'stacked';
  bars: RangeBar[];
  limits: Array<{ side: 'lower' | 'upper'; value: number; x: number; text: string }>;
  xAxis: Axis;
  name: string;
  unit: string | null;
}

/**
 * Ranges of several methods on one scale, against the limits: the "side by side" view of a stack-up
 * (worst case, RSS, Monte Carlo). The part of a range beyond a limit is hatched.
 */
export function rangesGeometry(input: RangesInput): RangesGeometry {
  const unit = input.unit ?? null;
  const width = Math.max(240, input.width);
  const rows = input.rows.filter((r) => Number.isFinite(r.min) && Number.isFinite(r.max));
  const lower = input.limits?.lower ?? null;
  const upper = input.limits?.upper ?? null;
  const layout: RangesGeometry['layout'] = width >= 520 ? 'side' : 'stacked';
  const labelWidth = layout === 'side' ? Math.min(Math.round(width * 0.3), Math.max(90, ...rows.map((r) => Math.ceil(textWidth(r.label, 12, 'sans')) + 10))) : 0;
  const rowH = layout === 'side' ? 34 : 46;
  const margin = { top: 22, right: 16, bottom: 42, left: 12 + labelWidth };
  const box = makeBox(width, margin.top + margin.bottom + Math.max(1, rows.length) * rowH, margin);
  const domain = coveringDomain([...rows.flatMap((r) => [r.min, r.max]), ...(lower !== null ? [lower] : []), ...(upper !== null ? [upper] : [])], 0.06);
  const x = linear(domain, [0, box.innerWidth]);

  const bars: RangeBar[] = rows.map((r, i) => {
    const lo = Math.min(r.min, r.max);
    const hi = Math.max(r.min, r.max);
    const cuts = [lo, ...[lower, upper].filter((c): c is number => c !== null && c > lo && c < hi), hi].sort((a, b) => a - b);
    const segments: RangeBar['segments'] = [];
    for (let k = 0; k + 1 < cuts.length; k++) {
      const mid = (cuts[k] + cuts[k + 1]) / 2;
      segments.push({ x: x(cuts[k]), width: Math.max(1.5, x(cuts[k + 1]) - x(cuts[k])), out: (lower !== null && mid < lower) || (upper !== null && mid > upper) });
    }
    if (lo === hi) segments.push({ x: x(lo) - 0.75, width: 1.5, out: (lower !== null && lo < lower) || (upper !== null && lo > upper) });
    const centre = r.centre != null && Number.isFinite(r.centre) ? r.centre : null;
    return {
      id: r.id,
      label: r.label,
      shownLabel: fitText(r.label, layout === 'side' ? labelWidth - 10 : box.innerWidth, 12, 'sans'),
      min: lo,
      max: hi,
      centre,
      y: i * rowH,
      segments,
      centreX: centre !== null ? x(centre) : null,
      within: (lower === null || lo >= lower) && (upper === null || hi <= upper),
      rangeText: `${formatValue(lo, unit, { trim: true })} to ${formatValue(hi, unit, { trim: true })}`,
    };
  });
  const limits: RangesGeometry['limits'] = [];
  if (lower !== null) limits.push({ side: 'lower', value: lower, x: x(lower), text: `${input.limits?.lowerLabel ?? 'Lower limit'} ${formatValue(lower, unit, { significant: 6, trim: true })}` });
  if (upper !== null) limits.push({ side: 'upper', value: upper, x: x(upper), text: `${input.limits?.upperLabel ?? 'Upper limit'} ${formatValue(upper, unit, { significant: 6, trim: true })}` });
  return { box, layout, bars, limits, xAxis: linearAxis(x, xTickCount(box.innerWidth, unit), input.name, unit), name: input.name, unit };
}

export function describeRanges(g: RangesGeometry): string {
  const parts = g.bars.map((b) => `${b.label}: ${b.rangeText}, ${b.within ? 'within the limits' : 'beyond a limit'}.`);
  return `Predicted range of ${g.name} by method. ${parts.join(' ')}`;
}

export function rangesScene(g: RangesGeometry, text?: Partial<SceneText>): Scene {
  const { box } = g;
  const h = box.innerHeight;
  const nodes: SceneNode[] = barValueAxisNodes(box, g.xAxis);
  // Limit labels sit in the top margin: lower to the left of its line, upper to the right, kept inside.
  for (const l of g.limits) {
    const w = textWidth(l.text, 11, 'sans');
    let left = l.side === 'lower' ? l.x - w - 4 : l.x + 4;
    left = Math.max(-box.margin.left + 2, Math.min(box.innerWidth + box.margin.right - w - 2, left));
    nodes.push({ type: 'line', key: `lim-${l.side}`, x1: r2(l.x), x2: r2(l.x), y1: -6, y2: h, stroke: chartColors.limit, strokeWidth: 2, dash: '6 3' });
    nodes.push({ type: 'text', key: `limt-${l.side}`, x: r2(left), y: -10, text: l.text, font: 'sans', size: 11, fill: chartColors.limit, weight: 600 });
  }
  for (const b of g.bars) {
    const barH = 12;
    const rowH = g.layout === 'side' ? 34 : 46;
    const barY = g.layout === 'side' ? b.y + (rowH - barH) / 2 : b.y + rowH - barH - 8;
    for (const [k, s] of b.segments.entries())
      nodes.push({
        type: 'rect',
        key: `seg-${b.id}-${k}`,
        x: r2(s.x),
        y: r2(barY),
        width: r2(s.width),
        height: barH,
        fill: s.out ? { pattern: PATTERN_OUT_BAR } : chartColors.series,
        stroke: s.out ? chartColors.out : undefined,
        strokeWidth: s.out ? 0.75 : undefined,
      });
    if (b.centreX !== null) nodes.push({ type: 'line', key: `c-${b.id}`, x1: r2(b.centreX), x2: r2(b.centreX), y1: r2(barY - 4), y2: r2(barY + barH + 4), stroke: chartColors.strong, strokeWidth: 2 });
    if (g.layout === 'stacked') {
      const tw = textWidth(b.shownLabel, 12, 'sans');
      nodes.push({ type: 'rect', key: `labbg-${b.id}`, x: -2, y: r2(barY - 19), width: r2(tw + 6), height: 16, fill: '#ffffff', opacity: 0.9 });
    }
    nodes.push({
      type: 'text',
      key: `lab-${b.id}`,
      x: g.layout === 'side' ? -10 : 0,
      y: r2(g.layout === 'side' ? barY + barH / 2 : barY - 6),
      text: b.shownLabel,
      font: 'sans',
      size: 12,
      fill: chartColors.strong,
      anchor: g.layout === 'side' ? 'end' : 'start',
      baseline: g.layout === 'side' ? 'middle' : 'alphabetic',
      weight: 500,
    });
  }
  return {
    width: box.width,
    height: box.height,
    title: text?.title ?? `${g.name}: methods side by side`,
    description: text?.description ?? describeRanges(g),
    background: chartColors.background,
    patterns: outPatterns().filter((p) => p.id === PATTERN_OUT_BAR),
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}
