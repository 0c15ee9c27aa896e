import { LAW_LABELS, type Law, type LawParams } from '@/lib/core/datasets/fit';
import { densityOverlay, PLOT, qqPlot } from '@/lib/core/datasets/charts';
import type { HistogramBin } from '@/lib/core/engine/stats';

const AXIS = 'stroke-ink-400';

/** Density overlay and Q–Q plot for one fitted law, each an SVG with a text alternative. */
export function FitPlots({ law, params, bins, sorted, unit }: { law: Law; params: LawParams; bins: readonly HistogramBin[]; sorted: readonly number[]; unit: string }) {
  const d = densityOverlay(bins, sorted.length, law, params);
  const q = qqPlot(sorted, law, params);
  const base = PLOT.height - PLOT.margin.bottom;
  const name = LAW_LABELS[law];
  return (
    <div className="grid gap-4 sm:grid-cols-2">
      <figure>
        <svg viewBox={`0 0 ${PLOT.width} ${PLOT.height}`} role="img" aria-labelledby={`dens-${law}`} className="w-full">
          <title id={`dens-${law}`}>{`${name} density drawn over the histogram of the data${unit ? ` (${unit})` : ''}`}</title>
          {d.bars.map((b, i) => (
            <rect key={i} x={b.x} y={b.y} width={b.w} height={b.h} className="fill-ink-200" />
          ))}
          <path d={d.curve} fill="none" strokeWidth={2} className="stroke-accent-700" />
          <line x1={PLOT.margin.left} x2={PLOT.width - PLOT.margin.right} y1={base} y2={base} className={AXIS} />
          {d.xTicks.map((t) => (
            <text key={t.label} x={t.x} y={base + 16} textAnchor="middle" className="fill-ink-600 font-mono text-[10px]">
              {t.label}
            </text>
          ))}
        </svg>
        <figcaption className="text-xs text-ink-600">Density overlay: bars are the data, the line is the fitted {name.toLowerCase()} law.</figcaption>
      </figure>
      <figure>
        <svg viewBox={`0 0 ${PLOT.width} ${PLOT.height}`} role="img" aria-labelledby={`qq-${law}`} className="w-full">
          <title id={`qq-${law}`}>{`Q–Q plot: sorted data against ${name} quantiles; points on the diagonal mean a good fit`}</title>
          <line {...q.line} strokeDasharray="4 3" className="stroke-ink-500" />
          {q.points.map((p, i) => (
            <circle key={i} cx={p.cx} cy={p.cy} r={2.2} className="fill-accent-700" />
          ))}
          <line x1={PLOT.margin.left} x2={PLOT.width - PLOT.margin.right} y1={base} y2={base} className={AXIS} />
          <line x1={PLOT.margin.left} x2={PLOT.margin.left} y1={PLOT.margin.top} y2={base} className={AXIS} />
          {q.xTicks.map((t) => (
            <text key={t.label} x={t.x} y={base + 16} textAnchor="middle" className="fill-ink-600 font-mono text-[10px]">
              {t.label}
            </text>
          ))}
          {q.yTicks.map((t) => (
            <text key={t.label} x={PLOT.margin.left - 4} y={t.y + 3} textAnchor="end" className="fill-ink-600 font-mono text-[10px]">
              {t.label}
            </text>
          ))}
        </svg>
        <figcaption className="text-xs text-ink-600">Q–Q plot: fitted quantiles across, data down; points off the dashed line show where the law misses.</figcaption>
      </figure>
    </div>
  );
}
