'use client';

import { useMemo, useState, type ReactNode } from 'react';
import type { OutputSummary, RunResult } from '@/lib/core/engine';
import { PERCENTILE_DEFINITION } from '@/lib/core/engine/stats';
import { formatCount, formatDuration, formatPercent, formatPpm, formatValue } from '@/lib/core/charts/format';
import { outputFormatter } from '@/lib/core/results/chart-inputs';
import type { SpecLimits } from '@/lib/core/charts/spread';
import { tablesToCsv } from '@/lib/core/results/csv';
import { resultTables } from '@/lib/core/results/tables';
import { ScatterChart } from '@/components/charts/scatter-chart';
import { saveBlob, fileSlug } from '@/components/charts/download';
import { Term } from '@/components/ui/term';
import { StatusMark } from './figures';

const DESIGN_NAME: Record<string, string> = { 'monte-carlo': 'plain Monte Carlo', 'latin-hypercube': 'Latin hypercube' };
const NORMAL_NAME: Record<string, string> = { 'box-muller': 'Box–Muller normals', ziggurat: 'ziggurat normals' };

/** Limits of an output in the charts' terms. */
export function limitsOf(o: OutputSummary, labels?: { lower?: string; upper?: string }): SpecLimits | undefined {
  const l = o.limits;
  if (!l || (l.lower === null && l.upper === null)) return undefined;
  return { lower: l.lower, upper: l.upper, lowerLabel: labels?.lower, upperLabel: labels?.upper };
}

/** Exact shares beyond each limit, for the hatched regions of the spread chart. */
export function outLabelsOf(o: OutputSummary, style: 'ppm' | 'percent', words?: { lower?: string; upper?: string }) {
  const l = o.limits;
  if (!l) return undefined;
  const f = (p: number) => (style === 'ppm' ? formatPpm(p * 1e6) : formatPercent(p));
  return {
    lower: l.below ? `${f(l.below.p)} ${words?.lower ?? 'below'}` : null,
    upper: l.above ? `${f(l.above.p)} ${words?.upper ?? 'above'}` : null,
  };
}

/** Exact shares beyond the limits, from the engine's counts. */
export function outShareOf(o: OutputSummary): { below: number; above: number } | undefined {
  const l = o.limits;
  return l ? { below: l.below?.p ?? 0, above: l.above?.p ?? 0 } : undefined;
}

/** Convergence verdict, invalid trials and engine notes for each output. */
export function Convergence({ outputs, warnings }: { outputs: readonly OutputSummary[]; warnings: readonly string[] }) {
  return (
    <section aria-label="How far to trust these figures" className="space-y-1.5 text-[0.8125rem] leading-snug text-ink-700">
      {outputs.map((o) => (
        <p key={o.id}>
          {outputs.length > 1 ? <span className="font-medium text-ink-900">{o.label}: </span> : null}
          <StatusMark tone={o.convergence.enough ? 'good' : 'warn'}>{o.convergence.enough ? 'Enough trials' : 'Not enough trials'}</StatusMark>
          <span className="text-ink-700"> — {o.convergence.verdict.replace(/^(Enough trials|Not enough trials): /, '')}</span>
          <span className="mt-0.5 block">
            <span className="font-medium text-ink-800">Invalid trials:</span>{' '}
            {o.invalid.total === 0 ? (
              <span className="num">0 of {formatCount(o.trials)}</span>
            ) : (
              <span className="num text-warn-700">
                {formatCount(o.invalid.total)} of {formatCount(o.trials)} gave no number ({formatCount(o.invalid.nan)} NaN, {formatCount(o.invalid.positiveInfinity + o.invalid.negativeInfinity)} infinite) and are left out of the statistics
              </span>
            )}
          </span>
        </p>
      ))}
      {warnings.length ? (
        <ul className="list-disc space-y-0.5 pl-5">
          {warnings.map((w) => (
            <li key={w}>{w}</li>
          ))}
        </ul>
      ) : null}
    </section>
  );
}

