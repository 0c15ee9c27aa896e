// Chart colours. Series colours come from the Okabe–Ito set (Okabe & Ito 2008, "Color Universal Design"),
// chosen so that they stay distinct for the common forms of colour-vision deficiency. Limits and
// out-of-specification areas are also marked with a hatch pattern and a dashed line, never by colour alone.
// Text colours are the interface's ink neutrals, which meet WCAG AA (4.5:1) on white.

/** The Okabe–Ito colours we use (hex as published). */
export const OKABE_ITO = {
  black: '#000000',
  orange: '#E69F00',
  skyBlue: '#56B4E9',
  bluishGreen: '#009E73',
  yellow: '#F0E442',
  blue: '#0072B2',
  vermillion: '#D55E00',
  reddishPurple: '#CC79A7',
} as const;

export const chartColors = {
  background: '#ffffff',
  /** Tick labels and axis titles (ink-600, 7.8:1 on white). */
  text: '#445461',
  /** Headline text inside charts (ink-900). */
  strong: '#141c22',
  /** Axis line and tick marks (ink-400, 3.5:1: a graphical object needs 3:1). */
  axis: '#7b8b97',
  /** Grid lines, deliberately faint. */
  grid: '#e8ecef',
  /** Main series: histogram bars in specification, the S-curve, driver bars, scatter points. */
  series: OKABE_ITO.blue,
  /** A lighter fill under the S-curve. */
  seriesTint: '#cfe3f1',
  /** Out of specification, over budget: vermillion, always with the hatch. */
  out: OKABE_ITO.vermillion,
  /** Tinted band behind the out-of-specification region. */
  outTint: '#fbe7d9',
  /** Limit lines and their labels (dark vermillion, 6.1:1 on white, so the label is readable text). */
  limit: '#a64400',
  /** Percentile markers on the S-curve (bluish green is 3.4:1; labels use `markerText`). */
  marker: OKABE_ITO.bluishGreen,
  markerText: '#00704f',
  /** Budget, base estimate and sum of most-likely reference lines (labels in `refText`). */
  reference: OKABE_ITO.reddishPurple,
  refText: '#8a3a68',
  /** Mean line on the spread chart. */
  mean: '#141c22',
  /** The pointer readout's crosshair. */
  crosshair: '#33414c',
} as const;

export type ChartColor = keyof typeof chartColors;

/** Hatch used for out-of-specification regions: stripes at 45°, vermillion on its tint. */
export const HATCH = { spacing: 6, strokeWidth: 1.6, angle: 45 } as const;

/** Families by name so the SVG renders the same in the browser, in a download and in the server PDF. */
export const CHART_FONTS = {
  sans: "'IBM Plex Sans', 'IBM Plex Sans Fallback', system-ui, sans-serif",
  mono: "'IBM Plex Mono', 'IBM Plex Mono Fallback', ui-monospace, monospace",
} as const;

/** Relative luminance and contrast ratio (WCAG 2.1 §1.4.3 definitions). */
export function relativeLuminance(hex: string): number {
  const m = /^#?([0-9a-f]{6})$/i.exec(hex.trim());
  if (!m) throw new Error(`Not a #rrggbb colour: ${hex}`);
  const n = parseInt(m[1], 16);
  const ch = [(n >> 16) & 255, (n >> 8) & 255, n & 255].map((c) => {
    const s = c / 255;
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  });
  return 0.2126 * ch[0] + 0.7152 * ch[1] + 0.0722 * ch[2];
}

export function contrastRatio(a: string, b: string): number {
  const la = relativeLuminance(a);
  const lb = relativeLuminance(b);
  return (Math.max(la, lb) + 0.05) / (Math.min(la, lb) + 0.05);
}
