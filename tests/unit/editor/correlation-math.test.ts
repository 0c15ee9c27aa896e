import { describe, expect, it } from 'vitest';
import { checkCorrelation, nearestCorrelation } from '@/lib/core/engine/linalg';
import {
  cellKey,
  correlationColour,
  diffMatrices,
  identity,
  remapMatrix,
  roundMatrix,
  setSymmetric,
} from '@/components/editor/correlation-math';

describe('setSymmetric', () => {
  it('sets (i, j) and (j, i) together and leaves the input untouched', () => {
    const m = identity(3);
    const out = setSymmetric(m, 0, 2, 0.35);
    expect(out[0][2]).toBe(0.35);
    expect(out[2][0]).toBe(0.35);
    expect(out[1][2]).toBe(0);
    expect(m[0][2]).toBe(0);
  });

  it('keeps the unit diagonal locked', () => {
    const m = identity(2);
    expect(setSymmetric(m, 1, 1, 0.2)).toBe(m);
    expect(m[1][1]).toBe(1);
  });

  it('clamps to [-1, 1] and refuses non-finite values', () => {
    const m = identity(2);
    expect(setSymmetric(m, 0, 1, 1.7)[1][0]).toBe(1);
    expect(setSymmetric(m, 1, 0, -3)[0][1]).toBe(-1);
    expect(setSymmetric(m, 0, 1, Number.NaN)).toBe(m);
  });

  it('ignores indices outside the matrix', () => {
    const m = identity(2);
    expect(setSymmetric(m, 0, 5, 0.5)).toBe(m);
  });
});

describe('remapMatrix', () => {
  it('keeps entries of inputs that stay, in the new order, and starts new inputs uncorrelated', () => {
    let m = identity(3);
    m = setSymmetric(m, 0, 1, 0.4); // a-b
    m = setSymmetric(m, 1, 2, -0.2); // b-c
    const out = remapMatrix(m, ['a', 'b', 'c'], ['c', 'b', 'd']);
    expect(out).toEqual([
      [1, -0.2, 0],
      [-0.2, 1, 0],
      [0, 0, 1],
    ]);
  });
});

describe('diffMatrices after a repair', () => {
  // An inconsistent set: a strongly with b and c, but b and c strongly opposed.
  const broken = [
    [1, 0.9, 0.9],
    [0.9, 1, -0.9],
    [0.9, -0.9, 1],
  ];

  it('the repaired matrix passes the PSD check and the diff lists each changed pair once, old then new', () => {
    const before = checkCorrelation(broken);
    expect(before.positiveSemiDefinite).toBe(false);
    const repaired = roundMatrix(nearestCorrelation(broken).matrix, 4);
    // Rounding to 4 decimals could in principle push an eigenvalue just below zero; it must not here.
    expect(checkCorrelation(repaired).positiveSemiDefinite).toBe(true);
    const changes = diffMatrices(broken, repaired);
    expect(changes.map((c) => cellKey(c.i, c.j)).sort()).toEqual(['0,1', '0,2', '1,2']);
    for (const c of changes) {
      expect(c.i).toBeLessThan(c.j);
      expect(c.before).toBe(broken[c.i][c.j]);
      expect(c.after).toBe(repaired[c.i][c.j]);
    }
    // The repair pulls the b-c correlation up from -0.9 (it is the one most in conflict).
    const bc = changes.find((c) => c.i === 1 && c.j === 2)!;
    expect(bc.after).toBeGreaterThan(bc.before);
  });

  it('reports nothing for an unchanged matrix and respects the tolerance', () => {
    expect(diffMatrices(broken, broken)).toEqual([]);
    const nudged = setSymmetric(broken, 0, 1, 0.9001);
    expect(diffMatrices(broken, nudged)).toEqual([]);
    expect(diffMatrices(broken, nudged, 1e-5)).toHaveLength(1);
  });
});

describe('roundMatrix', () => {
  it('rounds off-diagonal entries and pins the diagonal to 1', () => {
    expect(roundMatrix([[0.99999, 0.123456], [0.123456, 1]], 3)).toEqual([
      [1, 0.123],
      [0.123, 1],
    ]);
  });
});

describe('correlationColour', () => {
  function contrast(bg: string, fg: string): number {
    const parse = (s: string) =>
      s.startsWith('#') ? [1, 3, 5].map((k) => parseInt(s.slice(k, k + 2), 16)) : s.replace(/rgb\(|\)/g, '').split(' ').map(Number);
    const lum = (rgb: number[]) => {
      const [r, g, b] = rgb.map((c) => {
        const x = c / 255;
        return x <= 0.03928 ? x / 12.92 : ((x + 0.055) / 1.055) ** 2.4;
      });
      return 0.2126 * r + 0.7152 * g + 0.0722 * b;
    };
    const a = lum(parse(bg));
    const b = lum(parse(fg));
    return (Math.max(a, b) + 0.05) / (Math.min(a, b) + 0.05);
  }

  it('diverges: negatives and positives get different hues and 0 is near white', () => {
    const zero = correlationColour(0).background;
    expect(zero).toBe('rgb(247 247 247)');
    expect(correlationColour(-0.8).background).not.toBe(correlationColour(0.8).background);
  });

  it('keeps the printed number at WCAG AA contrast (4.5:1) across the scale', () => {
    // WCAG 2.1 success criterion 1.4.3 (contrast minimum, 4.5:1 for normal text).
    for (let v = -1; v <= 1.0001; v += 0.05) {
      const { background, text } = correlationColour(v);
      expect(contrast(background, text)).toBeGreaterThanOrEqual(4.5);
    }
  });
});
