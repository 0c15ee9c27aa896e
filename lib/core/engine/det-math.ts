/**
 * Deterministic elementary functions.
 *
 * JavaScript engines implement Math.log, Math.exp, Math.sin, Math.pow... with their own
 * libraries, and these differ in the last bit between engines and versions (checked:
 * Node 20's V8 and Chromium 156 disagree on every one of them). Bit-identical runs in the
 * browser and on the server therefore use functions written in plain IEEE arithmetic,
 * which give the same bits everywhere. Math.sqrt, abs, floor, ceil, trunc, round, min and
 * max are exact by the language specification and stay as they are.
 *
 * ln and exp, the hot ones, are written out here from FreeBSD msun's e_log.c and e_exp.c
 * (Sun Microsystems fdlibm: "Developed at SunPro, a Sun Microsystems, Inc. business.
 * Permission to use, copy, modify, and distribute this software is freely granted,
 * provided that this notice is preserved."); a test checks them bit for bit against
 * @stdlib's ports of the same code. The rest come from @stdlib/math-base-special-*
 * (Apache-2.0, also ports of msun); those only formulas call are in det-math-extra.ts.
 */
import asin from '@stdlib/math-base-special-asin';
import cos from '@stdlib/math-base-special-cos';
import expm1 from '@stdlib/math-base-special-expm1';
import log1p from '@stdlib/math-base-special-log1p';
import pow from '@stdlib/math-base-special-pow';
import sin from '@stdlib/math-base-special-sin';

export { asin, cos, expm1, log1p, pow, sin };
// acos, atan, atan2, hypot(N), log10 and tan, called only by formulas, are in det-math-extra.ts.

// Word access. Every engine the product targets is little-endian; checked at load.
const F64 = new Float64Array(1);
const U32 = new Uint32Array(F64.buffer);
const HI = 1;
const LO = 0;
F64[0] = 1;
if (U32[1] !== 0x3ff00000) throw new Error('Stochos engine: a little-endian platform is required');

const LN2_HI = 6.93147180369123816490e-1;
const LN2_LO = 1.90821492927058770002e-10;
const TWO54 = 1.80143985094819840000e16;
const LG1 = 6.666666666666735130e-1;
const LG2 = 3.999999999940941908e-1;
const LG3 = 2.857142874366239149e-1;
const LG4 = 2.222219843214978396e-1;
const LG5 = 1.818357216161805012e-1;
const LG6 = 1.531383769920937332e-1;
const LG7 = 1.479819860511658591e-1;

/** Natural logarithm (msun e_log.c). */
export function ln(x: number): number {
  F64[0] = x;
  let hx = U32[HI] | 0;
  const lx = U32[LO];
  let k = 0;
  if (hx < 0x00100000) {
    // x < 2^-1022: zero, negative or subnormal.
    if (((hx & 0x7fffffff) | lx) === 0) return -Infinity;
    if (hx < 0) return NaN;
    k -= 54;
    x *= TWO54;
    F64[0] = x;
    hx = U32[HI] | 0;
  }
  if (hx >= 0x7ff00000) return x + x;
  k += (hx >> 20) - 1023;
  hx &= 0x000fffff;
  const i = (hx + 0x95f64) & 0x100000;
  F64[0] = x;
  U32[HI] = hx | (i ^ 0x3ff00000); // normalise x or x / 2
  x = F64[0];
  k += i >> 20;
  const f = x - 1;
  if ((0x000fffff & (2 + hx)) < 3) {
    // -2^-20 <= f < 2^-20
    if (f === 0) {
      if (k === 0) return 0;
      return k * LN2_HI + k * LN2_LO;
    }
    const R = f * f * (0.5 - 0.33333333333333333 * f);
    if (k === 0) return f - R;
    return k * LN2_HI - (R - k * LN2_LO - f);
  }
  const s = f / (2 + f);
  const dk = k;
  const z = s * s;
  let i2 = hx - 0x6147a;
  const w = z * z;
  const j = 0x6b851 - hx;
  const t1 = w * (LG2 + w * (LG4 + w * LG6));
  const t2 = z * (LG1 + w * (LG3 + w * (LG5 + w * LG7)));
  i2 |= j;
  const R = t2 + t1;
  if (i2 > 0) {
    const hfsq = 0.5 * f * f;
    if (k === 0) return f - (hfsq - s * (hfsq + R));
    return dk * LN2_HI - (hfsq - (s * (hfsq + R) + dk * LN2_LO) - f);
  }
  if (k === 0) return f - s * (f - R);
  return dk * LN2_HI - (s * (f - R) - dk * LN2_LO - f);
}

