'use client';

import { useMemo, type ReactNode } from 'react';
import { driversGeometry, driversScene, rankDrivers, type DriverDatum } from '@/lib/core/charts/drivers';
import { formatFixed, formatPercent } from '@/lib/core/charts/format';
import { ChartFrame } from './chart-frame';
import { ChartTable } from './chart-table';
import { useElementWidth } from './use-element-width';

export interface DriversChartProps {
  /** Output name ("Gap"). */
  name: string;
  drivers: readonly DriverDatum[];
  /** Bars drawn before the rest are summed into "Other" (the table always lists every input). */
  maxBars?: number;
  /** Header of the share column in the table (e.g. "Share of variance (analytic)"). */
  shareLabel?: string;
  title?: ReactNode;
  description?: string;
  caption?: ReactNode;
  headingLevel?: 'h2' | 'h3' | 'h4';
  className?: string;
  downloads?: boolean;
}

/** What moves the output most: inputs ranked by their share of its variance, with direction arrows. */
export function DriversChart({ name, drivers, maxBars, shareLabel = 'Share of variance', title, description, caption, headingLevel, className, downloads }: DriversChartProps) {
  const [ref, width] = useElementWidth();
  const geometry = useMemo(() => driversGeometry({ drivers, name, width, maxBars }), [drivers, name, width, maxBars]);
  const scene = useMemo(() => driversScene(geometry, { title: `Drivers of ${name}`, description }), [geometry, name, description]);
  const rows = useMemo(
    () =>
      rankDrivers(drivers).map((d, i) => ({
        rank: String(i + 1),
        input: d.label,
        share: formatPercent(Math.max(0, d.share)),
        rho: d.correlation == null ? '—' : formatFixed(d.correlation, 3),
        effect: d.correlation == null || d.correlation === 0 ? '—' : d.correlation > 0 ? 'higher input raises it' : 'higher input lowers it',
      })),
    [drivers],
  );
  return (
    <ChartFrame
      title={title ?? 'Drivers'}
      scene={scene}
      measureRef={ref}
      caption={caption ?? `${scene.description} An up arrow means a higher input value raises ${name}; a down arrow means it lowers it.`}
      headingLevel={headingLevel}
      className={className}
      downloads={downloads}
      table={
        <ChartTable
          caption={`Drivers of ${name}`}
          columns={[
            { key: 'rank', header: 'Rank', numeric: true },
            { key: 'input', header: 'Input' },
            { key: 'share', header: shareLabel, numeric: true },
            { key: 'rho', header: 'Rank correlation', numeric: true },
            { key: 'effect', header: 'Effect' },
          ]}
          rows={rows}
        />
      }
    />
  );
}
