'use client';

import { useRef } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { FORMULA_CONSTANTS, FORMULA_FUNCTIONS } from '@/lib/core/engine/formula';
import { checkFormula } from '@/lib/core/engine/formula-parse';
import { useEditor, useMessages } from './editor-context';
import { DistributionPicker } from './distribution-picker';
import { CorrelationEditor } from './correlation-editor';
import { GroupMessages, KeyInput, NumberInput, TextAreaInput, TextInput } from './fields';
import { allIds, makeId, removeReferences } from './model-helpers';
import { AddButton, EmptyRows, RowButtons, Section } from './parts';
import type { FormulaDraft } from './form-values';


/** Rows with a key: the names a formula may use. */
const keyed = <R extends { id?: string }>(rows: R[]) => rows.flatMap((r) => (r?.id ? [{ ...r, id: r.id }] : []));

function Inputs() {
  const { control, getValues, setValue } = useFormContext();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'inputs', keyName: '_key' });
  const rows = useWatch<FormulaDraft, 'inputs'>({ name: 'inputs' }) ?? [];
  return (
    <Section id="formula-inputs" title="Inputs" description="Each uncertain quantity, with the name formulas use for it (its key) and its distribution.">
      <GroupMessages path="inputs" className="mb-3" />
      {fields.length === 0 ? (
        <EmptyRows>No inputs yet. Add the first uncertain quantity your formula uses.</EmptyRows>
      ) : (
        <ol className="space-y-3">
          {fields.map((f, i) => {
            const row = rows[i] ?? {};
            const what = row.name?.trim() || `input ${i + 1}`;
            const p = `inputs.${i}`;
            return (
              <li key={f._key} className="rounded-md border border-ink-200 p-3">
                <div className="flex flex-wrap items-start gap-x-3 gap-y-2">
                  <span className="num pt-6 text-xs text-ink-500" aria-hidden="true">
                    {i + 1}
                  </span>
                  <TextInput path={`${p}.name`} label="Name" className="min-w-44 flex-[2]" />
                  <KeyInput path={`${p}.id`} label="Key in formulas" className="min-w-32 flex-1" />
                  <TextInput path={`${p}.unit`} label="Unit" className="w-24" mono maxLength={24} />
                  <div className="ml-auto pt-5">
                    <RowButtons
                      index={i}
                      count={fields.length}
                      what={what}
                      onMove={move}
                      onRemove={() => {
                        // The input leaves the correlation matrix with its row; dials on it stay, flagged.
                        if (row.id) for (const w of removeReferences(getValues(), row.id)) setValue(w.path, w.value, { shouldDirty: true });
                        remove(i);
                      }}
                      minRows={1}
                    />
                  </div>
                </div>
                <div className="mt-2 border-t border-ink-100 pt-2">
                  <DistributionPicker path={`inputs.${i}.distribution`} what={what} unit={row.unit} />
                </div>
              </li>
            );
          })}
        </ol>
      )}
      <div className="mt-3">
        <AddButton
          onClick={() => {
            const n = fields.length + 1;
            append({ id: makeId(`x${n}`, allIds(getValues())), name: `Input ${n}`, unit: '', distribution: { type: 'normal', mean: 0, sd: 1 } });
          }}
        >
          Add input
        </AddButton>
      </div>
    </Section>
  );
}

