'use client';

import { memo } from 'react';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { Term } from '@/components/ui/term';
import { AddButton, EmptyRows, RowButtons, ScrollTable, Section, Td, Th } from './parts';
import { GroupMessages, KeyInput, InlineMessages, NumberInput, NumberListInput, RowMessages, SelectInput, TextInput, type Choice } from './fields';
import { allIds, makeId, removeReferences } from './model-helpers';
import { CorrelationEditor } from './correlation-editor';
import { AllocationPanel } from './allocation-panel';
import { MeasuredDataButton } from './measured-data';
import type { LinearStackDraft, StackDistributionDraft } from './form-values';

type StackKind = 'normal' | 'uniform' | 'triangular' | 'normal-fit' | 'empirical';

const ASSUMPTIONS: Choice<StackKind>[] = [
  { value: 'normal', label: 'Normal, tolerance at ±kσ' },
  { value: 'uniform', label: 'Uniform over the band' },
  { value: 'triangular', label: 'Triangular over the band' },
  { value: 'normal-fit', label: 'Normal fitted to measured data' },
  { value: 'empirical', label: 'Measured data as sampled' },
];

const DIRECTIONS: Choice<1 | -1>[] = [
  { value: 1, label: '+ adds' },
  { value: -1, label: '− subtracts' },
];

const K_SIGMA =
  'Normal with the tolerance at ±kσ: the tolerance band spans k standard deviations either side of the mean. k = 3 is the usual assumption (99.73 % of parts inside the band); a process with proven capability may justify 4 or more.';

const STACK_LABELS: Record<string, string> = {
  name: 'Name',
  id: 'Key',
  nominal: 'Nominal',
  plusTol: 'Plus tolerance',
  minusTol: 'Minus tolerance',
  direction: 'Direction',
  distribution: 'Distribution',
  'distribution.type': 'Distribution',
  'distribution.k': 'k',
  meanShift: 'Mean shift',
};

export function LinearStackForm() {
  const { control, getValues } = useFormContext();
  const { fields, append, remove, move } = useFieldArray({ control, name: 'contributors', keyName: '_key' });
  const unit = useWatch<LinearStackDraft, 'unit'>({ name: 'unit' }) || '';

  const addRow = () => {
    const n = fields.length + 1;
    append({
      id: makeId(`dim_${n}`, allIds(getValues())),
      name: `Dimension ${n}`,
      nominal: 0,
      plusTol: 0.1,
      minusTol: 0.1,
      direction: 1,
      distribution: { type: 'normal', k: 3 },
      meanShift: 0,
    });
  };

  return (
    <>
      <Section
        id="stack-contributors"
        title="Contributors"
        description={
          <>
            Each dimension around the loop, with its tolerance band and the direction it moves the gap. Stochos reports{' '}
            <Term term="worst case">worst case</Term>, <Term term="RSS">RSS</Term> and <Term term="Monte Carlo">Monte Carlo</Term> side by side from these rows.
          </>
        }
        actions={<TextInput path="unit" label="Unit" className="w-28" mono maxLength={24} />}
      >
        <GroupMessages path="contributors" className="mb-3" />
        {fields.length === 0 ? (
          <EmptyRows>No contributors yet. Add the first dimension of the loop, starting from one side of the gap.</EmptyRows>
        ) : (
          <ScrollTable caption="Contributors to the gap" minWidth={1080}>
            <thead>
              <tr>
                <Th className="w-8">#</Th>
                <Th className="min-w-60">Name and key</Th>
                <Th className="w-28">Nominal</Th>
                <Th className="w-24">Plus tol.</Th>
                <Th className="w-24">Minus tol.</Th>
                <Th className="w-32">Direction</Th>
                <Th className="min-w-52">Distribution assumption</Th>
                <Th className="w-20">
                  <Term explain={K_SIGMA}>k (±kσ)</Term>
                </Th>
                <Th className="w-24">
                  <Term explain="How far the process mean sits from the nominal (positive = larger). Leave 0 for a centred process.">Mean shift</Term>
                </Th>
                <Th className="w-24">
                  <span className="sr-only">Row actions</span>
                </Th>
              </tr>
            </thead>
            <tbody>
              {fields.map((f, i) => (
                <ContributorRow key={f._key} index={i} count={fields.length} unit={unit} onMove={move} onRemove={remove} />
              ))}
            </tbody>
          </ScrollTable>
        )}
        <div className="mt-3">
          <AddButton onClick={addRow}>Add contributor</AddButton>
        </div>
      </Section>

      <CorrelationEditor
        rowsPath="contributors"
        sectionId="stack-correlation"
        title="Correlated contributors"
        noun="contributor"
        description="Dimensions made on one machine, in one setup or from one batch of material can move together. Tick them and enter their correlations: Stochos draws them through a Gaussian copula and reports the RSS with and without the correlation terms. Editing a cell sets its mirror too; the diagonal is always 1."
      />

      <Section id="stack-limits" title="Gap requirement" description="The assembly passes when the gap lies within these limits. Give a lower limit, an upper limit, or both.">
        <GroupMessages path="limits" className="mb-3" />
        <div className="grid max-w-md grid-cols-2 gap-4">
          <NumberInput path="limits.lower" label="Lower limit" unit={unit || undefined} dense={false} placeholder="none" />
          <NumberInput path="limits.upper" label="Upper limit" unit={unit || undefined} dense={false} placeholder="none" />
        </div>
      </Section>

      <AllocationPanel />
    </>
  );
}