/** "50 000 trials · 1.03 s" and the run's method in small print. */
export function SmallPrint({ result, runMs }: { result: RunResult; runMs?: number | null }) {
  const ms = runMs ?? result.timing.totalMs;
  return (
    <p className="text-xs leading-relaxed text-ink-600">
      <span className="num whitespace-nowrap">{formatCount(result.run.trials)}</span> <Term term="trials">trials</Term> ·{' '}
      <span className="num whitespace-nowrap">{formatDuration(ms)}</span> · <Term term="seed">seed</Term> <span className="num">{String(result.run.seed)}</span> ·{' '}
      {DESIGN_NAME[result.run.design] ?? result.run.design}, {NORMAL_NAME[result.run.normalMethod] ?? result.run.normalMethod} · percentiles by{' '}
      <Term explain={PERCENTILE_DEFINITION.text}>{PERCENTILE_DEFINITION.name}</Term>
    </p>
  );
}

/** "Download results (CSV)": every results table, formula-like cells neutralised. */
export function CsvButton({ result }: { result: RunResult }) {
  return (
    <button
      type="button"
      onClick={() => saveBlob(new Blob([tablesToCsv(resultTables(result), { bom: true })], { type: 'text/csv;charset=utf-8' }), `${fileSlug(result.title)}-results.csv`)}
      className="inline-flex h-8 items-center gap-1.5 rounded-md border border-ink-300 bg-white px-3 text-[0.8125rem] font-medium text-ink-800 shadow-sm hover:border-ink-400 hover:bg-ink-50"
    >
      <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" strokeLinejoin="round">
        <path d="M8 2v8m0 0 3-3m-3 3L5 7M2.5 11.5v2h11v-2" />
      </svg>
      Download results (CSV)
    </button>
  );
}

export interface ScatterPanelProps {
  result: RunResult;
  output: OutputSummary;
  limits?: SpecLimits;
  /** Inputs offered, best first (ids of result.samples.inputs). */
  candidates: ReadonlyArray<{ id: string; label: string; unit?: string }>;
  headingLevel?: 'h3' | 'h4';
}

/** A scatter of one chosen input against the output; shown only when the run brought its samples back. */
export function ScatterPanel({ result, output, limits, candidates, headingLevel }: ScatterPanelProps) {
  const available = useMemo(() => candidates.filter((c) => result.samples?.inputs[c.id]), [candidates, result.samples]);
  const [chosen, setChosen] = useState<string | null>(null);
  const y = result.samples?.outputs[output.id];
  const id = chosen && available.some((c) => c.id === chosen) ? chosen : available[0]?.id;
  const x = id ? result.samples?.inputs[id] : undefined;
  if (!y || !x || !id) return null;
  const c = available.find((a) => a.id === id)!;
  const selectId = `scatter-${output.id}`;
  const picker: ReactNode = (
    <label htmlFor={selectId} className="flex items-center gap-1.5 text-[0.8125rem] text-ink-700">
      <span>Input</span>
      <select
        id={selectId}
        value={id}
        onChange={(e) => setChosen(e.target.value)}
        className="h-8 max-w-[12rem] rounded-md border border-ink-300 bg-white px-2 text-[0.8125rem] text-ink-900"
      >
        {available.map((a) => (
          <option key={a.id} value={a.id}>
            {a.label}
          </option>
        ))}
      </select>
    </label>
  );
  return (
    <ScatterChart
      x={x}
      y={y}
      xName={c.label}
      xUnit={c.unit}
      yName={output.label}
      yUnit={output.unit}
      limits={limits}
      controls={picker}
      title={`${output.label} against an input`}
      headingLevel={headingLevel}
      caption={`Each dot is one trial (an even sample of at most 1500). ${limits ? 'Crosses are trials beyond the limits. ' : ''}A clear slope means ${c.label} drives ${output.label}.`}
    />
  );
}

/** Value with unit for headline figures (four significant digits). */
export function fv(v: number | null | undefined, unit: string | null | undefined, sig = 4): string {
  return v === null || v === undefined ? '—' : formatValue(v, unit, { significant: sig });
}

/** A value an author typed (limit, budget, sum of most likely): no padding zeros. */
export function fa(v: number | null | undefined, unit: string | null | undefined): string {
  return v === null || v === undefined ? '—' : formatValue(v, unit, { significant: 6, trim: true });
}

/**
 * One formatter for every figure of an output, so they share their decimals: enough to show the
 * standard deviation to two significant digits (money keeps four significant digits and k/M).
 */
export function outputFormat(unit: string | null | undefined, sd: number | null | undefined): (v: number | null | undefined) => string {
  const f = outputFormatter({ unit: unit ?? '', sd: sd ?? null });
  return (v) => (v === null || v === undefined ? '—' : f(v));
}
