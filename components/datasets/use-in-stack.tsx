'use client';

import { useMemo, useState } from 'react';
import Link from 'next/link';
import { useRouter } from 'next/navigation';
import { Button } from '@/components/ui/button';
import { Select } from '@/components/ui/field';
import { Banner } from '@/components/ui/banner';
import { Term } from '@/components/ui/term';
import { LoadError } from '@/components/ui/load-error';
import { useModel, useModels } from '@/components/models/use-models';
import { errorMessage } from '@/lib/client/api';
import { recordDatasetUse } from './use-datasets';
import { evaluateStack } from '@/lib/core/engine/analytic';
import { linearStackSchema, validateModel, type LinearStackModel } from '@/lib/core/engine/schema';
import { dataCapability } from '@/lib/core/datasets/summary';

type Method = 'normal-fit' | 'empirical';

const fmt = (v: number | null) => (v === null || !Number.isFinite(v) ? '—' : v.toFixed(2));

/**
 * Feed a linear-stack contributor from this dataset and save it as a new version of the model. The version note
 * names the dataset and its sha256, so the saved version records exactly which data it copied.
 */
export function UseInStack({ dataset }: { dataset: { id: string; name: string; hash: string; unit: string; values: number[] } }) {
  const router = useRouter();
  const library = useModels(false);
  const models = library.data ? library.data.models.filter((m) => m.template === 'linear-stack' && !m.archivedAt) : null;
  const [modelId, setModelId] = useState('');
  const chosen = useModel(modelId || null);
  const [contributorId, setContributorId] = useState('');
  const [method, setMethod] = useState<Method>('normal-fit');
  const [pending, setPending] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [saved, setSaved] = useState<number | null>(null);

  // The stack as last saved (or its draft before any version); it follows each save.
  const detail = chosen.data;
  const parsed = useMemo(() => (detail ? linearStackSchema.safeParse(detail.latest?.model ?? detail.model.draft) : null), [detail]);
  const base = useMemo(() => (parsed?.success ? { model: parsed.data, version: detail?.latest?.number ?? 0 } : null), [parsed, detail]);
  const notAStack = parsed !== null && !parsed.success;

  // A newly chosen model starts on its first contributor.
  const [contributorFor, setContributorFor] = useState<string | null>(null);
  if (base && detail && contributorFor !== detail.model.id) {
    setContributorFor(detail.model.id);
    setContributorId(base.model.contributors[0]?.id ?? '');
  }

  const contributor = base?.model.contributors.find((c) => c.id === contributorId) ?? null;
  const next = useMemo(() => {
    if (!base || !contributor) return null;
    const model: LinearStackModel = {
      ...base.model,
      contributors: base.model.contributors.map((c) => (c.id === contributor.id ? { ...c, distribution: { type: method, data: [...dataset.values] } } : c)),
    };
    return model;
  }, [base, contributor, method, dataset.values]);
  const before = useMemo(() => (base ? evaluateStack(base.model).statistical : null), [base]);
  const after = useMemo(() => (next ? evaluateStack(next).statistical : null), [next]);
  const partCap = contributor ? dataCapability(dataset.values, contributor.nominal, contributor.plusTol, contributor.minusTol) : null;

  async function save() {
    if (!base || !next || !contributor) return;
    setPending(true);
    setError(null);
    try {
      const note = `Contributor "${contributor.name}" now ${method === 'empirical' ? 'samples the measured values' : 'uses a normal fitted to the measured values'} of dataset "${dataset.name}" (sha256 ${dataset.hash}).`;
      // The changed stack is checked here, where it is made, like every model before it is saved.
      const checked = validateModel(next);
      if (!checked.ok) {
        setError(`Nothing was saved: the stack with this dataset is not a valid model (${checked.issues[0]?.message ?? 'no detail given'}).`);
        return;
      }
      const version = await chosen.saveVersion({ baseVersion: base.version, note, model: checked.model });
      await recordDatasetUse(dataset.id, { modelId, method: method === 'normal-fit' ? 'normal' : 'empirical' });
      setSaved(version.number);
      // The delete warning and use counts on this page come from the server.
      router.refresh();
    } catch (err) {
      setError(errorMessage(err));
    } finally {
      setPending(false);
    }
  }

  if (models && models.length === 0) return <p className="text-sm text-ink-600">No linear-stack models yet. Create one under Models, then come back to feed a contributor from this dataset.</p>;
  return (
    <div className="space-y-3">
      <div className="grid gap-3 md:grid-cols-3">
        <Select label="Stack model" value={modelId} onChange={(e) => {
            setSaved(null);
            setModelId(e.target.value);
          }} options={[{ value: '', label: models ? 'Choose a model…' : 'Loading…' }, ...(models ?? []).map((m) => ({ value: m.id, label: m.title }))]} />
        {base && (
          <Select label="Contributor" value={contributorId} onChange={(e) => setContributorId(e.target.value)} options={base.model.contributors.map((c) => ({ value: c.id, label: `${c.name} (${c.nominal} +${c.plusTol}/−${c.minusTol})` }))} />
        )}
        {base && (
          <Select
            label="Distribution from the data"
            value={method}
            onChange={(e) => setMethod(e.target.value as Method)}
            options={[
              { value: 'normal-fit', label: 'Normal fitted to the data' },
              { value: 'empirical', label: 'Empirical (the measured values)' },
            ]}
          />
        )}
      </div>
      {contributor && partCap && before && after && (
        <dl className="grid grid-cols-2 gap-3 font-mono text-sm md:grid-cols-4" aria-live="polite">
          <div>
            <dt className="font-sans text-ink-600">
              Parts’ <Term term="Ppk">Ppk</Term> vs this tolerance
            </dt>
            <dd data-testid="contributor-ppk">{fmt(partCap.ppk)}</dd>
          </div>
          <div>
            <dt className="font-sans text-ink-600">Parts’ Pp</dt>
            <dd>{fmt(partCap.pp)}</dd>
          </div>
          <div>
            <dt className="font-sans text-ink-600">Gap Ppk now</dt>
            <dd data-testid="stack-ppk-before">{fmt(before.ppk)}</dd>
          </div>
          <div>
            <dt className="font-sans text-ink-600">Gap Ppk with the data</dt>
            <dd data-testid="stack-ppk-after">{fmt(after.ppk)}</dd>
          </div>
        </dl>
      )}
      {contributor && <p className="text-xs text-ink-600">Gap Ppk here is the statistical (normal approximation) figure; the model’s Monte Carlo result is shown in the model itself.</p>}
      {library.error ? <LoadError error={library.error} what="the models" onRetry={() => void library.mutate()} /> : null}
      {chosen.error ? <LoadError error={chosen.error} what="the model" onRetry={() => void chosen.mutate()} /> : null}
      {notAStack && <Banner tone="danger">This model does not open as a linear stack; fix it in the editor first.</Banner>}
      {error && <Banner tone="danger">{error}</Banner>}
      {saved !== null && (
        <Banner tone="success">
          Saved as version {saved}; its note records the dataset and its sha256.{' '}
          <Link className="underline" href={`/app/models/${modelId}`}>
            Open the model
          </Link>
        </Banner>
      )}
      {contributor && (
        <Button onClick={save} pending={pending} pendingLabel="Saving…">
          Save as a new version
        </Button>
      )}
    </div>
  );
}
