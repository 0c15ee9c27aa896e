// Number formatting for charts, headline figures and the PDF. Locale-independent on purpose:
// the same run must print the same text in the browser, in the SVG download and in the server's PDF.

/**
 * No-break space: the thousands separator and the gap before a unit. ISO 80000 prefers a narrow space,
 * but the shipped IBM Plex latin subsets have no U+202F or (in Mono) U+2009, so the one space every
 * face has keeps numbers in one font, in the browser and in the PDF.
 */
export const NBSP = '\u00a0';
/** Typographic minus sign (U+2212), so negative figures line up with positive ones in tabular fonts. */
export const MINUS = '\u2212';

const PREFIX_SYMBOLS: Record<string, string> = {
  $: '$',
  '€': '€',
  '£': '£',
  '¥': '¥',
  USD: '$',
  EUR: '€',
  GBP: '£',
  JPY: '¥',
};

/** How a unit is written next to a number. Currency symbols go before the number, everything else after. */
export interface UnitStyle {
  prefix: string;
  suffix: string;
}

const MAGNITUDE: Record<string, number> = { k: 1e3, K: 1e3, M: 1e6, MM: 1e6, mn: 1e6, bn: 1e9 };

/**
 * A money unit, possibly in thousands or millions ("kEUR", "k€", "MUSD"): its symbol and the factor that
 * turns a model value into currency units. Null for anything that is not money we know.
 */
export function currencyOf(unit: string | null | undefined): { symbol: string; factor: number } | null {
  const u = (unit ?? '').trim();
  if (!u) return null;
  const direct = PREFIX_SYMBOLS[u] ?? PREFIX_SYMBOLS[u.toUpperCase()];
  if (direct) return { symbol: direct, factor: 1 };
  const m = /^(k|K|M|MM|mn|bn)\s?(.+)$/.exec(u);
  if (m) {
    const sym = PREFIX_SYMBOLS[m[2]] ?? PREFIX_SYMBOLS[m[2].toUpperCase()];
    if (sym) return { symbol: sym, factor: MAGNITUDE[m[1]] };
  }
  return null;
}

/** Factor from model values to printed values (1000 for "kEUR", else 1). */
export function unitFactor(unit: string | null | undefined): number {
  return currencyOf(unit)?.factor ?? 1;
}

export function unitStyle(unit: string | null | undefined): UnitStyle {
  const u = (unit ?? '').trim();
  if (!u) return { prefix: '', suffix: '' };
  const cur = currencyOf(u);
  if (cur) return { prefix: cur.symbol, suffix: '' };
  return { prefix: '', suffix: NBSP + u };
}

/** True when the unit is money (compact k/M suffixes make sense). */
export function isCurrency(unit: string | null | undefined): boolean {
  return currencyOf(unit) !== null;
}

function groupDigits(intPart: string): string {
  // Group only from five digits on (ISO practice: 1000 stays, 10 000 is grouped).
  if (intPart.length <= 4) return intPart;
  let out = '';
  for (let i = 0; i < intPart.length; i++) {
    if (i > 0 && (intPart.length - i) % 3 === 0) out += NBSP;
    out += intPart[i];
  }
  return out;
}

/** Fixed-point text with grouped thousands and a true minus sign; -0 prints as 0. */
export function formatFixed(value: number, decimals: number): string {
  if (!Number.isFinite(value)) return Number.isNaN(value) ? '—' : value > 0 ? '∞' : MINUS + '∞';
  const d = Math.max(0, Math.min(12, Math.round(decimals)));
  let s = Math.abs(value).toFixed(d);
  const negative = value < 0 && Number(s) !== 0;
  // toFixed switches to exponent notation above 1e21; such figures are not engineering quantities.
  if (s.includes('e')) return (negative ? MINUS : '') + s;
  const [i, f] = s.split('.');
  s = groupDigits(i) + (f ? '.' + f : '');
  return (negative ? MINUS : '') + s;
}

/** Decimals needed to show `step` without losing its significant digit (as d3-format's precisionFixed). */
export function decimalsForStep(step: number): number {
  if (!Number.isFinite(step) || step <= 0) return 0;
  return Math.max(0, -Math.floor(Math.log10(step) + 1e-9));
}

/** Decimals that give `sig` significant digits for a value of this size. */
export function decimalsForSignificant(value: number, sig: number): number {
  if (!Number.isFinite(value) || value === 0) return Math.max(0, sig - 1);
  const mag = Math.floor(Math.log10(Math.abs(value)));
  return Math.max(0, sig - 1 - mag);
}

export interface Compact {
  divisor: number;
  symbol: string;
}

const NO_COMPACT: Compact = { divisor: 1, symbol: '' };

/** k / M / bn for money of that size; plain numbers otherwise. */
export function compactFor(maxAbsRaw: number, unit: string | null | undefined): Compact {
  const cur = currencyOf(unit);
  if (!cur) return NO_COMPACT;
  const maxAbs = maxAbsRaw * cur.factor;
  if (maxAbs >= 1e9) return { divisor: 1e9, symbol: 'bn' };
  if (maxAbs >= 1e6) return { divisor: 1e6, symbol: 'M' };
  if (maxAbs >= 1e4) return { divisor: 1e3, symbol: 'k' };
  return NO_COMPACT;
}

