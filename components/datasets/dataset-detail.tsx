'use client';

import { useMemo, useState } from 'react';
import { useRouter } from 'next/navigation';
import { SpreadChart } from '@/components/charts/spread-chart';
import { CumulativeChart } from '@/components/charts/cumulative-chart';
import { Card } from '@/components/ui/card';
import { Banner } from '@/components/ui/banner';
import { CopyButton } from '@/components/ui/copy-button';
import { ConfirmButton } from '@/components/ui/confirm-button';
import { Term } from '@/components/ui/term';
import { LAW_LABELS, type FitOk, type Law } from '@/lib/core/datasets/fit';
import { empiricalChoice, fittedChoice } from '@/lib/core/datasets/use';
import type { DatasetDetail } from '@/lib/core/api-types';
import { FitPlots } from './fit-plots';
import { CapabilityPanel } from './capability-panel';
import { UseInStack } from './use-in-stack';
import { deleteDataset } from './use-datasets';
import { errorMessage } from '@/lib/client/api';

const num = (v: number) => (Number.isFinite(v) ? +v.toPrecision(6) + '' : '—');

const PARAM_LABELS: Record<string, string> = { mean: 'mean', sd: 'sd', mu: 'μ (of ln x)', sigma: 'σ (of ln x)', shape: 'shape', scale: 'scale', rate: 'rate', min: 'min', max: 'max' };