/** Names and functions available to output `index`, beside its formula; a click inserts at the cursor. */
function NamesPanel({ index, onInsert }: { index: number; onInsert: (text: string) => void }) {
  const { readOnly } = useEditor();
  const inputs = useWatch<FormulaDraft, 'inputs'>({ name: 'inputs' }) ?? [];
  const outputs = useWatch<FormulaDraft, 'outputs'>({ name: 'outputs' }) ?? [];
  const dials = useWatch<FormulaDraft, 'dials'>({ name: 'dials' }) ?? [];
  const groups: { title: string; items: { text: string; insert: string; title?: string }[] }[] = [
    { title: 'Inputs', items: keyed(inputs).map((x) => ({ text: x.id, insert: x.id, title: x.name })) },
    { title: 'Earlier outputs', items: keyed(outputs.slice(0, index)).map((x) => ({ text: x.id, insert: x.id, title: x.name })) },
    { title: 'Dial values', items: keyed(dials.filter((d) => d?.target?.kind === 'variable')).map((d) => ({ text: d.id, insert: d.id, title: d.label })) },
    { title: 'Constants', items: Object.keys(FORMULA_CONSTANTS).map((c) => ({ text: c, insert: c })) },
    {
      title: 'Functions',
      items: Object.entries(FORMULA_FUNCTIONS).map(([fn, [lo, hi]]) => ({
        text: `${fn}()`,
        insert: `${fn}(`,
        title: lo === hi ? `${lo} argument${lo === 1 ? '' : 's'}` : hi === Infinity ? `${lo} or more arguments` : `${lo} to ${hi} arguments`,
      })),
    },
  ];
  return (
    <div className="text-xs">
      <p className="mb-1.5 font-semibold text-ink-700">Names you can use</p>
      {groups.map((g) => {
        if (!g.items.length) return null;
        const list = (
          <ul className="flex flex-wrap gap-1">
            {g.items.map((it) => (
              <li key={it.text}>
                {readOnly ? (
                  <span className="num rounded bg-white px-1.5 py-0.5 text-ink-800 ring-1 ring-ink-200" title={it.title}>
                    {it.text}
                  </span>
                ) : (
                  <button
                    type="button"
                    className="num rounded bg-white px-1.5 py-0.5 text-ink-800 ring-1 ring-ink-200 hover:bg-accent-50 hover:text-accent-900 hover:ring-accent-300"
                    title={it.title ? `${it.title}: insert into the formula` : 'Insert into the formula'}
                    aria-label={`Insert ${it.text}${it.title ? ` (${it.title})` : ''} into the formula of output ${index + 1}`}
                    onClick={() => onInsert(it.insert)}
                  >
                    {it.text}
                  </button>
                )}
              </li>
            ))}
          </ul>
        );
        // The long function list folds away; the model's own names stay in view.
        return g.title === 'Functions' ? (
          <details key={g.title} className="mb-2">
            <summary className="cursor-pointer text-ink-600">Functions ({g.items.length})</summary>
            <div className="mt-1">{list}</div>
          </details>
        ) : (
          <div key={g.title} className="mb-2">
            <p className="mb-0.5 text-ink-600">{g.title}</p>
            {list}
          </div>
        );
      })}
      <p className="text-ink-600">
        Operators: <span className="num">+ − * / ^</span>, comparisons <span className="num">&lt; &lt;= &gt; &gt;= == !=</span>, <span className="num">&amp;&amp; || !</span> and{' '}
        <span className="num">c ? a : b</span>.
      </p>
    </div>
  );
}

