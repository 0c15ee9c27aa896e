'use client';

import { useMemo } from 'react';
import type { RunResult } from '@/lib/core/engine';
import { compareCurvesScene, compareSpreadsScene, COMPARE_STYLES } from '@/lib/core/charts/compare';
import { percentileName } from '@/lib/core/charts/format';
import { compareFigures, compareInput, CURRENT_LABEL, PINNED_LABEL } from '@/lib/core/results/compare';
import { outputFormatter, panelOutput } from '@/lib/core/results/chart-inputs';
import { ChartFrame } from '@/components/charts/chart-frame';
import { ChartTable } from '@/components/charts/chart-table';
import { useElementWidth } from '@/components/charts/use-element-width';
import { dialDisplay, type DialSpec } from '@/lib/core/widget/dial-values';

const TH = 'border-b border-ink-200 px-2.5 py-1.5 text-left text-xs font-semibold text-ink-700';
const TD = 'border-b border-ink-100 px-2.5 py-1.5 align-top';

/**
 * The pinned view beside the current one: the figures with their difference, the dial values of each, and the
 * two S-curves and spreads drawn over each other (current solid, pinned dashed, named in a legend), each chart
 * with a table alternative.
 */
export function CompareView({ pinned, current, headline, dials, titleId }: { pinned: RunResult; current: RunResult; headline: string; dials: DialSpec[]; titleId: string }) {
  const rows = useMemo(() => compareFigures(pinned, current, headline), [pinned, current, headline]);
  const [curveRef, curveWidth] = useElementWidth();
  const [spreadRef, spreadWidth] = useElementWidth();
  const curves = useMemo(() => compareCurvesScene(compareInput(pinned, current, curveWidth)), [pinned, current, curveWidth]);
  const spreads = useMemo(() => compareSpreadsScene(compareInput(pinned, current, spreadWidth)), [pinned, current, spreadWidth]);
  const percentileRows = useMemo(() => {
    const a = panelOutput(pinned);
    const b = panelOutput(current);
    const f = outputFormatter(b);
    return b.percentiles
      .filter((q) => q.p >= 0.05 && q.p <= 0.95)
      .map((q) => {
        const old = a.percentiles.find((x) => Math.abs(x.p - q.p) < 1e-9);
        return { p: percentileName(q.p), pinned: old ? f(old.value) : '—', current: f(q.value) };
      });
  }, [pinned, current]);
  const momentRows = useMemo(() => {
    const a = panelOutput(pinned);
    const b = panelOutput(current);
    const f = outputFormatter(b);
    const show = (v: number | null) => (v === null ? '—' : f(v));
    return [
      { what: 'Mean', pinned: show(a.mean), current: show(b.mean) },
      { what: 'Standard deviation', pinned: show(a.sd), current: show(b.sd) },
      { what: 'Smallest', pinned: show(a.min), current: show(b.min) },
      { what: 'Largest', pinned: show(a.max), current: show(b.max) },
    ];
  }, [pinned, current]);
  const changed = dials.filter((d) => (pinned.run.dialValues[d.id] ?? d.default) !== (current.run.dialValues[d.id] ?? d.default));

  return (
    <section aria-labelledby={titleId} className="space-y-4 rounded-lg border border-ink-200 bg-ink-50 p-3">
      <div>
        <h3 id={titleId} className="text-base font-semibold text-ink-900">
          Pinned view and current view
        </h3>
        <p className="text-[0.8125rem] text-ink-700">
          {changed.length ? `Changed since the pin: ${changed.map((d) => d.label).join(', ')}.` : 'No dial has moved since the pin: move one to compare.'} In the charts the current view is a{' '}
          <strong>{COMPARE_STYLES.current.legend}</strong> and the pinned view a <strong>{COMPARE_STYLES.pinned.legend}</strong>.
        </p>
      </div>
      <div role="region" aria-label="Figures of both views" tabIndex={0} className="overflow-x-auto rounded-md border border-ink-200 bg-white">
        <table className="w-full border-collapse text-[0.8125rem]">
          <caption className="sr-only">Figures of the pinned and the current view, and the difference (current minus pinned)</caption>
          <thead>
            <tr>
              <th scope="col" className={TH}>
                Figure
              </th>
              <th scope="col" className={`${TH} text-right`}>
                {PINNED_LABEL}
              </th>
              <th scope="col" className={`${TH} text-right`}>
                {CURRENT_LABEL}
              </th>
              <th scope="col" className={`${TH} text-right`}>
                Difference
              </th>
            </tr>
          </thead>
          <tbody>
            {rows.map((r, i) => (
              <tr key={r.id} className={i === 0 ? 'font-semibold' : undefined}>
                <th scope="row" className={`${TD} text-left font-normal text-ink-800`}>
                  {r.label}
                </th>
                <td className={`${TD} num text-right whitespace-nowrap`}>{r.pinned}</td>
                <td className={`${TD} num text-right whitespace-nowrap`}>{r.current}</td>
                <td className={`${TD} num text-right whitespace-nowrap`}>{r.difference}</td>
              </tr>
            ))}
            {dials.map((d) => (
              <tr key={`dial-${d.id}`}>
                <th scope="row" className={`${TD} text-left font-normal text-ink-700`}>
                  Dial: {d.label}
                </th>
                <td className={`${TD} num text-right whitespace-nowrap`}>{dialDisplay(d, pinned.run.dialValues[d.id] ?? d.default)}</td>
                <td className={`${TD} num text-right whitespace-nowrap`}>{dialDisplay(d, current.run.dialValues[d.id] ?? d.default)}</td>
                <td className={`${TD} text-right text-ink-600`}>{changed.includes(d) ? 'moved' : 'same'}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      <div className="grid grid-cols-1 gap-4 @3xl:grid-cols-2">
        <ChartFrame
          title="S-curves of both views"
          scene={curves}
          measureRef={curveRef}
          headingLevel="h4"
          downloads={false}
          table={
            <ChartTable
              caption="Percentiles of both views"
              columns={[
                { key: 'p', header: 'Percentile' },
                { key: 'pinned', header: PINNED_LABEL, numeric: true },
                { key: 'current', header: CURRENT_LABEL, numeric: true },
              ]}
              rows={percentileRows}
            />
          }
        />
        <ChartFrame
          title="Spreads of both views"
          scene={spreads}
          measureRef={spreadRef}
          headingLevel="h4"
          downloads={false}
          table={
            <ChartTable
              caption="Spread of both views"
              columns={[
                { key: 'what', header: 'Statistic' },
                { key: 'pinned', header: PINNED_LABEL, numeric: true },
                { key: 'current', header: CURRENT_LABEL, numeric: true },
              ]}
              rows={momentRows}
            />
          }
        />
      </div>
    </section>
  );
}
