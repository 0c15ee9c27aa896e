'use client';

import { useState } from 'react';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/field';
import { Banner } from '@/components/ui/banner';
import { LoadError } from '@/components/ui/load-error';
import { errorMessage } from '@/lib/client/api';
import { recordDatasetUse, useDataset, useDatasets } from './use-datasets';
import { LAW_LABELS, type FitOk } from '@/lib/core/datasets/fit';
import { empiricalChoice, fittedChoice, type DatasetChoice } from '@/lib/core/datasets/use';

export interface DatasetPickerProps {
  /** 'input': any engine distribution (fitted law or empirical); 'stack': a linear-stack contributor (normal-fit or empirical). */
  target: 'input' | 'stack';
  /** When given, the use is recorded against the model with the dataset's hash (provenance). */
  modelId?: string;
  onPick: (choice: DatasetChoice) => void;
}

/** Choose a dataset from the firm's library and take a fitted law (parameters copied) or its empirical distribution. */
export function DatasetPicker({ target, modelId, onPick }: DatasetPickerProps) {
  const library = useDatasets();
  const list = library.data?.datasets ?? null;
  const [datasetId, setDatasetId] = useState('');
  const { data: detail, error: detailError } = useDataset(datasetId || null);
  const [option, setOption] = useState('empirical');
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  // A newly chosen dataset starts on its best fit (for a stack: the normal fit), else on the empirical law.
  const [optionFor, setOptionFor] = useState<string | null>(null);
  if (detail && optionFor !== detail.dataset.id) {
    setOptionFor(detail.dataset.id);
    const best = (detail.fits ?? []).find((f): f is FitOk => f.ok && (target !== 'stack' || f.law === 'normal'));
    setOption(best ? best.law : 'empirical');
  }

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
      if (modelId) await recordDatasetUse(ds.id, { modelId, method: choice.source.method });
      onPick(choice);
    } catch (err) {
      setError(errorMessage(err));
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
      {library.error ? <LoadError error={library.error} what="the dataset library" onRetry={() => void library.mutate()} /> : null}
      {detailError ? <LoadError error={detailError} what="the dataset" /> : null}
      {error && <Banner tone="danger">{error}</Banner>}
    </div>
  );
}
