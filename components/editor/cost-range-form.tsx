'use client';

import { useMemo, useState } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { Term } from '@/components/ui/term';
import { checkCorrelation } from '@/lib/core/engine/linalg';
import { AddButton, EmptyRows, RowButtons, ScrollTable, Section, Td, Th } from './parts';
import { GroupMessages, KeyInput, InlineMessages, NumberInput, RowMessages, SelectInput, TextInput, type Choice } from './fields';
import { useEditor } from './editor-context';
import { allIds, makeId, removeReferences } from './model-helpers';
import { shortNumber } from './numbers';
import type { CostRangeDraft, LineItemDraft } from './form-values';

const THREE_POINT: Choice<'pert' | 'triangular' | 'uniform'>[] = [
  { value: 'pert', label: 'Beta-PERT' },
  { value: 'triangular', label: 'Triangular' },
  { value: 'uniform', label: 'Uniform (low to high)' },
];

const ITEM_LABELS: Record<string, string> = { name: 'Name', id: 'Key', low: 'Low', mostLikely: 'Most likely', high: 'High', distribution: 'Distribution' };
const RISK_LABELS: Record<string, string> = {
  name: 'Name',
  id: 'Key',
  probability: 'Probability',
  impact: 'Impact',
  'impact.low': 'Impact low',
  'impact.mostLikely': 'Impact most likely',
  'impact.high': 'Impact high',
  'impact.distribution': 'Impact distribution',
};



function LineItems({ currency }: { currency: string }) {
  const { control, getValues, setValue } = useFormContext();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'items', keyName: '_key' });
  const rows = useWatch<CostRangeDraft, 'items'>({ name: 'items' }) ?? [];
  const sumMostLikely = rows.reduce((s, r) => s + (typeof r?.mostLikely === 'number' && Number.isFinite(r.mostLikely) ? r.mostLikely : 0), 0);

  return (
    <Section
      id="cost-items"
      title="Line items"
      description={
        <>
          Each cost as a <Term term="three-point estimate">three-point estimate</Term>: low, most likely and high. Beta-PERT suits most items; triangular gives more weight to the
          tails.
        </>
      }
      actions={<TextInput path="currency" label="Currency or unit" className="w-32" mono maxLength={8} />}
    >
      <GroupMessages path="items" className="mb-3" />
      {fields.length === 0 ? (
        <EmptyRows>No line items yet. Add the first cost item of the estimate.</EmptyRows>
      ) : (
        <ScrollTable caption="Line items" minWidth={820}>
          <thead>
            <tr>
              <Th className="w-8">#</Th>
              <Th className="min-w-52">Name and key</Th>
              <Th className="w-28">Low</Th>
              <Th className="w-28">Most likely</Th>
              <Th className="w-28">High</Th>
              <Th className="w-40">Distribution</Th>
              <Th className="w-24">
                <span className="sr-only">Row actions</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {fields.map((f, i) => {
              const row = rows[i] ?? {};
              const what = row.name?.trim() || `item ${i + 1}`;
              const p = `items.${i}`;
              return [
                <InlineMessages.Provider key={f._key} value={false}>
                <tr>
                  <Td className="num pt-3 text-xs text-ink-500">{i + 1}</Td>
                  <Td>
                    <TextInput path={`${p}.name`} label={`Name of line item ${i + 1}`} hideLabel wrap />
                    <KeyInput path={`${p}.id`} label={`Key of line item ${i + 1}`} hideLabel inputClassName="mt-1 h-6! text-xs! text-ink-600" />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.low`} label={`Low estimate of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.mostLikely`} label={`Most likely estimate of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.high`} label={`High estimate of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <SelectInput path={`${p}.distribution`} label={`Distribution of ${what}`} hideLabel choices={THREE_POINT} />
                  </Td>
                  <Td>
                    <RowButtons
                      index={i}
                      count={fields.length}
                      what={what}
                      onMove={move}
                      onRemove={() => {
                        // The item leaves its correlation groups too.
                        if (row.id) for (const w of removeReferences(getValues(), row.id)) setValue(w.path, w.value, { shouldDirty: true });
                        remove(i);
                      }}
                      minRows={1}
                    />
                  </Td>
                </tr>
                </InlineMessages.Provider>,
                <RowMessages key={`${f._key}-msg`} prefix={p} labels={ITEM_LABELS} colSpan={7} />,
              ];
            })}
          </tbody>
          <tfoot>
            <tr>
              <Td />
              <Td className="pt-2 text-right text-xs font-medium text-ink-600">Sum of most likely values</Td>
              <Td />
              <Td className="num pt-2 pr-3 text-right text-sm text-ink-900">
                {shortNumber(sumMostLikely, 2)} <span className="text-xs text-ink-600">{currency}</span>
              </Td>
              <Td colSpan={3} />
            </tr>
          </tfoot>
        </ScrollTable>
      )}
      <div className="mt-3">
        <AddButton
          onClick={() => {
            const n = fields.length + 1;
            append({ id: makeId(`item_${n}`, allIds(getValues())), name: `Item ${n}`, low: 90, mostLikely: 100, high: 130, distribution: 'pert' });
          }}
        >
          Add line item
        </AddButton>
      </div>
    </Section>
  );
}

