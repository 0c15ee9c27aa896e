// Pure helpers behind the correlation matrix editor (no React): symmetric edits, resizing,
// the diff shown after a repair, and the diverging cell colour scale.

export type Matrix = number[][];

/** An n-by-n identity matrix (no correlation). */
export function identity(n: number): Matrix {
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
}

/** A deep copy, so an edit never mutates the form's current value. */
export function copyMatrix(m: Matrix): Matrix {
  return m.map((row) => row.slice());
}

/**
 * Sets entry (i, j) and its mirror (j, i). The diagonal is locked at 1, so an edit there is ignored.
 * Values are clamped to [-1, 1] unless `clamp` is false (the editor keeps what was typed so the schema names
 * the bad entry); a non-finite value is refused (the matrix is returned unchanged).
 */
export function setSymmetric(m: Matrix, i: number, j: number, value: number, clamp = true): Matrix {
  if (i === j || !Number.isFinite(value) || i < 0 || j < 0 || i >= m.length || j >= m.length) return m;
  const v = clamp ? Math.max(-1, Math.min(1, value)) : value;
  const out = copyMatrix(m);
  out[i][j] = v;
  out[j][i] = v;
  return out;
}

/** Matrix for a new list of keys, keeping the entries of keys that stay; new keys start uncorrelated. */
export function remapMatrix(m: Matrix, oldKeys: readonly string[], newKeys: readonly string[]): Matrix {
  const index = new Map(oldKeys.map((k, i) => [k, i]));
  return newKeys.map((ki, i) =>
    newKeys.map((kj, j) => {
      if (i === j) return 1;
      const a = index.get(ki);
      const b = index.get(kj);
      if (a === undefined || b === undefined) return 0;
      const v = m[a]?.[b];
      return typeof v === 'number' && Number.isFinite(v) ? v : 0;
    }),
  );
}

export interface CellChange {
  i: number;
  j: number;
  before: number;
  after: number;
}

/**
 * Upper-triangle cells whose value changed by more than `tolerance` between two matrices of one size
 * (each pair is reported once, as i < j, since both halves change together).
 */
export function diffMatrices(before: Matrix, after: Matrix, tolerance = 5e-4): CellChange[] {
  const changes: CellChange[] = [];
  const n = Math.min(before.length, after.length);
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const a = before[i][j];
      const b = after[i][j];
      if (Math.abs(a - b) > tolerance) changes.push({ i, j, before: a, after: b });
    }
  }
  return changes;
}

/** Rounds each entry to `digits` decimals, keeping symmetry and the unit diagonal (what the editor stores). */
export function roundMatrix(m: Matrix, digits = 4): Matrix {
  const f = 10 ** digits;
  return m.map((row, i) => row.map((v, j) => (i === j ? 1 : Math.round(v * f) / f)));
}

/** Key of a changed cell for quick lookup, symmetric: "i,j" with i < j. */
export function cellKey(i: number, j: number): string {
  return i < j ? `${i},${j}` : `${j},${i}`;
}

// --- Colour ------------------------------------------------------------------------------------------------
// A diverging blue–white–orange scale (ColorBrewer PuOr family, Brewer & Harrower 2003), readable with the
// common colour-vision deficiencies. Negative values lean blue, positive orange; 0 is near white. The number is
// always printed in the cell as well, so colour is never the only carrier.

const NEG: [number, number, number][] = [
  [247, 247, 247],
  [216, 218, 235],
  [178, 171, 210],
  [128, 115, 172],
  [84, 39, 136],
];
const POS: [number, number, number][] = [
  [247, 247, 247],
  [254, 224, 182],
  [253, 184, 99],
  [224, 130, 20],
  [179, 88, 6],
];

function lerpStops(stops: [number, number, number][], t: number): [number, number, number] {
  const x = Math.max(0, Math.min(1, t)) * (stops.length - 1);
  const k = Math.min(stops.length - 2, Math.floor(x));
  const f = x - k;
  const a = stops[k];
  const b = stops[k + 1];
  return [0, 1, 2].map((c) => Math.round(a[c] + (b[c] - a[c]) * f)) as [number, number, number];
}

function luminance([r, g, b]: [number, number, number]): number {
  const lin = (c: number) => {
    const s = c / 255;
    return s <= 0.03928 ? s / 12.92 : ((s + 0.055) / 1.055) ** 2.4;
  };
  return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
}

const INK_900_LUMINANCE = luminance([20, 28, 34]); // #141c22

/**
 * Background and text colour for a correlation cell; text is dark or white, whichever contrasts more. Mid-dark
 * tones where neither reaches WCAG AA (4.5:1) are darkened just enough for white text to pass.
 */
export function correlationColour(value: number): { background: string; text: string } {
  const v = Number.isFinite(value) ? Math.max(-1, Math.min(1, value)) : 0;
  let rgb = v < 0 ? lerpStops(NEG, -v) : lerpStops(POS, v);
  const onDark = (L: number) => (L + 0.05) / (INK_900_LUMINANCE + 0.05);
  const onWhite = (L: number) => 1.05 / (L + 0.05);
  let L = luminance(rgb);
  if (onDark(L) >= 4.5) return { background: `rgb(${rgb[0]} ${rgb[1]} ${rgb[2]})`, text: '#141c22' };
  while (onWhite(L) < 4.5) {
    rgb = rgb.map((c) => Math.floor(c * 0.96)) as [number, number, number];
    L = luminance(rgb);
  }
  return { background: `rgb(${rgb[0]} ${rgb[1]} ${rgb[2]})`, text: '#ffffff' };
}
