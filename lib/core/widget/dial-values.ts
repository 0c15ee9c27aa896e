// Dial values a viewer enters: typed numbers are checked against the author's range, and start
// values come from the author's defaults (or values handed in, when they are in range).
import { decimalsForStep, formatFixed } from '@/lib/core/charts/format';

export interface DialSpec {
  id: string;
  label: string;
  unit: string;
  min: number;
  max: number;
  step: number;
  default: number;
}

export type ParsedDial = { ok: true; value: number } | { ok: false; message: string };

/** Decimals in the shortest text of a number the author typed (0.05 → 2, 24.15 → 2, 600 → 0). */
function typedDecimals(v: number): number {
  const m = /\.(\d+)$/.exec(String(v));
  return m ? m[1].length : 0;
}

/** Decimals that show every step of the dial and its end points. */
export function dialDecimals(d: Pick<DialSpec, 'step' | 'min' | 'max'>): number {
  return Math.min(8, Math.max(decimalsForStep(d.step), typedDecimals(d.step), typedDecimals(d.min), typedDecimals(d.max)));
}

/** The dial's value as text (plain ASCII digits, so a number field accepts it). */
export function dialText(d: DialSpec, v: number): string {
  return v.toFixed(dialDecimals(d));
}

/** The dial's value as printed beside it, with grouping and a true minus. */
export function dialDisplay(d: DialSpec, v: number): string {
  return formatFixed(v, dialDecimals(d));
}

/** Reads a typed value: a decimal point or comma, within the dial's range. */
export function parseDialInput(text: string, d: DialSpec): ParsedDial {
  const t = text.trim().replace(/\s/g, '').replace(',', '.').replace('\u2212', '-');
  const range = `from ${dialDisplay(d, d.min)} to ${dialDisplay(d, d.max)}${d.unit ? ` ${d.unit}` : ''}`;
  if (!t) return { ok: false, message: `Enter a number ${range}.` };
  if (!/^[-+]?(\d+\.?\d*|\.\d+)(e[-+]?\d+)?$/i.test(t)) return { ok: false, message: `“${text.trim()}” is not a number. Enter a number ${range}.` };
  const v = Number(t);
  if (!Number.isFinite(v)) return { ok: false, message: `Enter a number ${range}.` };
  const slack = 1e-9 * (d.max - d.min);
  if (v < d.min - slack || v > d.max + slack) return { ok: false, message: `${dialDisplay(d, v)} is outside the range. Enter a number ${range}.` };
  return { ok: true, value: Math.min(d.max, Math.max(d.min, v)) };
}

/** Start values: the author's defaults, replaced by given values that are finite and in range. */
export function initialDialValues(dials: readonly DialSpec[], given?: Record<string, number>): Record<string, number> {
  const out: Record<string, number> = {};
  for (const d of dials) {
    const g = given?.[d.id];
    out[d.id] = typeof g === 'number' && Number.isFinite(g) && g >= d.min && g <= d.max ? g : d.default;
  }
  return out;
}

/** True when every dial sits at the author's value. */
export function atDefaults(dials: readonly DialSpec[], values: Record<string, number>): boolean {
  return dials.every((d) => values[d.id] === d.default);
}
