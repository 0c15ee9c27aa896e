'use client';

import { useMemo, type ReactNode } from 'react';
import { formatCount, formatPercent, formatValue } from '@/lib/core/charts/format';
import { scatterGeometry, scatterGroups, scatterScene } from '@/lib/core/charts/scatter';
import type { SpecLimits } from '@/lib/core/charts/spread';
import { ChartFrame } from './chart-frame';
import { ChartTable } from './chart-table';
import { useElementWidth } from './use-element-width';

export interface ScatterChartProps {
  x: ArrayLike<number>;
  y: ArrayLike<number>;
  xName: string;
  xUnit?: string | null;
  yName: string;
  yUnit?: string | null;
  limits?: SpecLimits;
  maxPoints?: number;
  title?: ReactNode;
  description?: string;
  caption?: ReactNode;
  /** E.g. a select to choose the input. */
  controls?: ReactNode;
  headingLevel?: 'h2' | 'h3' | 'h4';
  className?: string;
  downloads?: boolean;
}

/** One input against the output, trial by trial (an even subsample); trials beyond the limits are crosses. */
export function ScatterChart({ x, y, xName, xUnit, yName, yUnit, limits, maxPoints, title, description, caption, controls, headingLevel, className, downloads }: ScatterChartProps) {
  const [ref, width] = useElementWidth();
  const geometry = useMemo(() => scatterGeometry({ x, y, xName, xUnit, yName, yUnit, limits, width, maxPoints }), [x, y, xName, xUnit, yName, yUnit, limits, width, maxPoints]);
  const scene = useMemo(() => scatterScene(geometry, { title: `${yName} against ${xName}`, description }), [geometry, xName, yName, description]);
  const hasLimits = limits?.lower != null || limits?.upper != null;
  const rows = useMemo(
    () =>
      scatterGroups(x, y, limits, 10).map((g) => ({
        range: `${formatValue(g.from, xUnit, { significant: 5 })} to ${formatValue(g.to, xUnit, { significant: 5 })}`,
        trials: formatCount(g.trials),
        mean: formatValue(g.meanY, yUnit, { significant: 5 }),
        out: formatPercent(g.outShare),
      })),
    [x, y, limits, xUnit, yUnit],
  );
  return (
    <ChartFrame
      title={title ?? `${yName} against ${xName}`}
      scene={scene}
      measureRef={ref}
      caption={caption}
      controls={controls}
      headingLevel={headingLevel}
      className={className}
      downloads={downloads}
      table={
        <ChartTable
          caption={`${yName} by tenths of ${xName}`}
          columns={[
            { key: 'range', header: `${xName}, tenth of trials`, numeric: true },
            { key: 'trials', header: 'Trials', numeric: true },
            { key: 'mean', header: `Mean ${yName}`, numeric: true },
            ...(hasLimits ? [{ key: 'out', header: 'Beyond the limits', numeric: true }] : []),
          ]}
          rows={rows}
        />
      }
    />
  );
}
