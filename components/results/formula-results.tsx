'use client';

import { memo, useDeferredValue, useMemo, useState } from 'react';
import type { OutputSummary, RunResult } from '@/lib/core/engine';
import { formatFixed, formatPercent, formatPpm } from '@/lib/core/charts/format';
import { CumulativeChart } from '@/components/charts/cumulative-chart';
import { DriversChart } from '@/components/charts/drivers-chart';
import { SpreadChart } from '@/components/charts/spread-chart';
import { Tabs } from '@/components/ui/tabs';
import { Term } from '@/components/ui/term';
import { Figure, Figures } from './figures';
import { fv, limitsOf, outLabelsOf, outputFormat, ScatterPanel, outShareOf } from './shared';

/** One output's figures, then its charts from a deferred copy of the result (an edit paints the figures first). */
function OutputResults({ result, output }: { result: RunResult; output: OutputSummary }) {
  const deferred = useDeferredValue(result);
  const later = deferred.outputs.find((o) => o.id === output.id);
  return (
    <div className="space-y-4">
      <OutputPart result={result} output={output} part="figures" />
      {later ? <OutputPart result={deferred} output={later} part="charts" /> : null}
    </div>
  );
}

const OutputPart = memo(function OutputPart({ result, output, part }: { result: RunResult; output: OutputSummary; part: 'figures' | 'charts' }) {
  const unit = output.unit;
  const l = output.limits;
  const f = outputFormat(unit, output.sd);
  const limits = limitsOf(output);
  const pv = (p: number) => output.percentiles.find((x) => Math.abs(x.p - p) < 1e-9)?.value ?? null;
  const percentiles = useMemo(() => output.percentiles.filter((p) => [0.1, 0.5, 0.8, 0.9].includes(p.p)).map((p) => ({ p: p.p, value: p.value })), [output.percentiles]);
  const allPercentiles = useMemo(() => output.percentiles.map((p) => ({ p: p.p, value: p.value })), [output.percentiles]);
  const outShare = useMemo(() => outShareOf(output), [output]);
  const drivers = useMemo(() => output.drivers.items.map((d) => ({ id: d.id, label: d.label, share: d.share, correlation: d.spearman })), [output.drivers.items]);
  const markers = useMemo(() => (output.mean !== null ? [{ value: output.mean, label: `Mean ${f(output.mean)}`, kind: 'mean' as const }] : []), [output.mean, f]);
  const outLabels = useMemo(() => outLabelsOf(output, 'percent'), [output]);
  const candidates = useMemo(() => result.inputs.map((i) => ({ id: i.id, label: i.label, unit: i.unit })).sort((a, b) => {
    const rank = (id: string) => {
      const k = output.drivers.items.findIndex((d) => d.id === id);
      return k < 0 ? Infinity : k;
    };
    return rank(a.id) - rank(b.id);
  }), [result.inputs, output.drivers.items]);

  if (part === 'figures')
    return (
      <Figures label={`Headline figures for ${output.label}`}>
        {l ? (
          <Figure
            lead
            label="Beyond the limits"
            value={formatPercent(l.outside.p)}
            sub={
              <span className="num">
                95 % interval {formatPercent(l.outside.ci.low)} to {formatPercent(l.outside.ci.high)}
                {l.ppmNormal !== null ? ` · normal estimate ${l.ppmNormal >= 1000 ? formatPercent(l.ppmNormal / 1e6) : formatPpm(l.ppmNormal)}` : ''}
              </span>
            }
          />
        ) : (
          <Figure lead label="Median (P50)" value={f(pv(0.5))} sub="Half the trials fall below it" />
        )}
        <Figure label="Mean · standard deviation" value={f(output.mean)} sub={<span className="num">s = {fv(output.sd, unit, 3)}</span>} />
        <Figure
          label={
            <>
              P10 to <Term term="P90">P90</Term>
            </>
          }
          value={<span className="text-lg">{`${f(pv(0.1))} to ${f(pv(0.9))}`}</span>}
          sub="Eight trials in ten fall in this range"
        />
        {l && (l.pp !== null || l.ppk !== null) ? (
          <Figure
            label={
              <>
                <Term term="Pp/Ppk">Pp / Ppk</Term>
              </>
            }
            value={`${l.pp !== null ? formatFixed(l.pp, 2) : '—'} / ${l.ppk !== null ? formatFixed(l.ppk, 2) : '—'}`}
            sub={l.pp === null ? 'Pp needs both limits' : 'From overall variation of the output'}
          />
        ) : (
          <Figure label="Range of trials" value={<span className="text-lg">{`${f(output.min)} to ${f(output.max)}`}</span>} sub="Smallest and largest valid trial" />
        )}
      </Figures>
    );
  return (
    <div className="grid grid-cols-1 gap-4 xl:grid-cols-2">
      <SpreadChart className="xl:col-span-2" name={output.label} unit={unit} bins={output.histogram} total={output.valid} limits={limits} markers={markers} outLabels={outLabels} outShare={outShare} />
      <CumulativeChart name={output.label} unit={unit} ecdf={output.ecdf} percentiles={percentiles} tablePercentiles={allPercentiles} limits={limits} />
      <DriversChart name={output.label} drivers={drivers} />
      <div className="xl:col-span-2">
        <ScatterPanel result={result} output={output} limits={limits} candidates={candidates} />
      </div>
    </div>
  );
});

/** Results of a formula model: one tab per output (the first with limits opens first). */
export function FormulaResults({ result }: { result: RunResult }) {
  const first = result.outputs.find((o) => o.limits) ?? result.outputs[result.outputs.length - 1];
  const [tab, setTab] = useState(first?.id);
  if (result.outputs.length === 1) return <OutputResults result={result} output={result.outputs[0]} />;
  return (
    <Tabs
      label="Outputs"
      value={tab}
      onChange={setTab}
      tabs={result.outputs.map((o) => ({ id: o.id, label: o.label, content: <OutputResults result={result} output={o} /> }))}
    />
  );
}
