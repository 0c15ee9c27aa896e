'use client';

import type { ReactNode } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { MeasuredDataButton } from './measured-data';
import { controlClasses } from '@/components/ui/field';
import { cx } from '@/components/ui/cx';
import { FieldShell, GroupMessages, NumberInput, NumberListInput } from './fields';
import { useEditor } from './editor-context';
import { AddButton, RowButtons } from './parts';
import { DISTRIBUTION_KINDS, distributionKind, reshapeDistribution, type DistributionKind } from './model-helpers';
import { shortNumber } from './numbers';
import type { DistributionDraft, FormulaDraft } from './form-values';

type DraftOf<T extends DistributionDraft['type']> = Extract<DistributionDraft, { type?: T }>;

/** The law select: a truncated normal is offered as its own choice but stored as a normal with bounds. */
function KindSelect({ path, what, kind }: { path: string; what: string; kind: DistributionKind | undefined }) {
  const { getValues, setValue } = useFormContext();
  const { readOnly } = useEditor();
  return (
    <FieldShell path={`${path}.type`} label={`Distribution of ${what}`} hideLabel>
      {({ id, invalid, describedBy }) => (
        <div className="relative">
          <select
            id={id}
            value={kind ?? ''}
            disabled={readOnly}
            aria-invalid={invalid || undefined}
            aria-describedby={describedBy}
            onChange={(e) => {
              const next = DISTRIBUTION_KINDS.find((k) => k.value === e.target.value)?.value;
              if (next) setValue(path, reshapeDistribution(getValues(path), next), { shouldDirty: true });
            }}
            className={controlClasses(invalid, 'h-8 appearance-none pr-7 pl-2 text-sm')}
          >
            {kind ? null : <option value="">Choose a distribution…</option>}
            {DISTRIBUTION_KINDS.map((k) => (
              <option key={k.value} value={k.value}>
                {k.label}
              </option>
            ))}
          </select>
          <svg aria-hidden="true" viewBox="0 0 16 16" className="pointer-events-none absolute top-1/2 right-2 h-3.5 w-3.5 -translate-y-1/2 text-ink-600">
            <path d="m4 6 4 4 4-4" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
          </svg>
        </div>
      )}
    </FieldShell>
  );
}

function DiscreteRows({ path, what, d }: { path: string; what: string; d: DraftOf<'discrete'> }) {
  const { setValue } = useFormContext();
  const values = d.values ?? [];
  const probs = d.probabilities ?? [];
  const n = Math.max(values.length, probs.length);
  const total = probs.reduce((s, p) => s + (typeof p === 'number' && Number.isFinite(p) ? p : 0), 0);
  const removeRow = (k: number) =>
    setValue(path, { ...d, values: values.filter((_, j) => j !== k), probabilities: probs.filter((_, j) => j !== k) }, { shouldDirty: true });
  return (
    <div className="col-span-full">
      <table className="text-sm">
        <caption className="sr-only">Values and probabilities of {what}</caption>
        <thead>
          <tr>
            <th scope="col" className="px-1 pb-1 text-left text-xs font-semibold text-ink-600">
              Value
            </th>
            <th scope="col" className="px-1 pb-1 text-left text-xs font-semibold text-ink-600">
              Probability
            </th>
            <th scope="col">
              <span className="sr-only">Remove</span>
            </th>
          </tr>
        </thead>
        <tbody>
          {Array.from({ length: n }, (_, k) => (
            <tr key={k}>
              <td className="px-1 py-0.5 align-top">
                <NumberInput path={`${path}.values.${k}`} label={`Value ${k + 1} of ${what}`} hideLabel className="w-28" />
              </td>
              <td className="px-1 py-0.5 align-top">
                <NumberInput path={`${path}.probabilities.${k}`} label={`Probability of value ${k + 1} of ${what}`} hideLabel className="w-28" />
              </td>
              <td className="px-1 py-0.5 align-top">
                <RowButtons index={k} count={n} what={`value ${k + 1}`} onRemove={() => removeRow(k)} minRows={1} />
              </td>
            </tr>
          ))}
        </tbody>
        <tfoot>
          <tr>
            <td className="px-1 pt-1 text-right text-xs text-ink-600">Total</td>
            <td className={cx('num px-3 pt-1 text-right text-sm', Math.abs(total - 1) > 1e-6 ? 'font-semibold text-danger-700' : 'text-ink-800')}>{shortNumber(total, 6)}</td>
            <td />
          </tr>
        </tfoot>
      </table>
      <GroupMessages path={`${path}.values`} />
      <GroupMessages path={`${path}.probabilities`} />
      <div className="mt-2">
        <AddButton onClick={() => setValue(path, { ...d, values: [...values, (values[values.length - 1] ?? 0) + 1], probabilities: [...probs, 0] }, { shouldDirty: true })}>Add value</AddButton>
      </div>
    </div>
  );
}

