'use client';

import { useMemo, type ReactNode } from 'react';
import { rangesGeometry, rangesScene, type RangeRow } from '@/lib/core/charts/ranges';
import type { SpecLimits } from '@/lib/core/charts/spread';
import { ChartFrame } from './chart-frame';
import { ChartTable } from './chart-table';
import { useElementWidth } from './use-element-width';

export interface RangesChartProps {
  name: string;
  unit?: string | null;
  rows: readonly RangeRow[];
  limits?: SpecLimits;
  title?: ReactNode;
  description?: string;
  caption?: ReactNode;
  headingLevel?: 'h2' | 'h3' | 'h4';
  className?: string;
  downloads?: boolean;
}

/** Predicted ranges of several methods against the limits, on one scale. */
export function RangesChart({ name, unit, rows, limits, title, description, caption, headingLevel, className, downloads }: RangesChartProps) {
  const [ref, width] = useElementWidth();
  const geometry = useMemo(() => rangesGeometry({ rows, name, unit, limits, width }), [rows, name, unit, limits, width]);
  const scene = useMemo(() => rangesScene(geometry, { title: `${name}: methods side by side`, description }), [geometry, name, description]);
  return (
    <ChartFrame
      title={title ?? 'Methods side by side'}
      scene={scene}
      measureRef={ref}
      caption={caption}
      headingLevel={headingLevel}
      className={className}
      downloads={downloads}
      table={
        <ChartTable
          caption={`Predicted range of ${name} by method`}
          columns={[
            { key: 'method', header: 'Method' },
            { key: 'range', header: 'Range', numeric: true },
            { key: 'within', header: 'Within the limits' },
          ]}
          rows={geometry.bars.map((b) => ({ method: b.label, range: b.rangeText, within: b.within ? 'yes' : 'no: beyond a limit' }))}
        />
      }
    />
  );
}
