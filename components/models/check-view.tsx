'use client';

import Link from 'next/link';
import { useMemo, useState } from 'react';
import { ResultsPreview } from '@/components/results';
import { Banner, Button, Card, DateText, EmptyState, FieldError, FormError, LoadError, Loading, PageHeader, StatusPill, cx } from '@/components/ui';
import { ApiError, errorMessage } from '@/lib/client/api';
import { diffModels, formatDiffValue, summarise, type DiffEntry, type DiffKind } from '@/lib/core/models/diff';
import type { CheckComment, VersionRecord } from '@/lib/core/models/types';
import { CheckStatePill } from './check-state-pill';
import { checkVersion, useModel, useVersion } from './use-models';

export interface CheckViewProps {
  modelId: string;
  number: number;
  userId: string;
  canCheck: boolean;
}

const KIND_LABEL: Record<DiffKind, string> = { added: 'Added', removed: 'Removed', changed: 'Changed', reordered: 'Reordered' };
const KIND_SHAPE: Record<DiffKind, 'ok' | 'stopped' | 'warn' | 'info'> = { added: 'ok', removed: 'stopped', changed: 'warn', reordered: 'info' };

function DiffRow({ e, prev, comment, onComment, editable }: { e: DiffEntry; prev: number; comment: string | undefined; onComment: (text: string | null) => void; editable: boolean }) {
  const [open, setOpen] = useState(Boolean(comment));
  const id = `c-${e.path || 'root'}-${e.kind}`.replace(/[^a-zA-Z0-9_-]/g, '_');
  return (
    <tr className="align-top">
      <th scope="row" className="px-3 py-2.5 text-left font-normal first:pl-4">
        <span className="flex flex-wrap items-center gap-2">
          <StatusPill kind={KIND_SHAPE[e.kind]}>{KIND_LABEL[e.kind]}</StatusPill>
          <span className="font-medium text-ink-900">{e.label}</span>
        </span>
        <code className="mt-0.5 block text-xs text-ink-600">{e.path || '(whole model)'}</code>
      </th>
      <td className={cx('num px-3 py-2.5 break-all', e.kind !== 'added' && 'bg-danger-50/60')}>
        <span className="sr-only">v{prev}: </span>
        {e.kind === 'added' ? <span className="text-ink-500">not present</span> : formatDiffValue(e.before)}
      </td>
      <td className={cx('num px-3 py-2.5 break-all', e.kind !== 'removed' && 'bg-accent-50/70')}>
        <span className="sr-only">v{prev + 1}: </span>
        {e.kind === 'removed' ? <span className="text-ink-500">removed</span> : formatDiffValue(e.after)}
      </td>
      <td className="px-3 py-2.5 last:pr-4">
        {open || comment ? (
          <div>
            <label htmlFor={id} className="sr-only">
              Comment on {e.label}
            </label>
            <textarea
              id={id}
              rows={2}
              readOnly={!editable}
              value={comment ?? ''}
              onChange={(ev) => onComment(ev.target.value || null)}
              className="block w-full min-w-[12rem] rounded-md border border-ink-400 px-2 py-1 text-sm"
              placeholder="What should change here?"
            />
          </div>
        ) : editable ? (
          <Button size="sm" variant="ghost" aria-label={`Comment on ${e.label}`} onClick={() => setOpen(true)}>
            Comment
          </Button>
        ) : null}
      </td>
    </tr>
  );
}

function Decided({ v }: { v: VersionRecord }) {
  return (
    <Banner tone={v.checkState === 'signed_off' ? 'success' : 'warn'} title={v.checkState === 'signed_off' ? `Signed off by ${v.checkerName ?? 'a former member'}` : `Sent back by ${v.checkerName ?? 'a former member'}`}>
      <DateText iso={v.checkedAt} mode="absolute" />. {v.checkNote ? <span className="italic">“{v.checkNote}”</span> : null}
      {v.comments.length ? (
        <ul className="mt-2 list-disc pl-5">
          {v.comments.map((c) => (
            <li key={`${c.path}-${c.text}`}>
              <code className="text-xs">{c.path || 'model'}</code>: {c.text}
            </li>
          ))}
        </ul>
      ) : null}
    </Banner>
  );
}

