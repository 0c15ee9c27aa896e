// The explanations of the terms a headline figure can lean on (lib/core/results/headline.ts), apart from the rest of
// the glossary in term.tsx, so that the client widget carries only these.
export const HEADLINE_GLOSSARY = {
  Ppk: 'Process performance including centring: the distance from the mean to the nearer limit divided by three overall standard deviations. 1.33 is a common minimum.',
  ppm: 'Parts per million: how many assemblies in a million are expected outside the specification limits.',
  P50: 'The value with a 50 % chance of not being exceeded: the median outcome.',
  P80: 'The value with an 80 % chance of not being exceeded. Often used to set a budget with contingency.',
  P90: 'The value with a 90 % chance of not being exceeded: a cautious figure for a budget or a gap.',
  contingency: 'The amount added to the base estimate to reach a chosen confidence, e.g. P80 minus the base estimate.',
} as const;
