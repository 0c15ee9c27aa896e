'use client';

import { useMemo, useState } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { Button } from '@/components/ui/button';
import { controlClasses } from '@/components/ui/field';
import type { StochosModel } from '@/lib/core/engine/schema';
import { useEditor } from './editor-context';
import { FieldShell, GroupMessages, KeyInput, InlineMessages, NumberInput, RowMessages, TextInput } from './fields';
import { allIds, dialTargetOptions, makeId, suggestDial, targetKey, type DialTargetOption, type WatchedDraft } from './model-helpers';
import { EmptyRows, RowButtons, ScrollTable, Section, Td, Th } from './parts';
import type { ModelDraft } from './form-values';

const DIAL_LABELS: Record<string, string> = { label: 'Label', id: 'Key', target: 'Moves', unit: 'Unit', min: 'Minimum', max: 'Maximum', step: 'Step', default: 'Default' };

function grouped(options: DialTargetOption[]): [string, DialTargetOption[]][] {
  const map = new Map<string, DialTargetOption[]>();
  for (const o of options) map.set(o.group, [...(map.get(o.group) ?? []), o]);
  return [...map.entries()];
}

/** The closed select shows only the option, so it names its subject too ("Spacer sleeve length › nominal"). */
function optionText(o: DialTargetOption): string {
  return o.group === 'Formula' || o.group === 'Correlations' || o.group === 'Correlation groups' || o.group === 'Estimate' ? o.label : `${o.group} › ${o.label}`;
}

function TargetSelect({ index, options, what }: { index: number; options: DialTargetOption[]; what: string }) {
  const { setValue } = useFormContext();
  const { readOnly } = useEditor();
  const path = `dials.${index}.target` as const;
  const target = useWatch<ModelDraft, typeof path>({ name: path });
  const key = targetKey(target);
  const known = options.some((o) => o.key === key);
  return (
    <FieldShell path={path} label={`What ${what} moves`} hideLabel>
      {({ id, invalid, describedBy }) => (
        <select
          id={id}
          value={key}
          disabled={readOnly}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          onChange={(e) => {
            const o = options.find((x) => x.key === e.target.value);
            if (o) setValue(path, o.target, { shouldDirty: true });
          }}
          className={controlClasses(invalid, 'h-8 pr-2 pl-2 text-sm')}
        >
          {!known ? <option value={key}>{key ? `Not available: ${key}` : 'Choose what it moves…'}</option> : null}
          {grouped(options).map(([group, list]) => (
            <optgroup key={group} label={group}>
              {list.map((o) => (
                <option key={o.key} value={o.key}>
                  {optionText(o)}
                </option>
              ))}
            </optgroup>
          ))}
        </select>
      )}
    </FieldShell>
  );
}

/** Which parameters and limits a client viewer may move, each with label, unit, range, step and default. */
export function DialsEditor({ model }: { model: StochosModel | WatchedDraft }) {
  const { control, getValues } = useFormContext();
  const { readOnly, idFor } = useEditor();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'dials', keyName: '_key' });
  const rows = useWatch<ModelDraft, 'dials'>({ name: 'dials' }) ?? [];
  const options = useMemo(() => dialTargetOptions(model), [model]);
  const taken = new Set(rows.map((r) => targetKey(r?.target)));
  const free = options.filter((o) => !taken.has(o.key) || o.target.kind === 'variable');
  const [pick, setPick] = useState('');
  const pickId = `${idFor('dials')}-new`;

  const add = () => {
    const o = options.find((x) => x.key === pick) ?? free[0];
    if (!o) return;
    const s = suggestDial(o);
    const label = o.target.kind === 'variable' ? 'Factor' : `${o.group}: ${o.label}`.replace(/^Estimate: /, '');
    append({
      id: makeId(o.target.kind === 'variable' ? 'factor' : `${o.group}_${o.label}`.slice(0, 30), allIds(getValues()), 'dial'),
      label: label.charAt(0).toUpperCase() + label.slice(1),
      unit: '',
      ...s,
      target: o.target,
    });
    setPick('');
  };

  return (
    <Section
      id="dials"
      title="Dials for client viewers"
      description="Choose what a client may move in the published widget. Everything else stays as you set it. Each dial needs a range that contains its default and a step smaller than the range."
    >
      <GroupMessages path="dials" className="mb-3" />
      {fields.length === 0 ? (
        <EmptyRows>No dials: viewers see the model exactly as set here. Add a dial for each question a client is likely to ask.</EmptyRows>
      ) : (
        <ScrollTable caption="Dials" minWidth={600}>
          <thead>
            <tr>
              <Th className="min-w-48">Label, key and what it moves</Th>
              <Th className="w-14">Unit</Th>
              <Th className="w-22">Minimum</Th>
              <Th className="w-22">Maximum</Th>
              <Th className="w-22">Step</Th>
              <Th className="w-22">Default</Th>
            </tr>
          </thead>
          <tbody>
            {fields.map((f, i) => {
              const what = rows[i]?.label?.trim() || `dial ${i + 1}`;
              const p = `dials.${i}`;
              return [
                <InlineMessages.Provider key={f._key} value={false}>
                <tr>
                  <Td>
                    {/* Label, key and target share one cell so a dial row fits a narrow editor column. */}
                    <div className="flex items-start gap-1">
                      <TextInput path={`${p}.label`} label={`Label of dial ${i + 1}`} hideLabel wrap className="min-w-0 flex-1" />
                      <RowButtons index={i} count={fields.length} what={what} onMove={move} onRemove={() => remove(i)} />
                    </div>
                    <KeyInput path={`${p}.id`} label={`Key of dial ${i + 1}`} hideLabel inputClassName="mt-1 h-6! text-xs! text-ink-600" />
                    <div className="mt-1">
                      <TargetSelect index={i} options={options} what={what} />
                    </div>
                  </Td>
                  <Td>
                    <TextInput path={`${p}.unit`} label={`Unit of ${what}`} hideLabel mono maxLength={24} />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.min`} label={`Minimum of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.max`} label={`Maximum of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.step`} label={`Step of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.default`} label={`Default of ${what}`} hideLabel />
                  </Td>
                </tr>
                </InlineMessages.Provider>,
                <RowMessages key={`${f._key}-msg`} prefix={p} labels={DIAL_LABELS} colSpan={6} />,
              ];
            })}
          </tbody>
        </ScrollTable>
      )}
      {readOnly ? null : (
        <div className="mt-3 flex flex-wrap items-end gap-2">
          <div className="min-w-64">
            <label htmlFor={pickId} className="mb-1 block text-[0.8125rem] font-medium text-ink-800">
              New dial moves
            </label>
            <select id={pickId} value={pick} onChange={(e) => setPick(e.target.value)} className={controlClasses(false, 'h-8 pr-2 pl-2 text-sm')}>
              <option value="">{free.length ? 'Choose…' : 'Nothing left to put on a dial'}</option>
              {grouped(free).map(([group, list]) => (
                <optgroup key={group} label={group}>
                  {list.map((o) => (
                    <option key={o.key} value={o.key}>
                      {o.label}
                    </option>
                  ))}
                </optgroup>
              ))}
            </select>
          </div>
          <Button size="sm" variant="secondary" onClick={add} disabled={!pick}>
            Add dial
          </Button>
        </div>
      )}
    </Section>
  );
}