function GroupItemsPicker({ index, items }: { index: number; items: LineItemDraft[] }) {
  const { setValue } = useFormContext();
  const { readOnly, idFor } = useEditor();
  const path = `correlationGroups.${index}.items` as const;
  const chosen = useWatch<CostRangeDraft, typeof path>({ name: path }) ?? [];
  const legendId = `${idFor(path)}-legend`;
  const orphans = chosen.filter((id) => !items.some((it) => it?.id === id));
  const toggle = (id: string, on: boolean) => {
    const next = on ? [...chosen.filter((x) => x !== id), id] : chosen.filter((x) => x !== id);
    // Keep the line items' order so the list reads like the table.
    const order = new Map(items.map((it, k) => [it.id, k]));
    next.sort((a, b) => (order.get(a) ?? 1e9) - (order.get(b) ?? 1e9));
    setValue(path, next, { shouldDirty: true });
  };
  return (
    <fieldset aria-describedby={`${idFor(path)}-error`}>
      <legend id={legendId} className="mb-1 text-[0.8125rem] font-medium text-ink-800">
        Items in this group
      </legend>
      <div id={idFor(path)} tabIndex={-1} className="flex flex-wrap gap-x-4 gap-y-1.5">
        {items.map((it, k) => {
          if (!it?.id) return null;
          const boxId = `${idFor(path)}-${k}`;
          return (
            <label key={`${it.id}-${k}`} htmlFor={boxId} className="inline-flex items-center gap-1.5 text-sm text-ink-800">
              <input id={boxId} type="checkbox" className="h-4 w-4 accent-accent-700" checked={chosen.includes(it.id)} disabled={readOnly} onChange={(e) => toggle(it.id as string, e.target.checked)} />
              {it.name?.trim() || it.id}
            </label>
          );
        })}
      </div>
      {orphans.length ? (
        <p className="mt-1.5 flex flex-wrap items-center gap-1.5 text-sm text-ink-700">
          Listed but not a line item:
          {orphans.map((id) => (
            <button
              key={id}
              type="button"
              disabled={readOnly}
              onClick={() => setValue(path, chosen.filter((x) => x !== id), { shouldDirty: true })}
              className="num rounded bg-danger-50 px-1.5 py-0.5 text-danger-700 ring-1 ring-danger-600/30 hover:bg-white"
              aria-label={`Remove ${id} from this group`}
            >
              {id} ×
            </button>
          ))}
        </p>
      ) : null}
      <GroupMessages path={path} />
      {chosen.map((_, j) => (
        <GroupMessages key={j} path={`${path}.${j}`} />
      ))}
    </fieldset>
  );
}

