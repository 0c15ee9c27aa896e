'use client';

import type { RunResult } from '@/lib/core/engine';
import type { StackAnalysis } from '@/lib/core/engine/analytic';
import { formatFixed, formatPpm } from '@/lib/core/charts/format';

/** Correlated stack: RSS and the normal estimate without and with the correlation terms, side by side. */
export function StackCorrelationTerms({ a, format }: { a: StackAnalysis; format: (v: number | null) => string }) {
  if (!a.correlated) return null;
  const rows: { label: string; without: string; with: string }[] = [
    { label: 'RSS half-width (± of the gap)', without: format(a.independent.rssHalfWidth), with: format(a.rss.halfWidth) },
    { label: 'Standard deviation of the gap', without: format(a.independent.sd), with: format(a.statistical.sd) },
    {
      label: 'Out of specification, normal estimate',
      without: a.independent.ppmNormal === null ? '—' : formatPpm(a.independent.ppmNormal),
      with: a.statistical.ppmNormal === null ? '—' : formatPpm(a.statistical.ppmNormal),
    },
    { label: 'Ppk, normal estimate', without: a.independent.ppk === null ? '—' : formatFixed(a.independent.ppk, 2), with: a.statistical.ppk === null ? '—' : formatFixed(a.statistical.ppk, 2) },
  ];
  return (
    <div className="overflow-x-auto rounded-md border border-ink-200 bg-white px-3 py-2.5">
      <table className="w-full text-sm">
        <caption className="mb-1 text-left text-[0.8125rem] font-semibold text-ink-900">RSS without and with the correlation terms</caption>
        <thead>
          <tr className="text-xs text-ink-600">
            <th scope="col" className="py-1 pr-3 text-left font-medium">
              Figure
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Contributors independent
            </th>
            <th scope="col" className="py-1 text-right font-medium">
              With the correlations
            </th>
          </tr>
        </thead>
        <tbody>
          {rows.map((r) => (
            <tr key={r.label} className="border-t border-ink-100">
              <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-800">
                {r.label}
              </th>
              <td className="num py-1 pr-3 text-right text-ink-700">{r.without}</td>
              <td className="num py-1 text-right font-semibold text-ink-900">{r.with}</td>
            </tr>
          ))}
        </tbody>
      </table>
      <p className="mt-1.5 text-xs leading-snug text-ink-600">
        σ² = Σ aᵢ²σᵢ² + 2 Σ aᵢaⱼρᵢⱼσᵢσⱼ over the pairs (the variance of a sum of correlated terms); aᵢ is ±1 for the direction in the loop. A positive correlation between two dimensions that add
        the same way widens the gap’s spread; between dimensions that oppose each other it narrows it. The correlations are those of the normal scores (Gaussian copula); for a
        normal contributor they are its Pearson correlations.
      </p>
    </div>
  );
}

/** Target against achieved correlations of each correlated group (upper triangle, one row per pair). */
export function AchievedCorrelations({ result, names }: { result: RunResult; names: Map<string, string> }) {
  if (!result.correlation.length) return null;
  return (
    <div className="overflow-x-auto rounded-md border border-ink-200 bg-white px-3 py-2.5">
      <table className="w-full text-sm">
        <caption className="mb-1 text-left text-[0.8125rem] font-semibold text-ink-900">Correlations: target and achieved in this run</caption>
        <thead>
          <tr className="text-xs text-ink-600">
            <th scope="col" className="py-1 pr-3 text-left font-medium">
              Pair
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Target
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Achieved (Pearson)
            </th>
            <th scope="col" className="py-1 pr-3 text-right font-medium">
              Rank, expected
            </th>
            <th scope="col" className="py-1 text-right font-medium">
              Rank, achieved
            </th>
          </tr>
        </thead>
        <tbody>
          {result.correlation.flatMap((g) =>
            g.ids.flatMap((a, i) =>
              g.ids.slice(i + 1).map((b, k) => {
                const j = i + 1 + k;
                return (
                  <tr key={`${a}-${b}`} className="border-t border-ink-100">
                    <th scope="row" className="py-1 pr-3 text-left font-normal text-ink-800">
                      {names.get(a) ?? a} · {names.get(b) ?? b}
                    </th>
                    <td className="num py-1 pr-3 text-right text-ink-900">{formatFixed(g.target[i][j], 3)}</td>
                    <td className="num py-1 pr-3 text-right text-ink-700">{formatFixed(g.pearson[i][j], 3)}</td>
                    <td className="num py-1 pr-3 text-right text-ink-700">{formatFixed(g.expectedSpearman[i][j], 3)}</td>
                    <td className="num py-1 text-right text-ink-700">{formatFixed(g.spearman[i][j], 3)}</td>
                  </tr>
                );
              }),
            ),
          )}
        </tbody>
      </table>
      <p className="mt-1.5 text-xs leading-snug text-ink-600">
        Achieved values come from the first {formatFixed(result.correlation[0].trials, 0)} trials. Under the Gaussian copula the expected rank correlation is (6/π)·arcsin(ρ/2).
      </p>
    </div>
  );
}
