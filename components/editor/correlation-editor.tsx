'use client';

import { useMemo, useState } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { cx } from '@/components/ui/cx';
import { FieldError } from '@/components/ui/field';
import { checkCorrelation, nearestCorrelation } from '@/lib/core/engine/linalg';
import { useEditor } from './editor-context';
import { cellKey, correlationColour, diffMatrices, identity, remapMatrix, roundMatrix, setSymmetric, type CellChange, type Matrix } from './correlation-math';
import { parseNumberText, sameNumber, shortNumber } from './numbers';
import { EmptyRows, Section } from './parts';
import type { FormulaDraft, LinearStackDraft } from './form-values';

interface Repair {
  before: Matrix;
  after: Matrix;
  changes: CellChange[];
  smallestBefore: number;
}

/** One editable off-diagonal cell; typing commits to both (i, j) and (j, i). */
function Cell({ i, j, value, label, changed, invalid, describedBy, onCommit, id }: { i: number; j: number; value: number; label: string; changed: boolean; invalid: boolean; describedBy?: string; onCommit: (i: number, j: number, v: number) => void; id: string }) {
  const { readOnly } = useEditor();
  const [text, setText] = useState(() => shortNumber(value));
  const [seen, setSeen] = useState(value);
  const [bad, setBad] = useState(false);
  if (!sameNumber(seen, value)) {
    setSeen(value);
    if (!sameNumber(parseNumberText(text), value)) {
      setText(shortNumber(value));
      setBad(false);
    }
  }
  const colour = correlationColour(Number.isFinite(value) ? value : 0);
  return (
    <input
      id={id}
      type="text"
      inputMode="decimal"
      autoComplete="off"
      spellCheck={false}
      aria-label={label}
      aria-invalid={invalid || bad || undefined}
      aria-describedby={describedBy}
      readOnly={readOnly}
      value={text}
      onChange={(e) => {
        setText(e.target.value);
        const v = parseNumberText(e.target.value);
        const ok = typeof v === 'number' && Number.isFinite(v);
        setBad(!ok);
        if (ok) {
          setSeen(v);
          onCommit(i, j, v);
        }
      }}
      style={{ background: colour.background, color: colour.text }}
      className={cx(
        'num h-9 w-full min-w-16 rounded-sm border px-1.5 text-center text-sm',
        invalid || bad ? 'border-danger-600 ring-2 ring-danger-600' : changed ? 'border-ink-900 ring-2 ring-accent-500' : 'border-transparent',
      )}
    />
  );
}

function Legend() {
  return (
    <div className="flex flex-wrap items-center gap-2 text-xs text-ink-600" aria-hidden="true">
      <span>−1 opposite</span>
      <span className="flex h-3 w-40 overflow-hidden rounded-sm border border-ink-200">
        {Array.from({ length: 21 }, (_, k) => -1 + k * 0.1).map((v) => (
          <span key={v.toFixed(1)} className="h-full flex-1" style={{ background: correlationColour(v).background }} />
        ))}
      </span>
      <span>+1 together</span>
    </div>
  );
}

export interface CorrelationEditorProps {
  /** Where the rows to correlate live: formula inputs or stack contributors. */
  rowsPath?: 'inputs' | 'contributors';
  sectionId?: string;
  title?: string;
  description?: string;
  /** What a row is called in messages ("input", "contributor"). */
  noun?: string;
}

const FORMULA_TEXT =
  'Inputs that move together. Stochos draws them through a Gaussian copula, so any distribution can take part. Editing a cell sets its mirror too; the diagonal is always 1.';

/**
 * The correlation matrix of a formula model's inputs or a stack's contributors: which rows take part, the matrix
 * itself, the PSD check and the nearest-matrix repair.
 */
