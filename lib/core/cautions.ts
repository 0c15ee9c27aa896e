// The cautions shown beside every result (DESIGN.md §12), in one place so the results view, the
// client widget and the PDF snapshot print the same words.
import type { Template } from '@/lib/core/engine/schema';

export type CautionId = 'tolerance' | 'cost' | 'general' | 'assumptions' | 'low-trials';

export interface Caution {
  id: CautionId;
  title: string;
  text: string;
}

export const TOLERANCE_CAUTION: Caution = {
  id: 'tolerance',
  title: 'Tolerance results',
  text:
    'This analysis covers only the dimensions entered in the model. Before release, confirm it against the drawing’s geometric tolerancing (ASME Y14.5 or ISO GPS), real process capability data and a review by a qualified engineer, above all for safety-critical parts.',
};

export const COST_CAUTION: Caution = {
  id: 'cost',
  title: 'Cost results',
  text:
    'These are estimates for decision support under the stated assumptions, following the practice of AACE International recommended practices for cost risk and contingency. They are not a guarantee of the outturn cost and not financial advice.',
};

export const GENERAL_CAUTION: Caution = {
  id: 'general',
  title: 'Model results',
  text: 'These are estimates from the model as its author built it. They support, and never replace, engineering judgement, the applicable standards and licensed sign-off.',
};

export const ASSUMPTIONS_CAUTION: Caution = {
  id: 'assumptions',
  title: 'Assumptions',
  text: 'Every figure depends on the distributions and correlations chosen for the inputs. A run with too few trials for stable percentiles is flagged.',
};

/** The cautions for a template's results: the template's own, then the one that applies to all. */
export function cautionsFor(template: Template): Caution[] {
  if (template === 'linear-stack') return [TOLERANCE_CAUTION, ASSUMPTIONS_CAUTION];
  if (template === 'cost-range') return [COST_CAUTION, ASSUMPTIONS_CAUTION];
  return [GENERAL_CAUTION, ASSUMPTIONS_CAUTION];
}

/** What the flag needs from each output's convergence report (the engine's OutputSummary fits). */
export interface ConvergenceLike {
  label: string;
  trials: number;
  valid: number;
  convergence: { enough: boolean; verdict: string; reasons: string[] };
}

/**
 * The low-trial-count flag: null when every output has enough trials, else one caution naming the
 * outputs concerned and the engine's first reason.
 */
export function lowTrialCaution(outputs: readonly ConvergenceLike[]): Caution | null {
  const weak = outputs.filter((o) => !o.convergence.enough);
  if (!weak.length) return null;
  const names = weak.map((o) => o.label);
  const first = weak[0];
  const reason = first.convergence.reasons[0] ?? first.convergence.verdict;
  const which = outputs.length > 1 ? ` for ${names.join(', ')}` : '';
  return {
    id: 'low-trials',
    title: 'Low trial count',
    text: `Not enough trials${which}: ${reason} Treat the percentiles and tail figures as rough, or run the model with more trials.`,
  };
}