const INVLN2 = 1.44269504088896338700e0;
const O_THRESHOLD = 7.09782712893383973096e2;
const U_THRESHOLD = -7.45133219101941108420e2;
const P1 = 1.66666666666666019037e-1;
const P2 = -2.77777777770155933842e-3;
const P3 = 6.61375632143793436117e-5;
const P4 = -1.65339022054652515390e-6;
const P5 = 4.13813679705723846039e-8;
const TWOM1000 = 9.33263618503218878990e-302; // 2^-1000

/** Exponential (msun e_exp.c). */
export function exp(x: number): number {
  F64[0] = x;
  let hx = U32[HI] | 0;
  const xsb = (hx >>> 31) & 1;
  hx &= 0x7fffffff;
  let hi = 0;
  let lo = 0;
  let k = 0;
  if (hx >= 0x40862e42) {
    // |x| >= 709.78...
    if (hx >= 0x7ff00000) {
      if (((hx & 0xfffff) | U32[LO]) !== 0) return x + x; // NaN
      return xsb === 0 ? x : 0;
    }
    if (x > O_THRESHOLD) return Infinity;
    if (x < U_THRESHOLD) return 0;
  }
  if (hx > 0x3fd62e42) {
    // |x| > 0.5 ln 2
    if (hx < 0x3ff0a2b2) {
      // |x| < 1.5 ln 2
      hi = xsb === 0 ? x - LN2_HI : x + LN2_HI;
      lo = xsb === 0 ? LN2_LO : -LN2_LO;
      k = 1 - xsb - xsb;
    } else {
      k = (INVLN2 * x + (xsb === 0 ? 0.5 : -0.5)) | 0;
      const t = k;
      hi = x - t * LN2_HI;
      lo = t * LN2_LO;
    }
    x = hi - lo;
  } else if (hx < 0x3e300000) {
    // |x| < 2^-28
    return 1 + x;
  } else {
    k = 0;
  }
  const t = x * x;
  const c = x - t * (P1 + t * (P2 + t * (P3 + t * (P4 + t * P5))));
  if (k === 0) return 1 - ((x * c) / (c - 2) - x);
  const y = 1 - (lo - (x * c) / (2 - c) - hi);
  F64[0] = y;
  if (k >= -1021) {
    U32[HI] = (U32[HI] + (k << 20)) >>> 0;
    return F64[0];
  }
  U32[HI] = (U32[HI] + ((k + 1000) << 20)) >>> 0;
  return F64[0] * TWOM1000;
}

// msun k_sin.c / k_cos.c kernels on |x| <= pi/4.
const S1 = -1.66666666666666324348e-1;
const S2 = 8.33333333332248946124e-3;
const S3 = -1.98412698298579493134e-4;
const S4 = 2.75573137070700676789e-6;
const S5 = -2.50507602534068634195e-8;
const S6 = 1.58969099521155010221e-10;
const C1 = 4.16666666666666019037e-2;
const C2 = -1.38888888888741095749e-3;
const C3 = 2.48015872894767294178e-5;
const C4 = -2.75573143513906633035e-7;
const C5 = 2.08757232129817482790e-9;
const C6 = -1.13596475577881948265e-11;
const HALF_PI = 1.5707963267948966;

function kernelSin(x: number): number {
  const z = x * x;
  const v = z * x;
  const r = S2 + z * (S3 + z * (S4 + z * (S5 + z * S6)));
  return x + v * (S1 + z * r);
}

function kernelCos(x: number): number {
  const z = x * x;
  const w = z * z;
  const r = z * (C1 + z * (C2 + z * C3)) + w * w * (C4 + z * (C5 + z * C6));
  const hz = 0.5 * z;
  const w2 = 1 - hz;
  return w2 + (1 - w2 - hz + z * r);
}

/** Cosine of 2 pi u written into the module and returned; sine left for lastSin2Pi(). */
let sinOut = 0;

/**
 * cos(2 pi u) and sin(2 pi u) for u in [0, 1) (Box-Muller). The reduction to an eighth of
 * a turn is exact (u * 4 and its fractional part need no rounding), so only the kernels
 * round.
 */
export function cosSin2Pi(u: number): number {
  const t = u * 4;
  let q = Math.floor(t + 0.5); // nearest quarter turn
  const r = (t - q) * HALF_PI; // in [-pi/4, pi/4]
  const s = kernelSin(r);
  const c = kernelCos(r);
  q &= 3;
  let cosv: number;
  if (q === 0) {
    cosv = c;
    sinOut = s;
  } else if (q === 1) {
    cosv = -s;
    sinOut = c;
  } else if (q === 2) {
    cosv = -c;
    sinOut = -s;
  } else {
    cosv = s;
    sinOut = -c;
  }
  return cosv;
}

/** sin(2 pi u) from the last cosSin2Pi(u) call. */
export function lastSin2Pi(): number {
  return sinOut;
}
