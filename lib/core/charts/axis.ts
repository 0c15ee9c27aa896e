import { tickIncrement, ticks } from 'd3-array';
import { compactFor, decimalsForStep, formatValue, isCurrency, unitFactor } from './format';

/** One tick on an axis: its value, its pixel position and its printed label. */
export interface Tick {
  value: number;
  pos: number;
  label: string;
}

export interface Axis {
  ticks: Tick[];
  /** Axis title with the unit, e.g. "Gap (mm)" or "Total cost (EUR)". */
  title: string;
}

/** Inner plot area inside the margins. */
export interface Margin {
  top: number;
  right: number;
  bottom: number;
  left: number;
}

export interface Box {
  width: number;
  height: number;
  margin: Margin;
  innerWidth: number;
  innerHeight: number;
}

export function makeBox(width: number, height: number, margin: Margin): Box {
  const w = Math.max(1, Math.round(width));
  const h = Math.max(1, Math.round(height));
  return {
    width: w,
    height: h,
    margin,
    innerWidth: Math.max(10, w - margin.left - margin.right),
    innerHeight: Math.max(10, h - margin.top - margin.bottom),
  };
}

/** About one x tick per 90 px (at least 3), so labels never collide at 360 px. */
export function xTickCount(innerWidth: number, unit?: string | null): number {
  const per = isCurrency(unit) ? 100 : 84;
  return Math.max(3, Math.min(10, Math.floor(innerWidth / per)));
}

export function yTickCount(innerHeight: number): number {
  return Math.max(3, Math.min(8, Math.floor(innerHeight / 44)));
}

/** Axis title carrying the unit: "Gap (mm)"; no brackets when there is no unit. */
export function axisTitle(name: string, unit?: string | null): string {
  const u = (unit ?? '').trim();
  return u ? `${name} (${u})` : name;
}

/** What an axis needs of a scale: positions and ticks (linear() below, or d3-scale's scaleLinear). */
export interface TickScale {
  (x: number): number;
  ticks(count?: number): number[];
}

/**
 * Ticks for a linear scale. Money ticks carry their symbol and a shared k/M scale ("€1.2 M");
 * other units are left off the ticks and named in the axis title instead.
 */
export function linearAxis(scale: TickScale, count: number, name: string, unit?: string | null): Axis {
  const values = scale.ticks(count);
  const maxAbs = values.reduce((m, v) => Math.max(m, Math.abs(v)), 0);
  const compact = compactFor(maxAbs, unit);
  const step = values.length > 1 ? Math.abs(values[1] - values[0]) : Math.abs(values[0] ?? 1) || 1;
  const decimals = decimalsForStep((step * unitFactor(unit)) / compact.divisor);
  const money = isCurrency(unit);
  return {
    ticks: values.map((value) => ({
      value,
      pos: scale(value),
      label: formatValue(value, money ? unit : null, { decimals, compact }),
    })),
    title: axisTitle(name, unit),
  };
}

/** Percent ticks for a probability or share axis (domain in 0..1). */
export function percentAxis(scale: TickScale, count: number, name: string): Axis {
  const values = scale.ticks(count);
  const step = values.length > 1 ? Math.abs(values[1] - values[0]) * 100 : 10;
  const decimals = decimalsForStep(step);
  return {
    ticks: values.map((value) => ({ value, pos: scale(value), label: formatValue(value * 100, null, { decimals, compact: false }) + '\u00a0%' })),
    title: name,
  };
}

/**
 * A padded, nice x domain covering the data and every reference value (limits, budget, markers),
 * so limit lines are never drawn outside the plot.
 */
export function coveringDomain(values: readonly number[], padFraction = 0.04): [number, number] {
  const finite = values.filter((v) => Number.isFinite(v));
  if (!finite.length) return [0, 1];
  let lo = Math.min(...finite);
  let hi = Math.max(...finite);
  if (lo === hi) {
    const d = Math.abs(lo) * 0.05 || 1;
    lo -= d;
    hi += d;
  }
  const pad = (hi - lo) * padFraction;
  return [lo - pad, hi + pad];
}

/**
 * A linear map from a domain to a range, with ticks and nice bounds: the part of d3-scale's scaleLinear the charts
 * use, written out with its arithmetic (d3-scale 4.0.2, src/continuous.js and src/linear.js, ISC licence), so that
 * pages showing charts (the embed above all) need not carry d3-scale's colour interpolation and number formatting.
 * Ticks and nice steps come from d3-array. tests/unit/charts/linear-scale.test.ts compares it with d3-scale.
 */
export interface LinearScale {
  (x: number): number;
  /** The domain's value at a range position. */
  invert(y: number): number;
  domain(): [number, number];
  range(): [number, number];
  /** About `count` round values across the domain (d3-array's ticks). */
  ticks(count?: number): number[];
  /** Widen the domain to round bounds for about `count` ticks; returns this scale. */
  nice(count?: number): LinearScale;
}

/** t in [0, 1] over [a, b]: d3-scale's normalize (a constant 0.5 for an empty interval). */
function normalize(a: number, b: number): (x: number) => number {
  const span = b - a;
  if (span) return (x) => (x - a) / span;
  const c = Number.isNaN(span) ? NaN : 0.5;
  return () => c;
}

/** d3-scale's bimap with d3-interpolate's interpolateNumber: a * (1 - t) + b * t. */
function bimap(domain: [number, number], range: [number, number]): (x: number) => number {
  let [d0, d1] = domain;
  let [r0, r1] = range;
  if (d1 < d0) {
    [d0, d1] = [d1, d0];
    [r0, r1] = [r1, r0];
  }
  const t = normalize(d0, d1);
  return (x) => {
    const u = t(x);
    return r0 * (1 - u) + r1 * u;
  };
}

/** A linear scale over a domain mapped to [0, length]. */
export function linear(domain: [number, number], range: [number, number]): LinearScale {
  let d: [number, number] = [+domain[0], +domain[1]];
  const r: [number, number] = [range[0], range[1]];
  let forward = bimap(d, r);
  let backward = bimap(r, d);
  const scale = ((x: number) => (x == null || Number.isNaN(+x) ? NaN : forward(+x))) as LinearScale;
  scale.invert = (y) => backward(+y);
  scale.domain = () => [d[0], d[1]];
  scale.range = () => [r[0], r[1]];
  scale.ticks = (count = 10) => ticks(d[0], d[1], count);
  scale.nice = (count = 10) => {
    let i0 = 0;
    let i1 = 1;
    let start = d[0];
    let stop = d[1];
    let prestep: number | undefined;
    if (stop < start) {
      [start, stop] = [stop, start];
      [i0, i1] = [i1, i0];
    }
    for (let maxIter = 10; maxIter-- > 0; ) {
      const step = tickIncrement(start, stop, count);
      if (step === prestep) {
        const next: [number, number] = [d[0], d[1]];
        next[i0] = start;
        next[i1] = stop;
        d = next;
        forward = bimap(d, r);
        backward = bimap(r, d);
        return scale;
      } else if (step > 0) {
        start = Math.floor(start / step) * step;
        stop = Math.ceil(stop / step) * step;
      } else if (step < 0) {
        start = Math.ceil(start * step) / step;
        stop = Math.floor(stop * step) / step;
      } else break;
      prestep = step;
    }
    return scale;
  };
  return scale;
}