function CorrelationGroups() {
  const { control, getValues } = useFormContext();
  const { fields, append, remove } = useFieldArray({ control, name: 'correlationGroups', keyName: '_key' });
  const groupsRaw = useWatch<CostRangeDraft, 'correlationGroups'>({ name: 'correlationGroups' });
  const itemsRaw = useWatch<CostRangeDraft, 'items'>({ name: 'items' });
  const groups = useMemo(() => groupsRaw ?? [], [groupsRaw]);
  const items = useMemo(() => itemsRaw ?? [], [itemsRaw]);

  // The groups together must form a valid correlation matrix; checked live so the author sees it while editing.
  const combined = useMemo(() => {
    const ids = items.map((it) => it?.id).filter((id): id is string => typeof id === 'string' && groups.some((g) => g?.items?.includes(id)));
    if (ids.length < 2) return null;
    const index = new Map(ids.map((id, k) => [id, k]));
    const m: number[][] = ids.map((_, a) => ids.map((__, b) => (a === b ? 1 : 0)));
    for (const g of groups) {
      if (!g?.items || typeof g.rho !== 'number' || !Number.isFinite(g.rho)) return null;
      for (const a of g.items)
        for (const b of g.items) {
          const ia = index.get(a);
          const ib = index.get(b);
          if (ia !== undefined && ib !== undefined && ia !== ib) m[ia][ib] = g.rho;
        }
    }
    return { n: ids.length, check: checkCorrelation(m) };
  }, [groups, items]);

  return (
    <Section
      id="cost-groups"
      title="Correlation groups"
      description="Items that tend to overrun together, such as work sharing crews or access, with the correlation (ρ, from −1 to 1) between every pair in the group."
    >
      <GroupMessages path="correlationGroups" className="mb-3" />
      {combined && combined.check.smallestEigenvalue !== null ? (
        <p className={combined.check.positiveSemiDefinite ? 'mb-3 text-sm text-ink-700' : 'mb-3 text-sm font-medium text-danger-700'} role="status">
          {combined.check.positiveSemiDefinite ? (
            <>
              Together the groups form a valid correlation matrix over {combined.n} items (smallest eigenvalue <span className="num">{shortNumber(combined.check.smallestEigenvalue)}</span>).
            </>
          ) : (
            <>
              Together the groups are not a valid correlation matrix over {combined.n} items: its smallest eigenvalue is{' '}
              <span className="num">{combined.check.smallestEigenvalue.toPrecision(4)}</span>. Lower the correlations or split overlapping groups.
            </>
          )}
        </p>
      ) : null}
      {fields.length === 0 ? (
        <EmptyRows>No correlation groups: every item varies independently. Add a group for items that tend to overrun together.</EmptyRows>
      ) : (
        <ul className="space-y-3">
          {fields.map((f, i) => {
            const g = groups[i] ?? {};
            const what = g.name?.trim() || `group ${i + 1}`;
            const p = `correlationGroups.${i}`;
            return (
              <li key={f._key} className="rounded-md border border-ink-200 bg-ink-50/60 p-3">
                <div className="flex flex-wrap items-start gap-3">
                  <TextInput path={`${p}.name`} label="Group name" className="min-w-48 flex-1" />
                  <KeyInput path={`${p}.id`} label="Key" className="w-40" />
                  <NumberInput path={`${p}.rho`} label="Correlation ρ" className="w-28" />
                  <div className="ml-auto pt-5">
                    <RowButtons index={i} count={fields.length} what={what} onRemove={() => remove(i)} />
                  </div>
                </div>
                <div className="mt-2">
                  <GroupItemsPicker index={i} items={items} />
                </div>
              </li>
            );
          })}
        </ul>
      )}
      <div className="mt-3">
        <AddButton onClick={() => append({ id: makeId(`group_${fields.length + 1}`, allIds(getValues())), name: `Group ${fields.length + 1}`, items: [], rho: 0.3 })}>Add correlation group</AddButton>
      </div>
    </Section>
  );
}

