/** Geometry for the fit plots: a density overlay on the data's histogram, and a Q–Q plot. Pure, no React. */
import { scaleLinear } from 'd3-scale';
import type { HistogramBin } from '@/lib/core/engine/stats';
import { lawPdf, qqPoints, type Law, type LawParams } from './fit';

export interface PlotBox {
  width: number;
  height: number;
  margin: { top: number; right: number; bottom: number; left: number };
}

export const PLOT: PlotBox = { width: 320, height: 200, margin: { top: 10, right: 10, bottom: 28, left: 44 } };

export interface DensityOverlay {
  bars: { x: number; y: number; w: number; h: number }[];
  curve: string;
  xTicks: { x: number; label: string }[];
}

const fmt = (v: number) => +v.toPrecision(4) + '';

/** Histogram scaled to a density (count / (n · width)) with the fitted density drawn over it. */
export function densityOverlay(bins: readonly HistogramBin[], n: number, law: Law, params: LawParams, box: PlotBox = PLOT): DensityOverlay {
  const lo = bins[0].x0;
  const hi = bins[bins.length - 1].x1;
  const pad = (hi - lo) * 0.05 || 1;
  const x = scaleLinear().domain([lo - pad, hi + pad]).range([box.margin.left, box.width - box.margin.right]);
  const dens = bins.map((b) => (b.x1 > b.x0 ? b.count / (n * (b.x1 - b.x0)) : 0));
  const xs = Array.from({ length: 121 }, (_, i) => lo - pad + ((hi - lo + 2 * pad) * i) / 120);
  const ys = xs.map((v) => lawPdf(law, params, v)).map((v) => (Number.isFinite(v) ? v : 0));
  const top = Math.max(...dens, ...ys) * 1.05 || 1;
  const y = scaleLinear().domain([0, top]).range([box.height - box.margin.bottom, box.margin.top]);
  return {
    bars: bins.map((b, i) => ({ x: x(b.x0), y: y(dens[i]), w: Math.max(0, x(b.x1) - x(b.x0) - 1), h: y(0) - y(dens[i]) })),
    curve: xs.map((v, i) => `${i ? 'L' : 'M'}${x(v).toFixed(2)},${y(Math.min(ys[i], top)).toFixed(2)}`).join(''),
    xTicks: x.ticks(4).map((t) => ({ x: x(t), label: fmt(t) })),
  };
}

export interface QqPlot {
  points: { cx: number; cy: number }[];
  line: { x1: number; y1: number; x2: number; y2: number };
  xTicks: { x: number; label: string }[];
  yTicks: { y: number; label: string }[];
}

/** Observed order statistics against the fitted law's quantiles at (i − 0.5)/n, with the identity line. */
export function qqPlot(sorted: readonly number[], law: Law, params: LawParams, box: PlotBox = PLOT): QqPlot {
  const pts = qqPoints(sorted, law, params).filter((p) => Number.isFinite(p.theoretical));
  const all = pts.flatMap((p) => [p.theoretical, p.observed]);
  const lo = Math.min(...all);
  const hi = Math.max(...all);
  const pad = (hi - lo) * 0.05 || 1;
  const x = scaleLinear().domain([lo - pad, hi + pad]).range([box.margin.left, box.width - box.margin.right]);
  const y = scaleLinear().domain([lo - pad, hi + pad]).range([box.height - box.margin.bottom, box.margin.top]);
  return {
    points: pts.map((p) => ({ cx: x(p.theoretical), cy: y(p.observed) })),
    line: { x1: x(lo - pad), y1: y(lo - pad), x2: x(hi + pad), y2: y(hi + pad) },
    xTicks: x.ticks(4).map((t) => ({ x: x(t), label: fmt(t) })),
    yTicks: y.ticks(4).map((t) => ({ y: y(t), label: fmt(t) })),
  };
}