function OutputRow({ index, count, onMove, onRemove }: { index: number; count: number; onMove: (a: number, b: number) => void; onRemove: () => void }) {
  const { getValues, setValue } = useFormContext();
  const inputs = useWatch<FormulaDraft, 'inputs'>({ name: 'inputs' }) ?? [];
  const outputs = useWatch<FormulaDraft, 'outputs'>({ name: 'outputs' }) ?? [];
  const dials = useWatch<FormulaDraft, 'dials'>({ name: 'dials' }) ?? [];
  const row = outputs[index] ?? {};
  const what = row.name?.trim() || `output ${index + 1}`;
  const p = `outputs.${index}`;
  const area = useRef<HTMLTextAreaElement | null>(null);
  const schemaMessages = useMessages(`${p}.formula`);

  // Checked live against the current names, so an unknown name shows while typing (the schema checks it too).
  const formula = typeof row.formula === 'string' ? row.formula : '';
  const live =
    formula.trim() === ''
      ? null
      : checkFormula(formula, {
          columns: [...inputs.map((x) => x?.id), ...outputs.slice(0, index).map((x) => x?.id)].filter((x): x is string => typeof x === 'string'),
          scalars: keyed(dials.filter((d) => d?.target?.kind === 'variable')).map((d) => d.id),
        });
  const extra = live && !schemaMessages.some((m) => m.startsWith(live.slice(0, 40))) ? live : null;

  const insert = (text: string) => {
    const el = area.current;
    const current = getValues(`outputs.${index}.formula`) ?? '';
    const start = el?.selectionStart ?? current.length;
    const end = el?.selectionEnd ?? current.length;
    const next = current.slice(0, start) + text + current.slice(end);
    setValue(`${p}.formula`, next, { shouldDirty: true });
    requestAnimationFrame(() => {
      if (!el) return;
      el.focus();
      el.setSelectionRange(start + text.length, start + text.length);
    });
  };

  return (
    <li className="rounded-md border border-ink-200 p-3">
      <div className="flex flex-wrap items-start gap-x-3 gap-y-2">
        <span className="num pt-6 text-xs text-ink-500" aria-hidden="true">
          {index + 1}
        </span>
        <TextInput path={`${p}.name`} label="Name" className="min-w-44 flex-[2]" />
        <KeyInput path={`${p}.id`} label="Key" className="min-w-32 flex-1" />
        <TextInput path={`${p}.unit`} label="Unit" className="w-24" mono maxLength={24} />
        <NumberInput path={`${p}.lower`} label="Lower limit" className="w-28" placeholder="none" unit={row.unit || undefined} />
        <NumberInput path={`${p}.upper`} label="Upper limit" className="w-28" placeholder="none" unit={row.unit || undefined} />
        <div className="ml-auto pt-5">
          <RowButtons index={index} count={count} what={what} onMove={onMove} onRemove={onRemove} minRows={1} />
        </div>
      </div>
      <div className="mt-2 grid gap-3 @3xl:grid-cols-[minmax(0,1fr)_18rem]">
        <TextAreaInput
          path={`${p}.formula`}
          label={`Formula for ${what}`}
          mono
          rows={3}
          placeholder="e.g. density * 9.80665 * flow * head / 1000"
          extra={extra}
          inputRef={(el) => {
            area.current = el;
          }}
        />
        <div className="rounded-md bg-ink-50 p-2.5">
          <NamesPanel index={index} onInsert={insert} />
        </div>
      </div>
    </li>
  );
}

function Outputs() {
  const { control, getValues } = useFormContext();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'outputs', keyName: '_key' });
  return (
    <Section
      id="formula-outputs"
      title="Outputs"
      description="One or more results computed from the inputs in each trial. An output may use the outputs listed before it. Limits are optional and give the chance of falling outside them."
    >
      <GroupMessages path="outputs" className="mb-3" />
      {fields.length === 0 ? (
        <EmptyRows>No outputs yet. Add a formula that combines the inputs into the quantity you report.</EmptyRows>
      ) : (
        <ol className="space-y-3">
          {fields.map((f, i) => (
            <OutputRow key={f._key} index={i} count={fields.length} onMove={move} onRemove={() => remove(i)} />
          ))}
        </ol>
      )}
      <div className="mt-3">
        <AddButton
          onClick={() => {
            const n = fields.length + 1;
            const first = (getValues('inputs') ?? [])[0]?.id ?? '1';
            append({ id: makeId(`y${n}`, allIds(getValues())), name: `Output ${n}`, unit: '', formula: first });
          }}
        >
          Add output
        </AddButton>
      </div>
    </Section>
  );
}

export function FormulaForm() {
  return (
    <>
      <Inputs />
      <CorrelationEditor />
      <Outputs />
    </>
  );
}