function RiskRegister({ currency }: { currency: string }) {
  const { control, getValues } = useFormContext();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'riskEvents', keyName: '_key' });
  const rows = useWatch<CostRangeDraft, 'riskEvents'>({ name: 'riskEvents' }) ?? [];
  const [percent, setPercent] = useState(false);

  return (
    <Section
      id="cost-risks"
      title="Risk register"
      description={`Events that may or may not happen. In each trial an event occurs with its probability and then adds an impact drawn from its range (${currency || 'currency'}).`}
      actions={
        <div role="group" aria-label="Enter probabilities as" className="inline-flex rounded-md border border-ink-300 bg-white p-0.5 text-sm">
          {[
            { on: false, label: '0 – 1' },
            { on: true, label: '%' },
          ].map((o) => (
            <button
              key={o.label}
              type="button"
              aria-pressed={percent === o.on}
              onClick={() => setPercent(o.on)}
              className={percent === o.on ? 'rounded bg-accent-700 px-2.5 py-1 font-medium text-white' : 'rounded px-2.5 py-1 text-ink-700 hover:bg-ink-100'}
            >
              <span className="sr-only">Probabilities as </span>
              {o.label}
            </button>
          ))}
        </div>
      }
    >
      <GroupMessages path="riskEvents" className="mb-3" />
      {fields.length === 0 ? (
        <EmptyRows>The risk register is empty. Add an event that may happen, with its probability and the range of its cost if it does.</EmptyRows>
      ) : (
        <ScrollTable caption="Risk register" minWidth={900}>
          <thead>
            <tr>
              <Th className="w-8">#</Th>
              <Th className="min-w-52">Risk and key</Th>
              <Th className="w-28">Probability{percent ? ' (%)' : ' (0–1)'}</Th>
              <Th className="w-28">Impact low</Th>
              <Th className="w-28">Most likely</Th>
              <Th className="w-28">High</Th>
              <Th className="w-40">Impact distribution</Th>
              <Th className="w-24">
                <span className="sr-only">Row actions</span>
              </Th>
            </tr>
          </thead>
          <tbody>
            {fields.map((f, i) => {
              const what = rows[i]?.name?.trim() || `risk ${i + 1}`;
              const p = `riskEvents.${i}`;
              return [
                <InlineMessages.Provider key={f._key} value={false}>
                <tr>
                  <Td className="num pt-3 text-xs text-ink-500">{i + 1}</Td>
                  <Td>
                    <TextInput path={`${p}.name`} label={`Name of risk ${i + 1}`} hideLabel wrap />
                    <KeyInput path={`${p}.id`} label={`Key of risk ${i + 1}`} hideLabel inputClassName="mt-1 h-6! text-xs! text-ink-600" />
                  </Td>
                  <Td>
                    <NumberInput
                      key={percent ? 'pct' : 'unit'}
                      path={`${p}.probability`}
                      label={`Probability of ${what}${percent ? ', in per cent' : ', from 0 to 1'}`}
                      hideLabel
                      scale={percent ? 100 : 1}
                      unit={percent ? '%' : undefined}
                    />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.impact.low`} label={`Low impact of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.impact.mostLikely`} label={`Most likely impact of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <NumberInput path={`${p}.impact.high`} label={`High impact of ${what}`} hideLabel />
                  </Td>
                  <Td>
                    <SelectInput path={`${p}.impact.distribution`} label={`Impact distribution of ${what}`} hideLabel choices={THREE_POINT} />
                  </Td>
                  <Td>
                    <RowButtons index={i} count={fields.length} what={what} onMove={move} onRemove={() => remove(i)} />
                  </Td>
                </tr>
                </InlineMessages.Provider>,
                <RowMessages key={`${f._key}-msg`} prefix={p} labels={RISK_LABELS} colSpan={8} />,
              ];
            })}
          </tbody>
        </ScrollTable>
      )}
      <div className="mt-3">
        <AddButton
          onClick={() => {
            const n = fields.length + 1;
            append({ id: makeId(`risk_${n}`, allIds(getValues())), name: `Risk ${n}`, probability: 0.2, impact: { low: 10, mostLikely: 20, high: 40, distribution: 'pert' } });
          }}
        >
          Add risk
        </AddButton>
      </div>
    </Section>
  );
}

function EstimateAndBudget({ currency }: { currency: string }) {
  const confidence = useWatch<CostRangeDraft, 'confidence'>({ name: 'confidence' });
  const pLabel = typeof confidence === 'number' && confidence > 0 && confidence < 1 ? `P${shortNumber(confidence * 100, 1)}` : null;
  return (
    <Section
      id="cost-budget"
      title="Base estimate, budget and confidence"
      description={
        <>
          The <Term term="contingency">contingency</Term> is read off the <Term term="S-curve">S-curve</Term> at the chosen confidence, over the base estimate.
        </>
      }
    >
      <div className="grid max-w-2xl gap-4 @xl:grid-cols-3">
        <NumberInput path="baseEstimate" label="Base estimate" unit={currency || undefined} dense={false} placeholder="optional" />
        <NumberInput path="budget" label="Budget" unit={currency || undefined} dense={false} placeholder="optional" />
        <NumberInput
          path="confidence"
          label="Chosen confidence (P-level)"
          scale={100}
          unit="%"
          dense={false}
          hint={
            <>
              {pLabel ? `Contingency is reported at ${pLabel}. ` : null}For example 80 for <Term term="P80">P80</Term>.
            </>
          }
        />
      </div>
    </Section>
  );
}

export function CostRangeForm() {
  const currency = useWatch<CostRangeDraft, 'currency'>({ name: 'currency' }) ?? '';
  return (
    <>
      <LineItems currency={currency} />
      <CorrelationGroups />
      <RiskRegister currency={currency} />
      <EstimateAndBudget currency={currency} />
    </>
  );
}