export interface FormatOptions {
  /** Fixed decimals (after any compact division). */
  decimals?: number;
  /** Significant digits when decimals is not given (default 4). */
  significant?: number;
  /** Use k/M/bn for currency amounts (default true). */
  compact?: boolean | Compact;
  /** Leave the unit off. */
  bare?: boolean;
  /** Drop trailing zeros of the fraction (for values an author typed, e.g. limits: "0.08 mm"). */
  trim?: boolean;
}

/** A value with its unit: "12.40 mm", "€1.25 M", "−0.031 mm". */
export function formatValue(value: number, unit?: string | null, opts: FormatOptions = {}): string {
  const compact: Compact =
    opts.compact === false ? NO_COMPACT : typeof opts.compact === 'object' ? opts.compact : compactFor(Math.abs(value), unit);
  const v = (value * unitFactor(unit)) / compact.divisor;
  const decimals = opts.decimals ?? decimalsForSignificant(v, opts.significant ?? 4);
  let num = formatFixed(v, decimals);
  if (opts.trim && num.includes('.')) num = num.replace(/0+$/, '').replace(/\.$/, '');
  if (opts.bare) return compact.symbol ? num + NBSP + compact.symbol : num;
  const { prefix, suffix } = unitStyle(unit);
  const compactText = compact.symbol ? NBSP + compact.symbol : '';
  if (prefix) {
    const neg = num.startsWith(MINUS);
    return (neg ? MINUS : '') + prefix + (neg ? num.slice(1) : num) + compactText;
  }
  return num + compactText + suffix;
}

/** A probability as a percentage: 0.8 → "80 %", 0.0312 → "3.1 %", 0.00004 → "0.004 %". */
export function formatPercent(p: number, opts: { decimals?: number } = {}): string {
  if (!Number.isFinite(p)) return '—';
  const pct = p * 100;
  let decimals = opts.decimals;
  if (decimals === undefined) {
    const a = Math.abs(pct);
    decimals = a === 0 || a >= 10 ? 0 : a >= 1 ? 1 : decimalsForSignificant(a, 1);
    // 99.97 % must not print as 100 %: keep digits until the value differs from 100.
    if (a > 99 && a < 100) decimals = Math.max(1, decimalsForSignificant(100 - a, 1));
  }
  return formatFixed(pct, Math.min(decimals, 6)) + NBSP + '%';
}

/** Parts per million with sensible digits: 0 → "0 ppm", 2.7 → "2.7 ppm", 2699.8 → "2 700 ppm". */
export function formatPpm(ppm: number): string {
  if (!Number.isFinite(ppm)) return '—';
  const a = Math.abs(ppm);
  const decimals = a === 0 ? 0 : a >= 100 ? 0 : a >= 1 ? 1 : decimalsForSignificant(a, 2);
  const rounded = a >= 1000 ? Math.round(ppm / 10) * 10 : ppm;
  return formatFixed(rounded, Math.min(decimals, 6)) + NBSP + 'ppm';
}

/** "P80" for 0.8, "P97.5" for 0.975. */
export function percentileName(p: number): string {
  const pct = Math.round(p * 1000) / 10;
  return 'P' + (Number.isInteger(pct) ? pct.toFixed(0) : pct.toFixed(1));
}

/** Integer counts with grouping: 100000 → "100 000". */
export function formatCount(n: number): string {
  return formatFixed(Math.round(n), 0);
}

/** Run time: "84 ms", "1.42 s", "2 min 05 s". */
export function formatDuration(ms: number): string {
  if (!Number.isFinite(ms) || ms < 0) return '—';
  if (ms < 1000) return `${Math.round(ms)}${NBSP}ms`;
  if (ms < 60_000) return `${(ms / 1000).toFixed(ms < 10_000 ? 2 : 1)}${NBSP}s`;
  const m = Math.floor(ms / 60_000);
  const s = Math.round((ms % 60_000) / 1000);
  return `${m}${NBSP}min ${String(s).padStart(2, '0')}${NBSP}s`;
}

/** Axis labels for a set of tick values: one shared precision from the step and one compact scale. */
export function tickLabels(values: readonly number[], unit?: string | null, opts: { withUnit?: boolean } = {}): string[] {
  if (!values.length) return [];
  const maxAbs = Math.max(...values.map((v) => Math.abs(v)));
  const compact = compactFor(maxAbs, unit);
  const f = unitFactor(unit);
  const step = ((values.length > 1 ? Math.abs(values[1] - values[0]) : Math.abs(values[0]) || 1) * f) / compact.divisor;
  const decimals = decimalsForStep(step);
  const withUnit = opts.withUnit ?? true;
  return values.map((v) => formatValue(v, withUnit ? unit : null, { decimals, compact }));
}
