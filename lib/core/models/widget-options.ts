import type { TemplateId } from '@/lib/core/models/types';

// What a published widget may show. Shared by the publishing form, the API's validation and the widget view.

export const PANEL_IDS = ['headline', 'spread', 'cumulative', 'drivers'] as const;
export type PanelId = (typeof PANEL_IDS)[number];

export const PANEL_LABELS: Record<PanelId, string> = {
  headline: 'Headline figure',
  spread: 'Spread (histogram with limits)',
  cumulative: 'Cumulative (S-curve with percentiles)',
  drivers: 'Drivers (what moves the result most)',
};

export interface HeadlineOption {
  id: string;
  label: string;
  /** Where the figure comes from in the engine's RunResult, for the widget view. */
  source: string;
}

/** The one figure a client asks for, per template. The first is the default. */
export const HEADLINES: Record<TemplateId, readonly HeadlineOption[]> = {
  'linear-stack': [
    { id: 'ppm', label: 'Assemblies out of specification (ppm)', source: 'stack.monteCarlo.ppmObserved' },
    { id: 'ppk', label: 'Ppk of the gap', source: 'stack.monteCarlo.ppk' },
    { id: 'mean', label: 'Mean gap', source: 'outputs[0].mean' },
    { id: 'sd', label: 'Standard deviation of the gap', source: 'outputs[0].sd' },
  ],
  'cost-range': [
    { id: 'at-confidence', label: 'Cost at the chosen confidence (e.g. P80)', source: 'cost.atConfidence.value' },
    { id: 'contingency', label: 'Contingency to the chosen confidence', source: 'cost.contingency' },
    { id: 'exceed-budget', label: 'Chance of exceeding the budget', source: 'cost.exceedBudget.p' },
    { id: 'p50', label: 'P50 cost', source: 'cost.p50' },
    { id: 'p90', label: 'P90 cost', source: 'cost.p90' },
  ],
  formula: [
    { id: 'mean', label: 'Mean of the last output', source: 'outputs[last].mean' },
    { id: 'p50', label: 'P50 of the last output', source: 'outputs[last].percentiles P50' },
    { id: 'p90', label: 'P90 of the last output', source: 'outputs[last].percentiles P90' },
    { id: 'outside-limits', label: 'Chance the last output is outside its limits', source: 'outputs[last].limits.outside.p' },
  ],
};

export function headlineIds(template: TemplateId): string[] {
  return HEADLINES[template].map((h) => h.id);
}

export function defaultHeadline(template: TemplateId): string {
  return HEADLINES[template][0]!.id;
}

export const DEFAULT_PANELS: PanelId[] = ['headline', 'spread', 'cumulative', 'drivers'];
