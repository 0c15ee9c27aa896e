import { describe, expect, it } from 'vitest';
import { brandColors, darkenTo, DEFAULT_BRAND, normaliseHex } from '@/lib/core/widget/brand';
import { contrastRatio } from '@/lib/core/charts/palette';

describe('firm brand colours', () => {
  it('normalises hex colours and refuses anything else', () => {
    expect(normaliseHex('#ABC')).toBe('#aabbcc');
    expect(normaliseHex('1f887b')).toBe('#1f887b');
    expect(normaliseHex('teal')).toBeNull();
    expect(normaliseHex('#12345')).toBeNull();
    expect(normaliseHex('url(javascript:x)')).toBeNull();
    expect(brandColors('not a colour').accentText).toBe(brandColors(DEFAULT_BRAND).accentText);
  });

  it('keeps a dark brand colour as it is', () => {
    const b = brandColors('#1d3557');
    expect(b.accent).toBe('#1d3557');
    expect(b.accentText).toBe('#1d3557');
    expect(b.onAccent).toBe('#ffffff');
  });

  it('darkens a light brand colour until text and marks are readable on white', () => {
    for (const light of ['#ffd166', '#a8dadc', '#ffffff', '#f4a261', '#e9c46a']) {
      const b = brandColors(light);
      expect(contrastRatio(b.accentText, '#ffffff'), light).toBeGreaterThanOrEqual(4.5);
      expect(contrastRatio(b.accent, '#ffffff'), light).toBeGreaterThanOrEqual(3);
      // Only as dark as needed: one step lighter would fail.
      expect(contrastRatio(b.accent, '#ffffff')).toBeLessThan(3.6);
    }
    expect(darkenTo('#ffffff', 21)).toBe('#000000');
  });

  it('picks the text colour that contrasts more on the accent', () => {
    const b = brandColors('#f4a261');
    expect(contrastRatio(b.onAccent, b.accent)).toBeGreaterThanOrEqual(contrastRatio(b.onAccent === '#ffffff' ? '#141c22' : '#ffffff', b.accent));
  });
});
