'use client';

import Link from 'next/link';
import { ModelEditor } from '@/components/editor';
import { ResultsPreview } from '@/components/results';
import { Banner, DateText, LinkButton, LoadError, Loading, PageHeader } from '@/components/ui';
import { CheckStatePill } from './check-state-pill';
import { useModel, useVersion } from './use-models';

const noop = () => undefined;

/** One saved version, read-only: the model as it was saved, its results, and the checker's decision. */
export function VersionView({ modelId, number, userId, canCheck }: { modelId: string; number: number; userId: string; canCheck: boolean }) {
  const model = useModel(modelId);
  const { data, error, mutate } = useVersion(modelId, number);
  if (error) return <LoadError error={error} what={`version ${number}`} onRetry={() => mutate()} />;
  if (!data) return <Loading>Loading version {number}…</Loading>;
  const v = data.version;
  const m = v.model;
  const latest = model.data?.latest?.number ?? null;
  const published = model.data?.widget?.versionNumber === number;
  return (
    <>
      <PageHeader
        eyebrow={
          <>
            <Link href="/app/models">Models</Link> › <Link href={`/app/models/${modelId}`}>{model.data?.model.title ?? m.title}</Link>
          </>
        }
        title={`Version ${number}: ${m.title}`}
        description={
          <span className="flex flex-wrap items-center gap-2 text-sm">
            Saved by {v.authorName ?? 'a former member'}, <DateText iso={v.createdAt} mode="absolute" /> <CheckStatePill state={v.checkState} />
            {published ? <span className="font-medium text-accent-800">Published to clients</span> : null}
          </span>
        }
        actions={
          <>
            {number > 1 || (canCheck && v.checkState === 'unchecked' && v.authorId !== userId) ? (
              <LinkButton variant="secondary" href={`/app/models/${modelId}/versions/${number}/check`}>
                {canCheck && v.checkState === 'unchecked' && v.authorId !== userId ? 'Check this version' : `Compare with v${number - 1}`}
              </LinkButton>
            ) : null}
            <LinkButton variant="secondary" href={`/app/models/${modelId}`}>
              Open the studio
            </LinkButton>
          </>
        }
      />
      {latest !== null && latest > number ? (
        <Banner tone="info" className="mb-4">
          This is an earlier version; the latest is <Link href={`/app/models/${modelId}/versions/${latest}`}>version {latest}</Link>.
        </Banner>
      ) : null}
      {v.note ? (
        <Banner tone="info" title="Author’s note" className="mb-4">
          {v.note}
        </Banner>
      ) : null}
      {v.checkState !== 'unchecked' ? (
        <Banner tone={v.checkState === 'signed_off' ? 'success' : 'warn'} title={`${v.checkState === 'signed_off' ? 'Signed off' : 'Sent back'} by ${v.checkerName ?? 'a former member'}`} className="mb-4">
          <DateText iso={v.checkedAt} mode="absolute" />. {v.checkNote ? <span className="italic">“{v.checkNote}”</span> : null}
          {v.comments.length ? (
            <ul className="mt-1 list-disc pl-5">
              {v.comments.map((c) => (
                <li key={`${c.path}-${c.text}`}>
                  <code className="text-xs">{c.path || 'model'}</code>: {c.text}
                </li>
              ))}
            </ul>
          ) : null}
        </Banner>
      ) : null}
      <div className="grid gap-5 xl:grid-cols-2">
        <section aria-label="Model" className="min-w-0">
          <ModelEditor value={m} onChange={noop} readOnly />
        </section>
        <section aria-label="Results" className="min-w-0 xl:sticky xl:top-4 xl:self-start">
          <ResultsPreview model={m} />
        </section>
      </div>
    </>
  );
}
