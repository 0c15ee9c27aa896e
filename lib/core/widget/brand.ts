// The firm's accent colour, made safe to use: a colour a firm picks may be too light for text or
// even for a border on white, so darker variants are derived until they meet WCAG contrast.
import { contrastRatio } from '@/lib/core/charts/palette';

export interface BrandColors {
  /** For borders, slider thumbs and bars: at least 3:1 on white (WCAG 2.1 §1.4.11). */
  accent: string;
  /** For text and focus rings: at least 4.5:1 on white (WCAG 2.1 §1.4.3). */
  accentText: string;
  /** Text on an `accent` background: white or ink, whichever contrasts more. */
  onAccent: string;
}

/** Stochos's own accent (accent-700), used when a firm has none or an unreadable value. */
export const DEFAULT_BRAND = '#14574f';

/** "#abc" or "#aabbcc" (any case) to "#aabbcc"; null for anything else. */
export function normaliseHex(input: string | null | undefined): string | null {
  const s = (input ?? '').trim();
  const m = /^#?([0-9a-f]{3}|[0-9a-f]{6})$/i.exec(s);
  if (!m) return null;
  const h = m[1].length === 3 ? [...m[1]].map((c) => c + c).join('') : m[1];
  return `#${h.toLowerCase()}`;
}

function mixWithBlack(hex: string, t: number): string {
  const n = parseInt(hex.slice(1), 16);
  const ch = [(n >> 16) & 255, (n >> 8) & 255, n & 255].map((c) => Math.round(c * (1 - t)));
  return `#${ch.map((c) => c.toString(16).padStart(2, '0')).join('')}`;
}

/** The colour, darkened in small steps until it reaches `ratio` against white. */
export function darkenTo(hex: string, ratio: number): string {
  for (let t = 0; t <= 1.0001; t += 0.025) {
    const c = mixWithBlack(hex, Math.min(1, t));
    if (contrastRatio(c, '#ffffff') >= ratio) return c;
  }
  return '#000000';
}

export function brandColors(input: string | null | undefined): BrandColors {
  const hex = normaliseHex(input) ?? DEFAULT_BRAND;
  const accent = darkenTo(hex, 3);
  const accentText = darkenTo(hex, 4.5);
  const onAccent = contrastRatio(accent, '#ffffff') >= contrastRatio(accent, '#141c22') ? '#ffffff' : '#141c22';
  return { accent, accentText, onAccent };
}
