'use client';

import { useMemo, type ReactNode } from 'react';
import { formatCount, formatPercent, formatValue } from '@/lib/core/charts/format';
import { spreadGeometry, spreadScene, type HistogramBin, type SpecLimits, type ValueMarker } from '@/lib/core/charts/spread';
import { ChartFrame } from './chart-frame';
import { ChartTable } from './chart-table';
import { useElementWidth } from './use-element-width';

export interface SpreadChartProps {
  /** Output name ("Gap"), used in the axis title and the text alternative. */
  name: string;
  unit?: string | null;
  bins: readonly HistogramBin[];
  /** Trials behind the bins (valid trials). */
  total?: number;
  /** What the bars count, plural: 'trials' (default) for a simulation, 'measurements' for a dataset. */
  noun?: string;
  limits?: SpecLimits;
  markers?: readonly ValueMarker[];
  /** Exact shares printed in the hatched regions, e.g. { lower: '0.006 % below' }. */
  outLabels?: { lower?: string | null; upper?: string | null };
  /** Exact shares below / above the limits, for the text alternative. */
  outShare?: { below: number; above: number };
  title?: ReactNode;
  /** Text alternative; defaults to one generated from the bins. */
  description?: string;
  caption?: ReactNode;
  headingLevel?: 'h2' | 'h3' | 'h4';
  className?: string;
  downloads?: boolean;
}

function beyond(b: HistogramBin, limits: SpecLimits | undefined): string {
  const lo = limits?.lower;
  const hi = limits?.upper;
  if (lo != null && b.x1 <= lo) return `below ${limits?.lowerLabel?.toLowerCase() ?? 'the lower limit'}`;
  if (hi != null && b.x0 >= hi) return `above ${limits?.upperLabel?.toLowerCase() ?? 'the upper limit'}`;
  if (lo != null && b.x0 < lo) return 'partly below';
  if (hi != null && b.x1 > hi) return 'partly above';
  return '';
}

/** Histogram of an output with its limits; the parts beyond a limit are hatched. */
export function SpreadChart({ name, unit, bins, total, noun = 'trials', limits, markers, outLabels, outShare, title, description, caption, headingLevel, className, downloads }: SpreadChartProps) {
  const [ref, width] = useElementWidth();
  const geometry = useMemo(() => spreadGeometry({ bins, name, unit, limits, markers, total, noun, width, outLabels, outShare }), [bins, name, unit, limits, markers, total, noun, width, outLabels, outShare]);
  const scene = useMemo(() => spreadScene(geometry, { title: `Spread of ${name}`, description }), [geometry, name, description]);
  const rows = useMemo(
    () =>
      geometry.bars.map((b) => ({
        from: formatValue(b.x0, unit, { significant: 5 }),
        to: formatValue(b.x1, unit, { significant: 5 }),
        trials: formatCount(b.count),
        share: formatPercent(b.fraction),
        beyond: beyond(b, limits),
      })),
    [geometry, unit, limits],
  );
  const hasLimits = limits?.lower != null || limits?.upper != null;
  return (
    <ChartFrame
      title={title ?? 'Spread'}
      scene={scene}
      measureRef={ref}
      caption={caption}
      headingLevel={headingLevel}
      className={className}
      downloads={downloads}
      table={
        <ChartTable
          caption={`Histogram of ${name}`}
          columns={[
            { key: 'from', header: 'From', numeric: true },
            { key: 'to', header: 'To', numeric: true },
            { key: 'trials', header: noun.charAt(0).toUpperCase() + noun.slice(1), numeric: true },
            { key: 'share', header: 'Share', numeric: true },
            ...(hasLimits ? [{ key: 'beyond', header: 'Beyond a limit' }] : []),
          ]}
          rows={rows}
          rowTone={(i) => (rows[i].beyond && !rows[i].beyond.startsWith('partly') ? 'out' : undefined)}
        />
      }
    />
  );
}
