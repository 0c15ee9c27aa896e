import { linear, makeBox, percentAxis, type Axis, type Box } from './axis';
import { barValueAxisNodes, translate, type SceneText } from './frame';
import { formatPercent } from './format';
import { chartColors, OKABE_ITO } from './palette';
import { fitText, r2, textWidth, type Scene, type SceneNode } from './scene';

/** One input's influence on the output. */
export interface DriverDatum {
  id: string;
  label: string;
  /** Share of the output's variance attributed to this input (0..1). */
  share: number;
  /** Rank correlation with the output (−1..1); its sign says whether a higher input raises the output. */
  correlation?: number | null;
}

export interface DriversInput {
  drivers: readonly DriverDatum[];
  /** Name of the output ("Gap"), for the text alternative. */
  name: string;
  width: number;
  /** Bars shown; the rest are summed into one "Other" bar (default 8). */
  maxBars?: number;
}

export interface DriverBar {
  id: string;
  label: string;
  /** Label shortened to fit. */
  shownLabel: string;
  share: number;
  correlation: number | null;
  direction: 'up' | 'down' | 'none';
  rank: number;
  /** Plot coordinates. */
  y: number;
  barY: number;
  barHeight: number;
  barWidth: number;
  valueText: string;
  other: boolean;
}

export interface DriversGeometry {
  box: Box;
  layout: 'side' | 'stacked';
  labelWidth: number;
  bars: DriverBar[];
  xAxis: Axis;
  name: string;
}

/** Ranks drivers by share (largest first); equal shares by larger |correlation|, then by label. */
export function rankDrivers(drivers: readonly DriverDatum[]): DriverDatum[] {
  return [...drivers]
    .filter((d) => Number.isFinite(d.share))
    .sort((a, b) => b.share - a.share || Math.abs(b.correlation ?? 0) - Math.abs(a.correlation ?? 0) || a.label.localeCompare(b.label));
}

function directionOf(c: number | null | undefined): DriverBar['direction'] {
  if (c == null || !Number.isFinite(c) || c === 0) return 'none';
  return c > 0 ? 'up' : 'down';
}

const ARROW = { up: '\u2191', down: '\u2193', none: '' } as const;

export function driversGeometry(input: DriversInput): DriversGeometry {
  const width = Math.max(240, input.width);
  const ranked = rankDrivers(input.drivers);
  const maxBars = Math.max(1, input.maxBars ?? 8);
  let shown: Array<DriverDatum & { other?: boolean }> = ranked;
  if (ranked.length > maxBars) {
    const rest = ranked.slice(maxBars - 1);
    shown = [
      ...ranked.slice(0, maxBars - 1),
      { id: '__other', label: `Other (${rest.length} inputs)`, share: rest.reduce((s, d) => s + Math.max(0, d.share), 0), correlation: null, other: true },
    ];
  }
  const labelSize = 12;
  const longest = Math.max(0, ...shown.map((d) => textWidth(d.label, labelSize, 'sans')));
  // Labels beside the bars when they fit in 40 % of the width; otherwise above them.
  const layout: DriversGeometry['layout'] = width >= 520 && longest + 8 <= width * 0.4 ? 'side' : 'stacked';
  const labelWidth = layout === 'side' ? Math.min(Math.round(width * 0.4), Math.max(80, Math.ceil(longest) + 8)) : 0;
  const valueWidth = 74;
  const margin = { top: 6, right: 12 + valueWidth, bottom: 40, left: 12 + labelWidth };
  const rowH = layout === 'side' ? 28 : 42;
  const box = makeBox(width, margin.top + margin.bottom + Math.max(1, shown.length) * rowH, margin);
  const maxShare = Math.max(0.0001, ...shown.map((d) => d.share));
  const x = linear([0, Math.min(1, maxShare)], [0, box.innerWidth]).nice(4);
  const barHeight = layout === 'side' ? 16 : 14;

  const bars: DriverBar[] = shown.map((d, i) => {
    const top = i * rowH;
    const barY = layout === 'side' ? top + (rowH - barHeight) / 2 : top + rowH - barHeight - 6;
    const direction = d.other ? 'none' : directionOf(d.correlation);
    const maxLabel = layout === 'side' ? labelWidth - 8 : box.innerWidth + valueWidth;
    return {
      id: d.id,
      label: d.label,
      shownLabel: fitText(d.label, maxLabel, labelSize, 'sans'),
      share: d.share,
      correlation: d.correlation ?? null,
      direction,
      rank: i + 1,
      y: top,
      barY,
      barHeight,
      barWidth: Math.max(d.share > 0 ? 1.5 : 0, x(Math.max(0, d.share))),
      valueText: `${formatPercent(Math.max(0, d.share))}${direction === 'none' ? '' : ' ' + ARROW[direction]}`,
      other: Boolean(d.other),
    };
  });

  return { box, layout, labelWidth, bars, xAxis: percentAxis(x, Math.max(2, Math.floor(box.innerWidth / 90)), 'Share of output variance'), name: input.name };
}

export function describeDrivers(g: DriversGeometry): string {
  if (!g.bars.length) return `No drivers to show for ${g.name}.`;
  const top = g.bars.slice(0, 3).map((b) => `${b.label} ${formatPercent(b.share)}${b.direction === 'up' ? ' (raises it)' : b.direction === 'down' ? ' (lowers it)' : ''}`);
  return `What moves ${g.name} most, by share of its variance: ${top.join('; ')}${g.bars.length > 3 ? `; ${g.bars.length - 3} more` : ''}.`;
}

export function driversScene(g: DriversGeometry, text?: Partial<SceneText>): Scene {
  const { box } = g;
  const h = box.innerHeight;
  const nodes: SceneNode[] = barValueAxisNodes(box, g.xAxis);
  nodes.push({ type: 'line', key: 'base', x1: 0.5, x2: 0.5, y1: 0, y2: h, stroke: chartColors.axis, strokeWidth: 1 });
  for (const b of g.bars) {
    const fill = b.other ? chartColors.axis : b.direction === 'down' ? OKABE_ITO.bluishGreen : chartColors.series;
    nodes.push({ type: 'rect', key: `bar-${b.id}`, x: 1, y: r2(b.barY), width: r2(b.barWidth), height: b.barHeight, fill, rx: 1.5 });
    const labelY = g.layout === 'side' ? b.barY + b.barHeight / 2 : b.barY - 5;
    nodes.push({
      type: 'text',
      key: `lab-${b.id}`,
      x: g.layout === 'side' ? -8 : 1,
      y: r2(labelY),
      text: b.shownLabel,
      font: 'sans',
      size: 12,
      fill: chartColors.strong,
      anchor: g.layout === 'side' ? 'end' : 'start',
      baseline: g.layout === 'side' ? 'middle' : 'alphabetic',
    });
    nodes.push({ type: 'text', key: `val-${b.id}`, x: r2(b.barWidth + 6), y: r2(b.barY + b.barHeight / 2), text: b.valueText, font: 'mono', size: 11, fill: chartColors.text, baseline: 'middle' });
  }
  return {
    width: box.width,
    height: box.height,
    title: text?.title ?? `Drivers of ${g.name}`,
    description: text?.description ?? describeDrivers(g),
    background: chartColors.background,
    patterns: [],
    nodes: translate(nodes, box.margin.left, box.margin.top),
  };
}
