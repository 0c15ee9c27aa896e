// The chart panels of a widget for the PDF: the same inputs the browser widget draws (lib/core/results/chart-inputs.ts),
// at the PDF's drawing width, so the snapshot shows the same pictures as the viewer's screen.
import type { RunResult } from '@/lib/core/engine';
import type { SpreadInput } from '@/lib/core/charts/spread';
import type { CumulativeInput } from '@/lib/core/charts/cumulative';
import type { DriversInput } from '@/lib/core/charts/drivers';
import { panelChartInputs } from '@/lib/core/results/chart-inputs';

export type ChartPanel = 'spread' | 'cumulative' | 'drivers';
export const CHART_PANELS: readonly ChartPanel[] = ['spread', 'cumulative', 'drivers'];

export interface PanelSpec {
  panel: ChartPanel;
  title: string;
  input: SpreadInput | CumulativeInput | DriversInput;
}

/** One chart panel's title and geometry input at the given width. */
export function panelSpec(r: RunResult, panel: ChartPanel, width: number): PanelSpec {
  const c = panelChartInputs(r);
  if (panel === 'spread') return { panel, title: c.titles.spread, input: { ...c.spread, width } };
  if (panel === 'cumulative') return { panel, title: c.titles.cumulative, input: { ...c.cumulative, width } };
  return { panel, title: c.titles.drivers, input: { ...c.drivers, width } };
}