/**
 * One contributor's rows. Memoised, and watching its own fields only: a keystroke renders the row it is in, not the
 * whole table.
 */
const ContributorRow = memo(function ContributorRow({ index: i, count, unit, onMove, onRemove }: { index: number; count: number; unit: string; onMove: (from: number, to: number) => void; onRemove: (index: number) => void }) {
  const { getValues, setValue } = useFormContext();
  const p = `contributors.${i}` as const;
  // Only what the row shows from its values: a keystroke in a number field does not render the row again.
  const row = useWatch({ name: p, compute: (r: NonNullable<LinearStackDraft['contributors']>[number] | undefined) => ({ name: r?.name, type: r?.distribution?.type }) });
  const what = row.name?.trim() || `contributor ${i + 1}`;
  const type = row.type;
  const usesData = type === 'empirical' || type === 'normal-fit';

  const pickAssumption = (kind: StackKind) => {
    const prev = getValues(`${p}.distribution`) as StackDistributionDraft | undefined;
    const data = prev && 'data' in prev && Array.isArray(prev.data) ? prev.data : [];
    const next: StackDistributionDraft = kind === 'normal' ? { type: 'normal', k: 3 } : kind === 'uniform' || kind === 'triangular' ? { type: kind } : { type: kind, data };
    setValue(`${p}.distribution`, next, { shouldDirty: true });
  };
  const removeRow = () => {
    const id = getValues(`${p}.id`) as string | undefined;
    if (id) for (const w of removeReferences(getValues(), id)) setValue(w.path, w.value, { shouldDirty: true });
    onRemove(i);
  };

  return (
    <>
      <InlineMessages.Provider value={false}>
        <tr className="group">
        <Td className="num pt-3 text-xs text-ink-500">{i + 1}</Td>
        <Td>
          <TextInput path={`${p}.name`} label={`Name of contributor ${i + 1}`} hideLabel wrap />
          <KeyInput path={`${p}.id`} label={`Key of contributor ${i + 1}`} hideLabel inputClassName="mt-1 h-6! text-xs! text-ink-600" />
        </Td>
        <Td>
          <NumberInput path={`${p}.nominal`} label={`Nominal of ${what}`} hideLabel unit={unit || undefined} />
        </Td>
        <Td>
          <NumberInput path={`${p}.plusTol`} label={`Plus tolerance of ${what}`} hideLabel />
        </Td>
        <Td>
          <NumberInput path={`${p}.minusTol`} label={`Minus tolerance of ${what} (a magnitude)`} hideLabel />
        </Td>
        <Td>
          <SelectInput path={`${p}.direction`} label={`Direction of ${what} in the loop`} hideLabel choices={DIRECTIONS} />
        </Td>
        <Td>
          <SelectInput
            path={`${p}.distribution.type`}
            label={`Distribution assumption of ${what}`}
            hideLabel
            choices={ASSUMPTIONS}
            onPick={pickAssumption}
          />
        </Td>
        <Td>{type === 'normal' ? <NumberInput path={`${p}.distribution.k`} label={`k, sigmas per tolerance, of ${what}`} hideLabel /> : <span className="block pt-2 text-center text-xs text-ink-500">–</span>}</Td>
        <Td>
          <NumberInput path={`${p}.meanShift`} label={`Mean shift of ${what}`} hideLabel />
        </Td>
        <Td>
          <RowButtons index={i} count={count} what={what} onMove={onMove} onRemove={removeRow} minRows={1} />
        </Td>
      </tr>
      </InlineMessages.Provider>
      <RowMessages prefix={p} labels={STACK_LABELS} colSpan={10} exclude={usesData ? ['distribution.data', 'distribution'] : []} />
      {usesData ? (
        <tr>
          <Td />
          <Td colSpan={9} className="pb-3">
            <NumberListInput
              path={`${p}.distribution.data`}
              label={`Measured values of ${what} (${unit || 'same unit'})`}
              hint={type === 'normal-fit' ? 'A normal distribution is fitted to these values (their mean and standard deviation).' : 'Trials draw from these values, interpolating between them.'}
            />
            <GroupMessages path={`${p}.distribution`} />
            <MeasuredDataButton path={`${p}.distribution`} target="stack" />
          </Td>
        </tr>
      ) : null}
    </>
  );
});