export function CorrelationEditor({ rowsPath = 'inputs', sectionId = 'formula-correlation', title = 'Correlations between inputs', description = FORMULA_TEXT, noun = 'input' }: CorrelationEditorProps = {}) {
  // A formula model's inputs or a stack's contributors: both carry the correlation the same way.
  const { setValue, getValues } = useFormContext<FormulaDraft | LinearStackDraft>();
  const { readOnly, idFor, messages } = useEditor();
  const inputs = useWatch<FormulaDraft | LinearStackDraft, typeof rowsPath>({ name: rowsPath }) ?? [];
  const corr = useWatch<FormulaDraft | LinearStackDraft, 'correlation'>({ name: 'correlation' });
  const ids = useMemo(() => corr?.inputs ?? [], [corr?.inputs]);
  const matrix = useMemo(() => corr?.matrix ?? [], [corr?.matrix]);
  const [repair, setRepair] = useState<Repair | null>(null);

  const orphans = ids.filter((id) => !inputs.some((x) => x?.id === id));
  const nameOf = (id: string) => inputs.find((x) => x?.id === id)?.name?.trim() || id;
  const square = matrix.length === ids.length && matrix.every((r) => Array.isArray(r) && r.length === ids.length);
  const check = useMemo(() => (square && ids.length >= 2 ? checkCorrelation(matrix) : null), [square, ids.length, matrix]);
  const changed = new Set(repair?.changes.map((c) => cellKey(c.i, c.j)));

  const setMembers = (next: string[]) => {
    setRepair(null);
    if (next.length === 0) {
      setValue('correlation', undefined, { shouldDirty: true });
      return;
    }
    setValue('correlation', { inputs: next, matrix: remapMatrix(matrix.length === ids.length ? matrix : identity(ids.length), ids, next) }, { shouldDirty: true });
  };
  const toggle = (id: string, on: boolean) => {
    const order = new Map(inputs.map((x, k) => [x?.id, k]));
    const next = on ? [...ids.filter((x) => x !== id), id] : ids.filter((x) => x !== id);
    next.sort((a, b) => (order.get(a) ?? 1e9) - (order.get(b) ?? 1e9));
    setMembers(next);
  };
  const commit = (i: number, j: number, v: number) => {
    const current = getValues('correlation.matrix') ?? [];
    setValue('correlation.matrix', setSymmetric(current, i, j, v, false), { shouldDirty: true });
  };
  const doRepair = () => {
    const before = matrix.map((r) => r.slice());
    const near = nearestCorrelation(before).matrix;
    // Four decimals read well; keep more only if rounding would undo the repair.
    let after = roundMatrix(near, 4);
    if (!checkCorrelation(after).positiveSemiDefinite) after = roundMatrix(near, 8);
    if (!checkCorrelation(after).positiveSemiDefinite) after = near;
    setRepair({ before, after, changes: diffMatrices(before, after), smallestBefore: check?.smallestEigenvalue ?? Number.NaN });
    setValue('correlation.matrix', after, { shouldDirty: true });
  };
  const undoRepair = () => {
    if (!repair) return;
    setValue('correlation.matrix', repair.before, { shouldDirty: true });
    setRepair(null);
  };

  // Per-cell problems, listed under the table and tied to their cells.
  const cellProblems: { i: number; j: number; message: string }[] = [];
  for (const [k, list] of Object.entries(messages)) {
    const m = /^correlation\.matrix\.(\d+)\.(\d+)$/.exec(k);
    if (m) for (const message of list) cellProblems.push({ i: Number(m[1]), j: Number(m[2]), message });
  }
  const listId = `${idFor('correlation.matrix')}-cells`;
  const statusId = `${idFor('correlation.matrix')}-status`;
  const matrixMessages = [...(messages['correlation.matrix'] ?? []), ...(messages['correlation'] ?? []), ...(messages['correlation.inputs'] ?? [])];
  const memberMessages = Object.entries(messages).filter(([k]) => /^correlation\.inputs\.\d+$/.test(k));

  return (
    <Section id={sectionId} title={title} description={description}>
      <fieldset>
        <legend className="mb-1 text-[0.8125rem] font-medium text-ink-800">{noun === 'input' ? 'Inputs' : 'Contributors'} in the matrix</legend>
        {inputs.length < 2 ? (
          <p className="text-sm text-ink-600">Add at least two {noun}s to correlate them.</p>
        ) : (
          <div id={idFor('correlation.inputs')} tabIndex={-1} className="flex flex-wrap gap-x-4 gap-y-1.5">
            {inputs.map((inp, k) => {
              if (!inp?.id) return null;
              const boxId = `${idFor('correlation.inputs')}-${k}`;
              return (
                <label key={`${inp.id}-${k}`} htmlFor={boxId} className="inline-flex items-center gap-1.5 text-sm text-ink-800">
                  <input id={boxId} type="checkbox" className="h-4 w-4 accent-accent-700" checked={ids.includes(inp.id)} disabled={readOnly} onChange={(e) => toggle(inp.id as string, e.target.checked)} />
                  {inp.name?.trim() || inp.id} <span className="num text-xs text-ink-500">{inp.id}</span>
                </label>
              );
            })}
          </div>
        )}
        {orphans.length ? (
          <p className="mt-1.5 flex flex-wrap items-center gap-1.5 text-sm text-ink-700">
            In the matrix but not {noun === 'input' ? 'an input' : `a ${noun}`}:
            {orphans.map((id) => (
              <button
                key={id}
                type="button"
                disabled={readOnly}
                onClick={() => setMembers(ids.filter((x) => x !== id))}
                className="num rounded bg-danger-50 px-1.5 py-0.5 text-danger-700 ring-1 ring-danger-600/30 hover:bg-white"
                aria-label={`Remove ${id} from the matrix`}
              >
                {id} ×
              </button>
            ))}
          </p>
        ) : null}
        {memberMessages.map(([k, list]) => list.map((m) => <FieldError key={k + m}>{m}</FieldError>))}
      </fieldset>

      {ids.length === 0 ? (
        <div className="mt-3">
          <EmptyRows>
            No correlations: every {noun} varies independently. Tick two or more {noun}s above to correlate them.
          </EmptyRows>
        </div>
      ) : ids.length === 1 ? (
        <p className="mt-3 text-sm text-ink-700">Tick at least one more {noun}: a correlation needs two.</p>
      ) : square ? (
        <div className="mt-4">
          <div className="relative -mx-4 overflow-x-auto px-4 sm:-mx-5 sm:px-5" role="region" aria-label="Correlation matrix" tabIndex={0}>
            <table className="border-separate border-spacing-0.5 text-sm" aria-describedby={statusId}>
              <caption className="sr-only">Correlation matrix; rows and columns are the {noun}s in the same order</caption>
              <thead>
                <tr>
                  <td />
                  {ids.map((id) => (
                    <th key={id} scope="col" className="num max-w-24 truncate px-1 pb-1 text-center text-xs font-semibold text-ink-700" title={nameOf(id)}>
                      {id}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody>
                {ids.map((rowId, i) => (
                  <tr key={rowId}>
                    <th scope="row" className="num max-w-32 truncate pr-2 text-right text-xs font-semibold text-ink-700" title={nameOf(rowId)}>
                      {rowId}
                    </th>
                    {ids.map((colId, j) => {
                      if (i === j) {
                        return (
                          <td key={colId}>
                            <span className="num flex h-9 min-w-16 items-center justify-center rounded-sm bg-ink-100 text-sm text-ink-600" aria-label={`${rowId} with itself: 1, fixed`}>
                              1
                            </span>
                          </td>
                        );
                      }
                      const cellMsgs = cellProblems.filter((p) => (p.i === i && p.j === j) || (p.i === j && p.j === i));
                      return (
                        <td key={colId}>
                          <Cell
                            id={idFor(`correlation.matrix.${i}.${j}`)}
                            i={i}
                            j={j}
                            value={matrix[i][j]}
                            label={`Correlation of ${nameOf(rowId)} with ${nameOf(colId)}`}
                            changed={changed.has(cellKey(i, j))}
                            invalid={cellMsgs.length > 0}
                            describedBy={cellMsgs.length ? listId : undefined}
                            onCommit={commit}
                          />
                        </td>
                      );
                    })}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="mt-2">
            <Legend />
          </div>
          {cellProblems.length ? (
            <ul id={listId} className="mt-2">
              {cellProblems.map((p) => (
                <li key={`${p.i}-${p.j}-${p.message}`}>
                  <FieldError>
                    {ids[p.i]} with {ids[p.j]}: {p.message}
                  </FieldError>
                </li>
              ))}
            </ul>
          ) : null}

          <div id={statusId} role="status" className="mt-3">
            {check && check.smallestEigenvalue !== null ? (
              check.positiveSemiDefinite ? (
                <p className="text-sm text-ink-700">
                  Valid correlation matrix: positive semi-definite, smallest eigenvalue <span className="num">{+check.smallestEigenvalue.toPrecision(3)}</span>.
                </p>
              ) : (
                <div className="rounded-md border border-danger-600/30 border-l-4 border-l-danger-700 bg-danger-50 px-3 py-2.5">
                  <p className="text-sm font-medium text-ink-900">
                    These correlations cannot all hold at once: the matrix is not positive semi-definite (smallest eigenvalue{' '}
                    <span className="num">{check.smallestEigenvalue.toPrecision(4)}</span>).
                  </p>
                  <p className="mt-1 text-sm text-ink-700">Revise the entries, or let Stochos find the nearest valid matrix (Higham 2002) and show you what it changed.</p>
                  {readOnly ? null : (
                    <Button size="sm" className="mt-2" onClick={doRepair}>
                      Repair to nearest valid matrix
                    </Button>
                  )}
                </div>
              )
            ) : null}
          </div>
          {matrixMessages.filter((m) => !m.includes('positive semi-definite')).map((m) => (
            <FieldError key={m}>{m}</FieldError>
          ))}

          {repair ? (
            <div className="mt-3 rounded-md border border-accent-200 border-l-4 border-l-accent-700 bg-accent-50 px-3 py-2.5" aria-live="polite">
              <p className="text-sm font-medium text-ink-900">
                Repaired: the smallest eigenvalue went from <span className="num">{repair.smallestBefore.toPrecision(4)}</span> to{' '}
                <span className="num">{+(checkCorrelation(repair.after).smallestEigenvalue ?? 0).toPrecision(3)}</span>. {repair.changes.length} pair{repair.changes.length === 1 ? '' : 's'} changed
                (outlined in the matrix):
              </p>
              <table className="mt-2 text-sm">
                <caption className="sr-only">Cells changed by the repair</caption>
                <thead>
                  <tr>
                    <th scope="col" className="pr-4 text-left text-xs font-semibold text-ink-600">
                      Pair
                    </th>
                    <th scope="col" className="pr-4 text-right text-xs font-semibold text-ink-600">
                      Before
                    </th>
                    <th scope="col" className="pr-4 text-right text-xs font-semibold text-ink-600">
                      After
                    </th>
                    <th scope="col" className="text-right text-xs font-semibold text-ink-600">
                      Change
                    </th>
                  </tr>
                </thead>
                <tbody>
                  {repair.changes.map((c) => (
                    <tr key={cellKey(c.i, c.j)}>
                      <td className="num pr-4 text-ink-800">
                        {ids[c.i]} · {ids[c.j]}
                      </td>
                      <td className="num pr-4 text-right text-ink-700">{shortNumber(c.before)}</td>
                      <td className="num pr-4 text-right font-semibold text-ink-900">→ {shortNumber(c.after)}</td>
                      <td className="num text-right text-ink-700">
                        {c.after - c.before >= 0 ? '+' : '−'}
                        {shortNumber(Math.abs(c.after - c.before))}
                      </td>
                    </tr>
                  ))}
                </tbody>
              </table>
              <div className="mt-2 flex flex-wrap gap-2">
                <Button size="sm" onClick={() => setRepair(null)}>
                  Accept repaired matrix
                </Button>
                <Button size="sm" variant="secondary" onClick={undoRepair}>
                  Undo repair
                </Button>
              </div>
            </div>
          ) : null}
        </div>
      ) : (
        <div className="mt-3">
          <FieldError>
            The matrix does not match the {ids.length} {noun}s listed.{' '}
            {readOnly ? null : (
              <button type="button" className="underline" onClick={() => setMembers(ids)}>
                Reset it to no correlation
              </button>
            )}
          </FieldError>
        </div>
      )}
    </Section>
  );
}
