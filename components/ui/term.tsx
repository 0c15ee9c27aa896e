'use client';

import type { ReactNode } from 'react';
import { HEADLINE_GLOSSARY } from './glossary-headline';
import { TermTip } from './term-tip';

/** Short explanations in Stochos's own words for trade terms that appear beside numbers. */
export const GLOSSARY = {
  'worst case': 'Every contributor at the tolerance limit that hurts most, all at once. Safe, but usually far more pessimistic than real production.',
  RSS: 'Root sum of squares: the contributors’ variations combined as independent random spreads, σ = √(σ₁² + σ₂² + …). Assumes centred, normal, independent contributors.',
  'Monte Carlo': 'Draws every input many times from its distribution, runs the model for each draw, and reads the results off the spread of outcomes.',
  'Latin hypercube': 'A sampling plan that splits each input’s range into equal-probability strata and draws once from each, so fewer trials cover the range evenly (McKay, Beckman & Conover 1979).',
  Pp: 'Process performance: specification width divided by six overall standard deviations, (USL − LSL) / 6σ. Ignores where the mean sits.',
  Ppk: HEADLINE_GLOSSARY.Ppk,
  'Pp/Ppk': 'Pp compares the specification width with the spread, (USL − LSL) / 6σ; Ppk also accounts for centring, using the nearer limit, min(USL − μ, μ − LSL) / 3σ. Both use the overall standard deviation of the simulated output.',
  'Cp/Cpk': 'Like Pp/Ppk, but from short-term (within-subgroup) variation of a running process. Stochos reports Pp/Ppk because a simulation gives overall variation.',
  ppm: HEADLINE_GLOSSARY.ppm,
  P50: HEADLINE_GLOSSARY.P50,
  P80: HEADLINE_GLOSSARY.P80,
  P90: HEADLINE_GLOSSARY.P90,
  'S-curve': 'The cumulative distribution: for each value, the probability that the outcome is at or below it. Percentiles such as P80 are read off it.',
  contingency: HEADLINE_GLOSSARY.contingency,
  'three-point estimate': 'A low, a most likely and a high value for one uncertain quantity, from which a distribution such as beta-PERT or triangular is built.',
  seed: 'The starting number of the random sequence. The same model, dial values, seed and trial count always give identical results.',
  trials: 'How many times the model is evaluated with fresh random draws. More trials narrow the uncertainty of the estimated percentiles.',
} as const;

export type GlossaryTerm = keyof typeof GLOSSARY;

export interface TermProps {
  /** A glossary entry; its explanation is used unless `explain` is given. */
  term?: GlossaryTerm;
  /** A custom explanation. */
  explain?: ReactNode;
  /** The visible text (defaults to the term itself). */
  children?: ReactNode;
}

/**
 * A term with its explanation, shown on hover and on keyboard focus (and on tap). Escape hides it.
 * The explanation is also the element's accessible description.
 */
export function Term({ term, explain, children }: TermProps) {
  return <TermTip explain={explain ?? (term ? GLOSSARY[term] : null)}>{children ?? term}</TermTip>;
}