function DrawnPreview({ points, what }: { points: { x?: number; y?: number }[]; what: string }) {
  const pts = points.filter((p): p is { x: number; y: number } => typeof p?.x === 'number' && typeof p?.y === 'number' && Number.isFinite(p.x) && Number.isFinite(p.y));
  if (pts.length < 2) return null;
  const xs = pts.map((p) => p.x);
  const ys = pts.map((p) => p.y);
  const x0 = Math.min(...xs);
  const x1 = Math.max(...xs);
  const y1 = Math.max(...ys, 0);
  if (!(x1 > x0) || !(y1 > 0)) return null;
  const W = 220;
  const H = 64;
  const sx = (x: number) => 4 + ((x - x0) / (x1 - x0)) * (W - 8);
  const sy = (y: number) => H - 4 - (Math.max(0, y) / y1) * (H - 10);
  const line = pts.map((p) => `${sx(p.x).toFixed(1)},${sy(p.y).toFixed(1)}`).join(' ');
  return (
    <svg viewBox={`0 0 ${W} ${H}`} className="h-16 w-56 rounded border border-ink-200 bg-white" role="img" aria-label={`Shape of the drawn density of ${what}: ${pts.length} points from ${shortNumber(x0)} to ${shortNumber(x1)}`}>
      <path d={`M${sx(pts[0].x)},${H - 4} L${line} L${sx(pts[pts.length - 1].x)},${H - 4} Z`} fill="#d3eeea" />
      <polyline points={line} fill="none" stroke="#14574f" strokeWidth="1.5" />
      <line x1="4" x2={W - 4} y1={H - 4} y2={H - 4} stroke="#aab6bf" />
    </svg>
  );
}

function DrawnRows({ path, what, d }: { path: string; what: string; d: DraftOf<'drawn'> }) {
  const { setValue } = useFormContext();
  const points = d.points ?? [];
  return (
    <div className="col-span-full">
      <div className="flex flex-wrap items-start gap-4">
        <table className="text-sm">
          <caption className="sr-only">Points of the drawn density of {what}, left to right</caption>
          <thead>
            <tr>
              <th scope="col" className="px-1 pb-1 text-left text-xs font-semibold text-ink-600">
                x
              </th>
              <th scope="col" className="px-1 pb-1 text-left text-xs font-semibold text-ink-600">
                Height
              </th>
              <th scope="col">
                <span className="sr-only">Remove</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {points.map((_, k) => (
              <tr key={k}>
                <td className="px-1 py-0.5 align-top">
                  <NumberInput path={`${path}.points.${k}.x`} label={`x of point ${k + 1} of ${what}`} hideLabel className="w-28" />
                </td>
                <td className="px-1 py-0.5 align-top">
                  <NumberInput path={`${path}.points.${k}.y`} label={`Density height at point ${k + 1} of ${what}`} hideLabel className="w-24" />
                </td>
                <td className="px-1 py-0.5 align-top">
                  <RowButtons index={k} count={points.length} what={`point ${k + 1}`} onRemove={() => setValue(path, { ...d, points: points.filter((__, j) => j !== k) }, { shouldDirty: true })} minRows={2} />
                </td>
              </tr>
            ))}
          </tbody>
        </table>
        <div>
          <DrawnPreview points={points} what={what} />
          <p className="mt-1 max-w-56 text-xs text-ink-600">Heights are relative; Stochos scales the area to 1. Points go left to right.</p>
        </div>
      </div>
      <GroupMessages path={`${path}.points`} />
      <div className="mt-2">
        <AddButton
          onClick={() => {
            const last = points[points.length - 1];
            const x = typeof last?.x === 'number' ? last.x + 1 : 0;
            setValue(path, { ...d, points: [...points, { x, y: 0 }] }, { shouldDirty: true });
          }}
        >
          Add point
        </AddButton>
      </div>
    </div>
  );
}

