'use client';

import { useMemo } from 'react';
import type { RunResult } from '@/lib/core/engine';
import { panelChartInputs } from '@/lib/core/results/chart-inputs';
import { CumulativeChart } from '@/components/charts/cumulative-chart';
import { DriversChart } from '@/components/charts/drivers-chart';
import { SpreadChart } from '@/components/charts/spread-chart';

export type ChartPanel = 'spread' | 'cumulative' | 'drivers';

/** One chart panel of a widget; the inputs are the ones the PDF snapshot draws too (lib/core/results/chart-inputs.ts). */
export function WidgetChart({ result, panel }: { result: RunResult; panel: ChartPanel }) {
  const c = useMemo(() => panelChartInputs(result), [result]);
  const all = useMemo(() => c.output.percentiles.map((p) => ({ p: p.p, value: p.value })), [c.output.percentiles]);
  if (panel === 'spread') return <SpreadChart {...c.spread} title={c.titles.spread} headingLevel="h3" />;
  if (panel === 'cumulative') return <CumulativeChart {...c.cumulative} tablePercentiles={all} title={c.titles.cumulative} headingLevel="h3" />;
  return <DriversChart {...c.drivers} title={c.titles.drivers} headingLevel="h3" />;
}