export function DatasetDetailView({ detail, canEdit }: { detail: DatasetDetail; canEdit: boolean }) {
  const router = useRouter();
  const { dataset: ds, summary: s } = detail;
  const okFits = (detail.fits ?? []).filter((f): f is FitOk => f.ok);
  const failed = (detail.fits ?? []).filter((f) => !f.ok);
  const [law, setLaw] = useState<Law | null>(okFits[0]?.law ?? null);
  const chosen = okFits.find((f) => f.law === law) ?? null;
  const sorted = useMemo(() => [...ds.values].sort((a, b) => a - b), [ds.values]);
  const [deleteError, setDeleteError] = useState<string | null>(null);

  const choiceJson = (c: unknown) => JSON.stringify(c, null, 2);

  async function remove() {
    setDeleteError(null);
    try {
      await deleteDataset(ds.id);
    } catch (err) {
      setDeleteError(errorMessage(err));
      throw err;
    }
    router.push('/app/datasets');
    router.refresh();
  }

  return (
    <div className="space-y-6">
      <dl className="grid grid-cols-2 gap-3 sm:grid-cols-5" aria-label="Summary">
        {[
          ['Count', String(s.count)],
          ['Mean', `${num(s.mean)} ${ds.unit}`],
          ['Std deviation (n − 1)', `${num(s.sd)} ${ds.unit}`],
          ['Min', `${num(s.min)} ${ds.unit}`],
          ['Max', `${num(s.max)} ${ds.unit}`],
        ].map(([k, v]) => (
          <div key={k} className="rounded-md border border-ink-200 bg-white p-3">
            <dt className="text-xs text-ink-600">{k}</dt>
            <dd className="font-mono text-lg">{v}</dd>
          </div>
        ))}
      </dl>
      <p className="text-xs text-ink-600">
        From {ds.fileName}, column “{ds.columnName}”, {ds.sizeBytes} bytes, sha256 <span className="font-mono">{ds.hash.slice(0, 16)}…</span>
        {ds.droppedRows.length ? `; rows dropped on upload: ${ds.droppedRows.join(', ')}` : ''}.{' '}
        <a className="text-accent-800 underline" href={`/api/datasets/${ds.id}/csv`}>
          Export CSV
        </a>{' '}
        (cells that begin with =, +, − or @, negative numbers included, are prefixed with an apostrophe so no spreadsheet runs them).
      </p>

      <div className="grid gap-6 lg:grid-cols-2">
        <SpreadChart name={ds.name} unit={ds.unit} bins={s.histogram} total={s.count} noun="measurements" title="Histogram" headingLevel="h3" />
        <CumulativeChart name={ds.name} unit={ds.unit} ecdf={s.ecdf} percentiles={s.percentiles.filter((p) => [0.1, 0.5, 0.9].includes(p.p))} tablePercentiles={s.percentiles} title="Empirical CDF" headingLevel="h3" />
      </div>

      <Card title="Fitted laws" description="Maximum-likelihood fits, ranked by AIC (lower is better). Anderson–Darling A² and Kolmogorov–Smirnov D compare each fitted CDF with the data.">
        {detail.fitRefused ? (
          <Banner tone="warn" title="No fits">
            {detail.fitRefused}
          </Banner>
        ) : (
          <>
            <Banner tone="info">{detail.criticalValueNote}</Banner>
            <div className="mt-3 overflow-x-auto">
              <table className="w-full text-sm">
                <caption className="sr-only">Candidate laws ranked by AIC</caption>
                <thead>
                  <tr className="text-left text-ink-600">
                    <th scope="col" className="py-1">Rank</th>
                    <th scope="col">Law</th>
                    <th scope="col">Parameters</th>
                    <th scope="col" className="text-right"><Term explain="Akaike information criterion, 2k − 2 ln L: lower means a better fit after a penalty for each parameter.">AIC</Term></th>
                    <th scope="col" className="text-right"><Term explain="Anderson–Darling statistic: weighted distance between the fitted CDF and the data, most sensitive in the tails. Lower is better.">A²</Term></th>
                    <th scope="col" className="text-right"><Term explain="Kolmogorov–Smirnov statistic: the largest vertical gap between the fitted CDF and the data's ECDF. Lower is better.">KS D</Term></th>
                    <th scope="col"><span className="sr-only">Show</span></th>
                  </tr>
                </thead>
                <tbody>
                  {okFits.map((f) => (
                    <tr key={f.law} className={f.law === law ? 'bg-accent-50' : undefined}>
                      <td className="py-1 font-mono">{f.rank}</td>
                      <td>{LAW_LABELS[f.law]}</td>
                      <td className="font-mono text-xs">{Object.entries(f.params).map(([k, v]) => `${PARAM_LABELS[k] ?? k} ${num(v)}`).join(', ')}</td>
                      <td className="text-right font-mono">{num(f.aic)}</td>
                      <td className="text-right font-mono">{f.ad === null ? <span title="Not defined: the fitted support ends at the data's extremes">—</span> : num(f.ad)}</td>
                      <td className="text-right font-mono">{num(f.ks)}</td>
                      <td className="text-right">
                        <button type="button" className="text-accent-800 underline" aria-pressed={f.law === law} onClick={() => setLaw(f.law)}>
                          Plots
                        </button>
                      </td>
                    </tr>
                  ))}
                  {failed.map((f) => (
                    <tr key={f.law} className="text-ink-600">
                      <td className="py-1">—</td>
                      <td>{LAW_LABELS[f.law]}</td>
                      <td colSpan={5}>{!f.ok && f.reason}</td>
                    </tr>
                  ))}
                </tbody>
              </table>
            </div>
          </>
        )}
      </Card>

      {chosen && (
        <Card title={`${LAW_LABELS[chosen.law]} fit`} as="h2">
          <FitPlots law={chosen.law} params={chosen.params} bins={s.histogram} sorted={sorted} unit={ds.unit} />
          <div className="mt-4 flex flex-wrap gap-2">
            <CopyButton value={choiceJson(fittedChoice(ds, chosen.law, chosen.params).distribution)} label={`Use this law (${LAW_LABELS[chosen.law]})`} what="distribution" />
            <CopyButton value={choiceJson(empiricalChoice(ds).distribution)} label="Use empirical" what="distribution" variant="secondary" />
          </div>
          <p className="mt-2 text-xs text-ink-600">
            Copies the distribution for a model input. In the model editor, choose “From a dataset” to copy it with this dataset (and its hash) recorded as the source.
          </p>
        </Card>
      )}

      <Card title="Process capability of the measured parts" description="For a linear stack contributor fed by these measurements: Pp/Ppk of the data against the contributor’s tolerance.">
        <CapabilityPanel values={ds.values} unit={ds.unit} initialNominal={+s.mean.toPrecision(4)} />
      </Card>

      {canEdit && (
        <Card title="Use in a stack" description="Feed a linear-stack contributor from these measurements and save it as a new version: see the parts’ Ppk against the contributor’s tolerance and how the gap’s Ppk changes.">
          <UseInStack dataset={{ id: ds.id, name: ds.name, hash: ds.hash, unit: ds.unit, values: ds.values }} />
        </Card>
      )}

      {canEdit && (
        <Card title="Delete dataset">
          {detail.usedBy.length > 0 ? (
            <Banner tone="warn" title={`Used by ${detail.usedBy.length} model(s)`}>
              {detail.usedBy.map((m) => m.title).join(', ')}. Their saved versions keep the values they copied; new uses will no longer be possible.
            </Banner>
          ) : (
            <p className="text-sm text-ink-600">No model uses this dataset.</p>
          )}
          {deleteError && <Banner tone="danger">{deleteError}</Banner>}
          <ConfirmButton className="mt-3" prompt={`Delete “${ds.name}”${detail.usedBy.length ? ` although ${detail.usedBy.length} model(s) use it` : ''}?`} confirmLabel="Yes, delete" onConfirm={remove}>
            Delete
          </ConfirmButton>
        </Card>
      )}
    </div>
  );
}
