import type { CheckState, TemplateId } from '@/lib/core/models/types';

// Names and one-line descriptions of the three templates and the check states, in the product's own words.

export const TEMPLATE_IDS = ['linear-stack', 'cost-range', 'formula'] as const satisfies readonly TemplateId[];

export const TEMPLATE_LABELS: Record<TemplateId, string> = {
  'linear-stack': 'Linear stack',
  'cost-range': 'Cost range',
  formula: 'Formula',
};

export const TEMPLATE_SUMMARIES: Record<TemplateId, string> = {
  'linear-stack':
    'A tolerance stack-up: contributors with nominal, tolerances and direction around the loop, and the gap’s limits. Worst case, RSS and Monte Carlo side by side, with ppm out of specification and Pp/Ppk.',
  'cost-range':
    'Line items as three-point estimates, correlation groups and a risk register. The S-curve with P10 to P90, the contingency to hold and the chance of exceeding the budget.',
  formula: 'Named uncertain inputs and one or more output formulas, for any other quantity your engineers model.',
};

export const CHECK_STATE_LABELS: Record<CheckState, string> = {
  unchecked: 'Awaiting check',
  signed_off: 'Signed off',
  sent_back: 'Sent back',
};

/** "2026-12-01 14:03 UTC": unambiguous in server messages, whatever the reader's locale. */
export function utcStamp(iso: string): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  return `${d.toISOString().slice(0, 10)} ${d.toISOString().slice(11, 16)} UTC`;
}