/** Picks a law and shows exactly the parameter fields that law takes. */
export function DistributionPicker({ path, what, unit }: { path: `inputs.${number}.distribution`; what: string; unit?: string }) {
  const d = useWatch<FormulaDraft, typeof path>({ name: path });
  const kind = distributionKind(d);
  const u = unit || undefined;
  const num = (key: string, label: string, opts: { unit?: string; placeholder?: string; hint?: string } = {}) => (
    <NumberInput key={key} path={`${path}.${key}`} label={label} unit={opts.unit} placeholder={opts.placeholder} hint={opts.hint} />
  );
  let params: ReactNode = null;
  switch (kind) {
    case 'constant':
      params = num('value', 'Value', { unit: u });
      break;
    case 'normal':
      params = [num('mean', 'Mean μ', { unit: u }), num('sd', 'Std deviation σ', { unit: u })];
      break;
    case 'truncated-normal':
      params = [
        num('mean', 'Mean μ', { unit: u }),
        num('sd', 'Std deviation σ', { unit: u }),
        num('min', 'Lower bound', { unit: u, placeholder: 'none' }),
        num('max', 'Upper bound', { unit: u, placeholder: 'none' }),
      ];
      break;
    case 'lognormal':
      params = [
        num('mu', 'μ, mean of ln X'),
        num('sigma', 'σ, standard deviation of ln X'),
        num('min', 'Lower bound (optional)', { unit: u, placeholder: 'none' }),
        num('max', 'Upper bound (optional)', { unit: u, placeholder: 'none' }),
      ];
      break;
    case 'uniform':
      params = [num('min', 'Minimum', { unit: u }), num('max', 'Maximum', { unit: u })];
      break;
    case 'triangular':
    case 'pert':
      params = [num('min', 'Minimum', { unit: u }), num('mode', 'Most likely', { unit: u }), num('max', 'Maximum', { unit: u })];
      break;
    case 'exponential':
      params = num('rate', 'Rate λ (events per unit)', { hint: 'The mean is 1 / λ.' });
      break;
    case 'weibull':
      params = [num('shape', 'Shape k'), num('scale', 'Scale λ', { unit: u })];
      break;
    case 'gamma':
      params = [num('shape', 'Shape k'), num('scale', 'Scale θ', { unit: u, hint: 'The mean is k·θ, the variance k·θ².' })];
      break;
    case 'bernoulli':
      params = num('p', 'Probability of 1', { hint: 'Gives 1 with this probability, else 0.' });
      break;
    case 'discrete':
      params = d?.type === 'discrete' ? <DiscreteRows path={path} what={what} d={d} /> : null;
      break;
    case 'empirical':
      params = (
        <div className="col-span-full">
          <NumberListInput path={`${path}.data`} label={`Observed values of ${what}`} hint="Paste a column of numbers; trials draw from them, interpolating between sorted values." rows={4} />
        </div>
      );
      break;
    case 'drawn':
      params = d?.type === 'drawn' ? <DrawnRows path={path} what={what} d={d} /> : null;
      break;
    default:
      params = null;
  }
  return (
    <div>
      <div className="grid grid-cols-[repeat(auto-fill,minmax(9.5rem,1fr))] items-start gap-x-3 gap-y-2">
        <div className="col-span-full flex flex-wrap items-center gap-x-3 gap-y-1">
          <div className="w-64 max-w-full">
            <KindSelect path={path} what={what} kind={kind} />
          </div>
          {kind === 'truncated-normal' ? <p className="text-xs text-ink-600">μ and σ of the normal before it is cut at the bounds; leave a bound empty for no cut on that side.</p> : null}
          {kind === 'lognormal' ? <p className="text-xs text-ink-600">ln X is normal with mean μ and standard deviation σ; bounds are optional.</p> : null}
        </div>
        {params}
      </div>
      <GroupMessages path={path} className="mt-1" />
      <MeasuredDataButton path={path} target="input" />
    </div>
  );
}
