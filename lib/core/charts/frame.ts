import type { Axis, Box } from './axis';
import { chartColors } from './palette';
import { r2, type SceneNode } from './scene';

/** Axis lines, ticks, grid and titles shared by the x-y charts. */
export function axesNodes(box: Box, xAxis: Axis, yAxis: Axis | null, opts: { yGrid?: boolean } = {}): SceneNode[] {
  const { innerWidth: w, innerHeight: h } = box;
  const nodes: SceneNode[] = [];
  if (yAxis) {
    for (const t of yAxis.ticks) {
      if (opts.yGrid !== false) nodes.push({ type: 'line', key: `yg${t.value}`, x1: 0, x2: w, y1: r2(t.pos), y2: r2(t.pos), stroke: chartColors.grid, strokeWidth: 1 });
      nodes.push({ type: 'text', key: `yt${t.value}`, x: -6, y: r2(t.pos), text: t.label, font: 'mono', size: 10.5, fill: chartColors.text, anchor: 'end', baseline: 'middle' });
    }
  }
  nodes.push({ type: 'line', key: 'xaxis', x1: 0, x2: w, y1: h + 0.5, y2: h + 0.5, stroke: chartColors.axis, strokeWidth: 1 });
  for (const t of xAxis.ticks) {
    nodes.push({ type: 'line', key: `xk${t.value}`, x1: r2(t.pos), x2: r2(t.pos), y1: h, y2: h + 5, stroke: chartColors.axis, strokeWidth: 1 });
    nodes.push({ type: 'text', key: `xt${t.value}`, x: r2(t.pos), y: h + 8, text: t.label, font: 'mono', size: 10.5, fill: chartColors.text, anchor: 'middle', baseline: 'hanging' });
  }
  nodes.push({ type: 'text', key: 'xtitle', x: w / 2, y: h + 38, text: xAxis.title, font: 'sans', size: 11.5, fill: chartColors.text, anchor: 'middle', weight: 500 });
  if (yAxis?.title)
    nodes.push({ type: 'text', key: 'ytitle', x: -box.margin.left + 12, y: h / 2, text: yAxis.title, font: 'sans', size: 11.5, fill: chartColors.text, anchor: 'middle', weight: 500, rotate: -90 });
  return nodes;
}

/** The value axis of the horizontal bar charts (drivers, ranges): grid lines across the plot, labels and title below. */
export function barValueAxisNodes(box: Box, xAxis: Axis): SceneNode[] {
  const h = box.innerHeight;
  const nodes: SceneNode[] = [];
  for (const t of xAxis.ticks) {
    nodes.push({ type: 'line', key: `g${t.value}`, x1: r2(t.pos), x2: r2(t.pos), y1: 0, y2: h, stroke: chartColors.grid, strokeWidth: 1 });
    nodes.push({ type: 'text', key: `t${t.value}`, x: r2(t.pos), y: h + 6, text: t.label, font: 'mono', size: 10.5, fill: chartColors.text, anchor: 'middle', baseline: 'hanging' });
  }
  nodes.push({ type: 'text', key: 'xtitle', x: box.innerWidth / 2, y: h + 32, text: xAxis.title, font: 'sans', size: 11.5, fill: chartColors.text, anchor: 'middle', weight: 500 });
  return nodes;
}

export interface SceneText {
  title: string;
  description: string;
}

/** Shifts top-level nodes into the plot area (renderers apply it as a group transform). */
export function translate(nodes: SceneNode[], dx: number, dy: number): SceneNode[] {
  return [{ type: 'group', key: 'frame', children: nodes, dx, dy }];
}
