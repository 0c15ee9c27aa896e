import { describe, expect, it } from 'vitest';
import { chartColors, contrastRatio, OKABE_ITO, relativeLuminance } from '@/lib/core/charts/palette';

describe('chart palette', () => {
  it('computes WCAG contrast ratios', () => {
    // WCAG 2.1 definition: black on white is 21:1, a colour on itself 1:1.
    expect(contrastRatio('#000000', '#ffffff')).toBeCloseTo(21, 10);
    expect(contrastRatio('#777777', '#777777')).toBe(1);
    // #767676 on white is the well-known lightest grey passing AA for body text (about 4.54:1; common practice, no source).
    expect(contrastRatio('#767676', '#ffffff')).toBeGreaterThan(4.5);
    expect(contrastRatio('#777777', '#ffffff')).toBeLessThan(4.5);
    expect(() => relativeLuminance('teal')).toThrow();
  });

  it('text colours meet WCAG AA (4.5:1) on white', () => {
    for (const key of ['text', 'strong', 'limit', 'markerText', 'refText'] as const) {
      expect(contrastRatio(chartColors[key], chartColors.background), key).toBeGreaterThanOrEqual(4.5);
    }
  });

  it('graphical marks meet the 3:1 non-text contrast of WCAG 2.1 §1.4.11', () => {
    for (const key of ['axis', 'series', 'out', 'limit', 'marker', 'reference', 'mean', 'crosshair'] as const) {
      expect(contrastRatio(chartColors[key], chartColors.background), key).toBeGreaterThanOrEqual(3);
    }
  });

  it('series colours come from the Okabe–Ito set', () => {
    const set = new Set(Object.values(OKABE_ITO).map((c) => c.toLowerCase()));
    for (const key of ['series', 'out', 'marker', 'reference'] as const) expect(set.has(chartColors[key].toLowerCase()), key).toBe(true);
  });

  it('in-spec and out-of-spec fills differ in lightness, not only in hue', () => {
    // Blue and vermillion also differ for deuteranopes; the hatch carries the difference in greyscale too.
    const a = relativeLuminance(chartColors.series);
    const b = relativeLuminance(chartColors.out);
    expect(Math.abs(a - b)).toBeGreaterThan(0.04);
  });
});
