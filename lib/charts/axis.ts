import { scaleLinear, type ScaleLinear } from 'd3-scale';
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

/**
 * Ticks for a linear scale. Money ticks carry their symbol and a shared k/M scale ("€1.2 M");
 * other units are left off the ticks and named in the axis title instead.
 */
export function linearAxis(scale: ScaleLinear<number, number>, count: number, name: string, unit?: string | null): Axis {
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
export function percentAxis(scale: ScaleLinear<number, number>, count: number, name: string): Axis {
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

/** A linear scale over a domain mapped to [0, length]. */
export function linear(domain: [number, number], range: [number, number]): ScaleLinear<number, number> {
  return scaleLinear().domain(domain).range(range);
}
