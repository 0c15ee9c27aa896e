'use client';

import { useMemo, useRef, useState, type KeyboardEvent, type PointerEvent, type ReactNode } from 'react';
import {
  cumulativeGeometry,
  ecdfAt,
  cumulativeScene,
  readoutAtPixel,
  readoutAtProbability,
  readoutAtValue,
  stepReadout,
  type EcdfPoints,
  type PercentileMark,
  type Readout,
  type ReadoutKey,
} from '@/lib/core/charts/cumulative';
import { formatPercent, formatValue, percentileName } from '@/lib/core/charts/format';
import { chartColors } from '@/lib/core/charts/palette';
import type { SpecLimits, ValueMarker } from '@/lib/core/charts/spread';
import { ChartFrame } from './chart-frame';
import { ChartTable } from './chart-table';
import { useElementWidth } from './use-element-width';

export interface CumulativeChartProps {
  name: string;
  unit?: string | null;
  ecdf: EcdfPoints;
  /** Markers on the curve (usually P10/P50/P80/P90), values as the engine computed them. */
  percentiles?: readonly PercentileMark[];
  /** Rows of the table view (defaults to `percentiles`); pass every percentile the engine reported. */
  tablePercentiles?: readonly PercentileMark[];
  /** Budget, base estimate, sum of most likely: vertical lines meeting the curve. */
  markers?: readonly ValueMarker[];
  limits?: SpecLimits;
  /** Print where each limit falls on the curve (budgets). */
  limitRanks?: boolean;
  title?: ReactNode;
  description?: string;
  caption?: ReactNode;
  headingLevel?: 'h2' | 'h3' | 'h4';
  className?: string;
  downloads?: boolean;
}

const KEYS = new Set<ReadoutKey>(['ArrowLeft', 'ArrowRight', 'ArrowUp', 'ArrowDown', 'PageUp', 'PageDown', 'Home', 'End']);

/**
 * The S-curve with percentile markers. A readout follows the pointer; the line under the chart is a
 * slider for keyboard users (arrows move one percentage point, Page keys ten, Home/End the ends).
 */
export function CumulativeChart({ name, unit, ecdf, percentiles, tablePercentiles, markers, limits, limitRanks, title, description, caption, headingLevel, className, downloads }: CumulativeChartProps) {
  const [ref, width] = useElementWidth();
  const geometry = useMemo(() => cumulativeGeometry({ ecdf, name, unit, percentiles, markers, limits, limitRanks, width }), [ecdf, name, unit, percentiles, markers, limits, limitRanks, width]);
  const scene = useMemo(() => cumulativeScene(geometry, { title: `S-curve of ${name}`, description }), [geometry, name, description]);
  // The selection is kept as a value (pointer) or a share (keyboard), so it survives a redraw at a new width.
  const [sel, setSel] = useState<{ by: 'value' | 'p'; v: number } | null>(null);
  const [pointer, setPointer] = useState(false);
  const plotRef = useRef<SVGRectElement>(null);
  const { innerWidth: w, innerHeight: h } = geometry.box;

  const shown: Readout | null = sel ? (sel.by === 'p' ? readoutAtProbability(geometry, sel.v) : readoutAtValue(geometry, sel.v)) : null;

  function onPointerMove(e: PointerEvent<SVGRectElement>) {
    const rect = plotRef.current?.getBoundingClientRect();
    if (!rect || rect.width === 0) return;
    const px = ((e.clientX - rect.left) / rect.width) * w;
    setPointer(true);
    const r = readoutAtPixel(geometry, px);
    setSel(r ? { by: 'value', v: r.value } : null);
  }

  function onKeyDown(e: KeyboardEvent<HTMLDivElement>) {
    if (!KEYS.has(e.key as ReadoutKey)) return;
    e.preventDefault();
    setPointer(false);
    const r = stepReadout(geometry, shown, e.key as ReadoutKey);
    setSel(r ? { by: 'p', v: r.p } : null);
  }

  const overlay = (
    <g>
      {shown ? (
        <g aria-hidden="true" pointerEvents="none">
          <path d={`M0,${shown.y}H${shown.x}V${h}`} fill="none" stroke={chartColors.crosshair} strokeWidth={1} strokeDasharray="3 3" />
          <circle cx={shown.x} cy={shown.y} r={5} fill="#ffffff" stroke={chartColors.crosshair} strokeWidth={2} />
        </g>
      ) : null}
      <rect
        ref={plotRef}
        x={0}
        y={0}
        width={w}
        height={h}
        fill="transparent"
        style={{ touchAction: 'pan-y', cursor: 'crosshair' }}
        onPointerMove={onPointerMove}
        onPointerDown={onPointerMove}
        onPointerLeave={() => {
          if (pointer) setSel(null);
        }}
      />
    </g>
  );

  const rows = useMemo(() => {
    const list = [...(tablePercentiles ?? percentiles ?? [])].sort((a, b) => a.p - b.p);
    return [
      ...list.map((m) => ({ what: percentileName(m.p), value: formatValue(m.value, unit, { significant: 5 }), share: formatPercent(m.p) })),
      ...geometry.references.map((r) => ({ what: r.label.text.replace(/ · P.*$/, '').replace(/ [^ ]+$/, ''), value: formatValue(r.value, unit, { significant: 6, trim: true }), share: formatPercent(r.p) })),
      ...geometry.limits.map((l) => ({
        what: l.side === 'lower' ? (limits?.lowerLabel ?? 'Lower limit') : (limits?.upperLabel ?? 'Upper limit'),
        value: formatValue(l.value, unit, { significant: 6, trim: true }),
        share: formatPercent(ecdfAt(geometry.points, l.value)),
      })),
    ];
  }, [tablePercentiles, percentiles, geometry, unit, limits]);

  const p = shown ? Math.round(shown.p * 100) : 50;
  const below = (
    <div
      role="slider"
      tabIndex={0}
      aria-label={`Read the S-curve of ${name}`}
      aria-valuemin={1}
      aria-valuemax={99}
      aria-valuenow={p}
      aria-valuetext={shown ? shown.text : 'No point selected; use the arrow keys to read the curve'}
      onKeyDown={onKeyDown}
      onBlur={() => {
        if (!pointer) setSel(null);
      }}
      className="mt-1 flex min-h-9 items-center gap-2 rounded-md border border-dashed border-ink-300 px-2.5 py-1.5 text-[0.8125rem] text-ink-700"
    >
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5 flex-none text-ink-500">
        <path d="M2 14V2M2 14h12M5 10l3-4 3 2 3-5" fill="none" stroke="currentColor" strokeWidth="1.5" />
      </svg>
      {shown ? (
        <span className="num text-ink-900">{shown.text}</span>
      ) : (
        <span>Point at the curve, or focus here and use the arrow keys, to read any value.</span>
      )}
    </div>
  );

  return (
    <ChartFrame
      title={title ?? 'Cumulative (S-curve)'}
      scene={scene}
      measureRef={ref}
      overlay={overlay}
      below={below}
      caption={caption}
      headingLevel={headingLevel}
      className={className}
      downloads={downloads}
      table={
        <ChartTable
          caption={`Percentiles of ${name}`}
          columns={[
            { key: 'what', header: 'Point' },
            { key: 'value', header: 'Value', numeric: true },
            { key: 'share', header: 'Chance of not exceeding', numeric: true },
          ]}
          rows={rows}
        />
      }
    />
  );
}
