/**
 * The deterministic elementary functions that only formulas call (see det-math.ts for why
 * they are not Math's): @stdlib's ports of msun (Apache-2.0). Loaded with the formula parser
 * (formula-parse.ts imports this module), so pages running published stack or cost models
 * (the embed) do not carry them; formula.ts reaches them through optional-parts.ts.
 */
import acos from '@stdlib/math-base-special-acos';
import atan from '@stdlib/math-base-special-atan';
import atan2 from '@stdlib/math-base-special-atan2';
import hypot from '@stdlib/math-base-special-hypot';
import log10 from '@stdlib/math-base-special-log10';
import tan from '@stdlib/math-base-special-tan';
import { provideFormulaMath } from './optional-parts';

export { acos, atan, atan2, hypot, log10, tan };

/** n-argument hypot from the two-argument one, folded left to right. */
export function hypotN(...xs: number[]): number {
  if (xs.length === 0) return 0;
  let h = Math.abs(xs[0]);
  for (let i = 1; i < xs.length; i++) h = hypot(h, xs[i]);
  return h;
}

provideFormulaMath({ acos, atan, atan2, hypotN, log10, tan });