/** The checker's view: every field that changed since the previous version, both results side by side, and the decision. */
export function CheckView({ modelId, number, userId, canCheck }: CheckViewProps) {
  const model = useModel(modelId);
  const cur = useVersion(modelId, number);
  const prev = useVersion(modelId, number > 1 ? number - 1 : null);
  const [comments, setComments] = useState<Record<string, string>>({});
  const [note, setNote] = useState('');
  const [noteError, setNoteError] = useState<string | null>(null);
  const [messages, setMessages] = useState<string[]>([]);
  const [pending, setPending] = useState<'sign_off' | 'send_back' | null>(null);

  const v = cur.data?.version ?? null;
  const p = prev.data?.version ?? null;
  const entries = useMemo(() => (v && (number === 1 || p) ? (number === 1 ? [] : diffModels(p!.model, v.model)) : null), [v, p, number]);

  if (cur.error) return <LoadError error={cur.error} what={`version ${number}`} onRetry={() => cur.mutate()} />;
  if (prev.error) return <LoadError error={prev.error} what={`version ${number - 1}`} onRetry={() => prev.mutate()} />;
  if (!v || entries === null) return <Loading>Loading versions…</Loading>;

  const own = v.authorId === userId;
  const canDecide = canCheck && !own && v.checkState === 'unchecked';
  const counts = summarise(entries);
  const title = v.model.title;

  async function decide(decision: 'sign_off' | 'send_back') {
    setMessages([]);
    setNoteError(null);
    const list: CheckComment[] = Object.entries(comments)
      .filter(([, t]) => t.trim())
      .map(([path, text]) => ({ path, text: text.trim() }));
    if (decision === 'send_back' && !note.trim() && !list.length) {
      setNoteError('Say what needs to change: write a note or comment on a field before sending the version back.');
      return;
    }
    setPending(decision);
    try {
      await checkVersion(v!.id, { decision, note: note.trim(), comments: list });
      await Promise.all([cur.mutate(), model.mutate()]);
    } catch (err) {
      if (err instanceof ApiError && err.fields?.note) setNoteError(err.fields.note.join(' '));
      else setMessages([errorMessage(err)]);
    } finally {
      setPending(null);
    }
  }

  return (
    <>
      <PageHeader
        eyebrow={
          <>
            <Link href="/app/models">Models</Link> › <Link href={`/app/models/${modelId}`}>{model.data?.model.title ?? title}</Link>
          </>
        }
        title={number > 1 ? `Check version ${number} against version ${number - 1}` : 'Check version 1'}
        description={
          <span className="flex flex-wrap items-center gap-2 text-sm">
            Saved by {v.authorName ?? 'a former member'}, <DateText iso={v.createdAt} mode="absolute" /> <CheckStatePill state={v.checkState} />
          </span>
        }
        actions={
          canDecide ? (
            <a href="#check-decision" className="text-sm font-medium text-accent-800 underline">
              Go to your decision
            </a>
          ) : null
        }
      />
      {v.note ? (
        <Card className="mb-4" title="Author’s note">
          <p className="text-sm whitespace-pre-wrap">{v.note}</p>
        </Card>
      ) : null}
      {v.checkState !== 'unchecked' ? (
        <div className="mb-4">
          <Decided v={v} />
        </div>
      ) : own ? (
        <Banner tone="warn" title="You wrote this version" className="mb-4">
          A version is checked by someone other than its author. Another checker in your firm signs it off or sends it back.
        </Banner>
      ) : !canCheck ? (
        <Banner tone="info" className="mb-4">
          Checkers sign off versions. You can read the comparison here.
        </Banner>
      ) : null}

      <Card
        title={number > 1 ? 'What changed' : 'First version'}
        description={
          number > 1
            ? entries.length
              ? `${entries.length} ${entries.length === 1 ? 'difference' : 'differences'}: ${counts.changed} changed, ${counts.added} added, ${counts.removed} removed${counts.reordered ? `, ${counts.reordered} reordered` : ''}.`
              : 'No field differs from the previous version.'
            : 'There is no earlier version to compare with: review every field in the model below.'
        }
        bodyClassName="p-0 sm:p-0"
      >
        {number > 1 ? (
          entries.length ? (
            <div className="overflow-x-auto">
              <table className="w-full border-collapse text-sm">
                <caption className="sr-only">Field-level differences between version {number - 1} and version {number}</caption>
                <thead className="border-b border-ink-200 bg-ink-50 text-xs font-semibold tracking-wide text-ink-700 uppercase">
                  <tr>
                    <th scope="col" className="px-3 py-2 text-left first:pl-4">
                      Field
                    </th>
                    <th scope="col" className="px-3 py-2 text-left">
                      Version {number - 1}
                    </th>
                    <th scope="col" className="px-3 py-2 text-left">
                      Version {number}
                    </th>
                    <th scope="col" className="px-3 py-2 text-left last:pr-4">
                      Comment
                    </th>
                  </tr>
                </thead>
                <tbody className="divide-y divide-ink-100">
                  {entries.map((e) => (
                    <DiffRow
                      key={`${e.kind}:${e.path}:${e.beforePath}`}
                      e={e}
                      prev={number - 1}
                      editable={canDecide}
                      comment={comments[e.path] ?? v.comments.find((c) => c.path === e.path)?.text}
                      onComment={(text) =>
                        setComments((c) => {
                          const next = { ...c };
                          if (text === null) delete next[e.path];
                          else next[e.path] = text;
                          return next;
                        })
                      }
                    />
                  ))}
                </tbody>
              </table>
            </div>
          ) : (
            <div className="p-4">
              <EmptyState title="Identical to the previous version" as="h3">
                <p>The author saved the same model again. Sign it off only if the previous version was right.</p>
              </EmptyState>
            </div>
          )
        ) : (
          <div className="p-4 text-sm text-ink-700">
            Open <Link href={`/app/models/${modelId}/versions/1`}>version 1</Link> to read every field, then come back to decide.
          </div>
        )}
      </Card>

      <section aria-labelledby="results-heading" className="mt-6">
        <h2 id="results-heading" className="mb-3 text-base font-semibold text-ink-900">
          Results {number > 1 ? 'side by side' : ''}
        </h2>
        <div className={cx('grid gap-4', number > 1 && 'lg:grid-cols-2')}>
          {number > 1 && p ? (
            <div className="min-w-0">
              <h3 className="mb-2 text-sm font-semibold text-ink-800">Version {number - 1}</h3>
              <ResultsPreview model={p.model} />
            </div>
          ) : null}
          <div className="min-w-0">
            <h3 className="mb-2 text-sm font-semibold text-ink-800">Version {number}</h3>
            <ResultsPreview model={v.model} />
          </div>
        </div>
      </section>

      {canDecide ? (
        <Card title="Your decision" className="mt-6" id="check-decision">
          <form
            noValidate
            className="space-y-3"
            onSubmit={(e) => {
              e.preventDefault();
              void decide('sign_off');
            }}
          >
            <FormError messages={messages} />
            <div>
              <label htmlFor="check-note" className="mb-1 block text-sm font-medium text-ink-800">
                Note
              </label>
              <textarea
                id="check-note"
                rows={3}
                maxLength={4000}
                value={note}
                onChange={(e) => {
                  setNote(e.target.value);
                  setNoteError(null);
                }}
                aria-invalid={noteError ? true : undefined}
                aria-describedby={noteError ? 'check-note-error' : 'check-note-hint'}
                className={cx('block w-full rounded-md border px-3 py-2 text-sm', noteError ? 'border-danger-600 ring-1 ring-danger-600' : 'border-ink-400')}
                placeholder="What you checked, against which drawing or estimate basis, and anything the author should know."
              />
              {noteError ? <FieldError id="check-note-error">{noteError}</FieldError> : null}
              <p id="check-note-hint" className="mt-1 text-[0.8125rem] text-ink-600">
                Kept with the version and shown on client snapshots with your name. Comments beside fields go to the author with a send-back.
              </p>
            </div>
            <div className="flex flex-wrap gap-2">
              <Button type="submit" pending={pending === 'sign_off'} pendingLabel="Signing off…" disabled={pending !== null}>
                Sign off version {number}
              </Button>
              <Button variant="secondary" pending={pending === 'send_back'} pendingLabel="Sending back…" disabled={pending !== null} onClick={() => void decide('send_back')}>
                Send back with comments
              </Button>
            </div>
          </form>
        </Card>
      ) : null}
    </>
  );
}
