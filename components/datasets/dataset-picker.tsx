'use client';

import { useEffect, useState } from 'react';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/field';
import { Banner } from '@/components/ui/banner';
import { LAW_LABELS, type FitOk } from '@/lib/datasets/fit';
import { empiricalChoice, fittedChoice, type DatasetChoice } from '@/lib/datasets/use';
import type { DatasetDetail } from '@/lib/datasets/service';
import type { DatasetRow } from '@/db/datasets';

export interface DatasetPickerProps {
  /** 'input': any engine distribution (fitted law or empirical); 'stack': a linear-stack contributor (normal-fit or empirical). */
  target: 'input' | 'stack';
  /** When given, the use is recorded against the model with the dataset's hash (provenance). */
  modelId?: string;
  onPick: (choice: DatasetChoice) => void;
}

/** Choose a dataset from the firm's library and take a fitted law (parameters copied) or its empirical distribution. */
export function DatasetPicker({ target, modelId, onPick }: DatasetPickerProps) {
  const [list, setList] = useState<DatasetRow[] | null>(null);
  const [datasetId, setDatasetId] = useState('');
  const [detail, setDetail] = useState<DatasetDetail | null>(null);
  const [option, setOption] = useState('empirical');
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  useEffect(() => {
    fetch('/api/datasets')
      .then((r) => (r.ok ? r.json() : Promise.reject(new Error())))
      .then((b: { datasets: DatasetRow[] }) => setList(b.datasets))
      .catch(() => setError('The dataset library could not be loaded.'));
  }, []);

  useEffect(() => {
    if (!datasetId) return;
    let live = true;
    fetch(`/api/datasets/${datasetId}`)
      .then((r) => (r.ok ? r.json() : Promise.reject(new Error())))
      .then((d: DatasetDetail) => {
        if (!live) return;
        setDetail(d);
        const best = (d.fits ?? []).find((f): f is FitOk => f.ok && (target !== 'stack' || f.law === 'normal'));
        setOption(best ? best.law : 'empirical');
      })
      .catch(() => setError('The dataset could not be loaded.'));
    return () => {
      live = false;
    };
  }, [datasetId, target]);

  const fits = (detail?.fits ?? []).filter((f): f is FitOk => f.ok && (target !== 'stack' || f.law === 'normal'));
  const options = [
    ...fits.map((f) => ({ value: f.law, label: `${target === 'stack' ? 'Normal fitted to the data' : `${LAW_LABELS[f.law]} fit`} (rank ${f.rank} by AIC)` })),
    { value: 'empirical', label: 'Empirical (the measured values themselves)' },
  ];

  async function use() {
    if (!detail) return;
    const ds = { id: detail.dataset.id, hash: detail.dataset.hash, name: detail.dataset.name, values: detail.dataset.values };
    const fit = fits.find((f) => f.law === option);
    const choice = fit ? fittedChoice(ds, fit.law, fit.params) : empiricalChoice(ds);
    setPending(true);
    setError(null);
    try {
      if (modelId) {
        const res = await fetch(`/api/datasets/${ds.id}/uses`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ modelId, method: choice.source.method }) });
        if (!res.ok) throw new Error((await res.json()).error?.message ?? 'The use could not be recorded.');
      }
      onPick(choice);
    } catch (err) {
      setError((err as Error).message);
    } finally {
      setPending(false);
    }
  }

  if (list && list.length === 0) return <p className="text-sm text-ink-600">No datasets yet: upload measurements under Datasets first.</p>;
  return (
    <div className="space-y-2">
      <Select
        label="Dataset"
        value={datasetId}
        onChange={(e) => setDatasetId(e.target.value)}
        options={[{ value: '', label: list ? 'Choose a dataset…' : 'Loading…' }, ...(list ?? []).map((d) => ({ value: d.id, label: `${d.name} (${d.rowCount} values${d.unit ? `, ${d.unit}` : ''})` }))]}
      />
      {detail && (
        <>
          <Select label="Use as" value={option} onChange={(e) => setOption(e.target.value)} options={options} />
          {detail.fitRefused && <p className="text-xs text-ink-600">{detail.fitRefused}</p>}
          <Button size="sm" onClick={use} pending={pending} pendingLabel="Applying…">
            Use this distribution
          </Button>
        </>
      )}
      {error && <Banner tone="danger">{error}</Banner>}
    </div>
  );
}
