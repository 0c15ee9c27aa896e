'use client';

import { useId, useMemo, useState } from 'react';
import { useFormContext, useWatch } from 'react-hook-form';
import { Banner, Button } from '@/components/ui';
import { cx } from '@/components/ui/cx';
import { Term } from '@/components/ui/term';
import { useSimulation } from '@/components/results/use-simulation';
import { createStudioEngine } from '@/lib/core/engine/studio-engine';
import { StatusMark } from '@/components/results/figures';
import { allocateTolerances, sigmaPerTolerance, type AllocationOutcome } from '@/lib/core/engine/allocation';
import { validateModel, type LinearStackModel } from '@/lib/core/engine/schema';
import { formatFixed, formatPpm } from '@/lib/core/charts/format';
import { useEditor } from './editor-context';
import { parseNumberText } from './numbers';
import { ScrollTable, Section, Td, Th } from './parts';

interface RowDraft {
  change: boolean;
  tightest: string;
  loosest: string;
  form: 'reciprocal' | 'reciprocal-power';
  a: string;
  b: string;
  k: string;
}

/** Trials for the confirming run: at least this many, so the ppm interval is narrow enough to judge. */
const CONFIRM_TRIALS = 200_000;

const nice = (v: number) => String(+v.toPrecision(3));
const short = (v: number) => String(+v.toPrecision(4));

function defaultRow(c: LinearStackModel['contributors'][number]): RowDraft {
  const half = (c.plusTol + c.minusTol) / 2;
  const usable = sigmaPerTolerance(c) !== null && half > 0;
  return { change: usable, tightest: usable ? nice(half / 4) : '', loosest: usable ? nice(half * 2) : '', form: 'reciprocal', a: '0', b: '1', k: '1' };
}

function Num({ id, label, value, onChange, invalid, className, disabled }: { id: string; label: string; value: string; onChange: (v: string) => void; invalid?: boolean; className?: string; disabled?: boolean }) {
  return (
    <input
      id={id}
      type="text"
      inputMode="decimal"
      autoComplete="off"
      aria-label={label}
      aria-invalid={invalid || undefined}
      disabled={disabled}
      value={value}
      onChange={(e) => onChange(e.target.value)}
      className={cx('num h-8 w-full min-w-16 rounded-md border bg-white px-2 text-sm disabled:bg-ink-50 disabled:text-ink-400', invalid ? 'border-danger-600 ring-1 ring-danger-600' : 'border-ink-300', className)}
    />
  );
}

const toNumber = (s: string) => {
  const v = parseNumberText(s);
  return typeof v === 'number' && Number.isFinite(v) ? v : Number.NaN;
};

/**
 * Allocate tolerances: the author sets a target for the gap and which contributors may change within their
 * process limits; Stochos proposes new tolerances (proportional scaling or least cost), predicts the gap, confirms
 * the proposal with a Monte Carlo run in the browser, and on acceptance writes it into the editor as an ordinary
 * edit (saved as a new version and checked as usual).
 */
export function AllocationPanel() {
  const { readOnly } = useEditor();
  const { control, setValue } = useFormContext();
  const values = useWatch({ control });
  const uid = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  const [open, setOpen] = useState(false);
  const [method, setMethod] = useState<'proportional' | 'least-cost'>('least-cost');
  const [targetKind, setTargetKind] = useState<'ppm' | 'ppk'>('ppk');
  const [targetText, setTargetText] = useState('1.33');
  const [drafts, setDrafts] = useState<Record<string, RowDraft>>({});
  const [outcome, setOutcome] = useState<AllocationOutcome | null>(null);
  const [accepted, setAccepted] = useState<string | null>(null);

  const checked = useMemo(() => (open ? validateModel(values) : null), [open, values]);
  const model = checked?.ok && checked.model.template === 'linear-stack' ? (checked.model as LinearStackModel) : null;
  const rowOf = (c: LinearStackModel['contributors'][number]) => drafts[c.id] ?? defaultRow(c);
  const edit = (id: string, c: LinearStackModel['contributors'][number], patch: Partial<RowDraft>) => {
    setDrafts((d) => ({ ...d, [id]: { ...(d[id] ?? defaultRow(c)), ...patch } }));
    setOutcome(null);
  };

  // The confirming Monte Carlo run of the proposed stack (the engine's own worker, as the preview uses).
  const proposal = outcome?.ok ? outcome.model : null;
  const confirmModel = useMemo(() => {
    if (!proposal) return null;
    const r = validateModel({ ...proposal, settings: { ...proposal.settings, trials: Math.max(proposal.settings.trials, CONFIRM_TRIALS) } });
    return r.ok ? r.model : null;
  }, [proposal]);
  const sim = useSimulation(confirmModel, undefined, { debounceMs: 0, createClient: createStudioEngine });
  const mc = confirmModel && sim.result && !sim.stale && sim.status === 'done' ? sim.result.stack?.monteCarlo ?? null : null;

  const propose = () => {
    if (!model) return;
    const target = toNumber(targetText);
    setAccepted(null);
    setOutcome(
      allocateTolerances(model, {
        method,
        target: { kind: targetKind, value: target },
        rows: model.contributors.map((c) => {
          const r = rowOf(c);
          return { id: c.id, change: r.change, tightest: toNumber(r.tightest), loosest: toNumber(r.loosest), cost: { form: r.form, a: toNumber(r.a), b: toNumber(r.b), k: r.form === 'reciprocal' ? 1 : toNumber(r.k) } };
        }),
      }),
    );
  };

  const accept = () => {
    if (!outcome?.ok || !model) return;
    let changed = 0;
    outcome.rows.forEach((r, i) => {
      if (!r.change) return;
      if (model.contributors[i]?.id !== r.id) return;
      setValue(`contributors.${i}.plusTol`, r.plusTol.after, { shouldDirty: true });
      setValue(`contributors.${i}.minusTol`, r.minusTol.after, { shouldDirty: true });
      changed++;
    });
    setAccepted(`${changed} tolerance${changed === 1 ? '' : 's'} written into the editor. Save a new version to keep them; it goes to a checker as usual.`);
    setOutcome(null);
  };

  const issueFor = (row: number, field: string) => (outcome && !outcome.ok ? outcome.issues.find((i) => i.path[0] === 'rows' && i.path[1] === row && i.path.slice(2).join('.') === field) : undefined);
  const targetIssue = outcome && !outcome.ok ? outcome.issues.find((i) => i.path[0] === 'target') : undefined;

  const targetText2 = (kind: 'ppm' | 'ppk', v: number) => (kind === 'ppm' ? `at most ${formatPpm(v)} out of specification` : `a Ppk of at least ${formatFixed(v, 2)}`);
  const confirmVerdict = (() => {
    if (!outcome?.ok || !mc) return null;
    if (outcome.target.kind === 'ppm') {
      const ci = mc.ppmObservedCi;
      if (mc.ppmObserved === null || !ci) return null;
      const meets = ci.low <= outcome.target.value;
      const clearly = ci.high <= outcome.target.value;
      return { meets, text: clearly ? 'meets the target' : meets ? 'meets the target within its 95 % interval' : 'misses the target: the whole 95 % interval lies above it' };
    }
    if (mc.ppk === null) return null;
    const meets = mc.ppk >= outcome.target.value * 0.99;
    return { meets, text: meets ? (mc.ppk >= outcome.target.value ? 'meets the target' : 'meets the target within 1 %') : 'misses the target' };
  })();

  return (
    <Section
      id="stack-allocation"
      title="Allocate tolerances"
      description={
        <>
          Set a target for the gap and let Stochos propose tolerances that meet it under the <Term term="RSS">RSS</Term> model, within what each process can hold. A Monte Carlo run checks the
          proposal before you accept it into the editor.
        </>
      }
      actions={
        readOnly ? null : (
          <Button size="sm" variant={open ? 'secondary' : 'primary'} aria-expanded={open} aria-controls={`${uid}-alloc`} onClick={() => setOpen((o) => !o)}>
            {open ? 'Close' : 'Allocate tolerances'}
          </Button>
        )
      }
    >
      {accepted ? (
        <Banner tone="success" className="mb-3">
          {accepted}
        </Banner>
      ) : null}
      {!open ? (
        <p className="text-sm text-ink-600">{readOnly ? 'Only an author can allocate tolerances.' : 'Opens a panel with the target, the contributors that may change and their process limits.'}</p>
      ) : !model ? (
        <Banner tone="warn">Fix the problems listed at the top of the editor first: the allocation works on a stack that passes every check.</Banner>
      ) : (
        <div id={`${uid}-alloc`} className="space-y-4">
          <div className="flex flex-wrap items-end gap-4">
            <fieldset>
              <legend className="mb-1 text-[0.8125rem] font-medium text-ink-800">Target for the gap</legend>
              <div className="flex items-center gap-2">
                <select
                  aria-label="Target measure"
                  className="h-8 rounded-md border border-ink-300 bg-white px-2 text-sm"
                  value={targetKind}
                  onChange={(e) => {
                    const k = e.target.value as 'ppm' | 'ppk';
                    setTargetKind(k);
                    setTargetText(k === 'ppm' ? '100' : '1.33');
                    setOutcome(null);
                  }}
                >
                  <option value="ppk">Ppk at least</option>
                  <option value="ppm">ppm out of specification at most</option>
                </select>
                <Num
                  id={`${uid}-target`}
                  label={targetKind === 'ppm' ? 'Target: most ppm out of specification' : 'Target: least Ppk'}
                  value={targetText}
                  onChange={(v) => {
                    setTargetText(v);
                    setOutcome(null);
                  }}
                  invalid={Boolean(targetIssue)}
                  className="w-24"
                />
              </div>
              {targetIssue ? <p className="mt-1 text-sm text-danger-700">{targetIssue.message}</p> : null}
            </fieldset>
            <fieldset>
              <legend className="mb-1 text-[0.8125rem] font-medium text-ink-800">Method</legend>
              <div className="flex flex-wrap gap-x-4 gap-y-1 text-sm text-ink-800">
                <label className="inline-flex items-center gap-1.5">
                  <input type="radio" name={`${uid}-method`} className="accent-accent-700" checked={method === 'least-cost'} onChange={() => (setMethod('least-cost'), setOutcome(null))} />
                  Least cost (Lagrange multipliers)
                </label>
                <label className="inline-flex items-center gap-1.5">
                  <input type="radio" name={`${uid}-method`} className="accent-accent-700" checked={method === 'proportional'} onChange={() => (setMethod('proportional'), setOutcome(null))} />
                  Proportional scaling
                </label>
              </div>
            </fieldset>
          </div>

          <ScrollTable caption="Contributors that may change, their process limits and cost curves" minWidth={920}>
            <thead>
              <tr>
                <Th className="min-w-44">Contributor</Th>
                <Th className="w-20">May change</Th>
                <Th className="w-24">Now ±</Th>
                <Th className="w-24">Tightest ±</Th>
                <Th className="w-24">Loosest ±</Th>
                <Th className="w-40">
                  <Term explain="Relative cost of holding a tolerance T (the half band): reciprocal C = A + B/T, or reciprocal power C = A + B/T^k. Only the ratios between contributors matter; enter B from quotes or process data.">
                    Cost curve
                  </Term>
                </Th>
                <Th className="w-20">A</Th>
                <Th className="w-20">B</Th>
                <Th className="w-16">k</Th>
              </tr>
            </thead>
            <tbody>
              {model.contributors.map((c, i) => {
                const r = rowOf(c);
                const usable = sigmaPerTolerance(c) !== null && c.plusTol + c.minusTol > 0;
                const off = !r.change || !usable;
                const p = `${uid}-r${i}`;
                return (
                  <tr key={c.id}>
                    <Td className="pt-2.5 text-sm text-ink-900">
                      <span className="break-words">{c.name}</span>
                      {!usable ? <span className="block text-xs text-ink-500">{sigmaPerTolerance(c) === null ? 'from measured data: fixed' : 'no tolerance band'}</span> : null}
                    </Td>
                    <Td className="pt-2.5">
                      <input type="checkbox" aria-label={`${c.name} may change`} className="h-4 w-4 accent-accent-700" disabled={!usable} checked={r.change && usable} onChange={(e) => edit(c.id, c, { change: e.target.checked })} />
                    </Td>
                    <Td className="num pt-2.5 text-sm text-ink-700">{short((c.plusTol + c.minusTol) / 2)}</Td>
                    <Td>
                      <Num id={`${p}-t`} label={`Tightest tolerance of ${c.name}`} value={r.tightest} disabled={off} invalid={Boolean(issueFor(i, 'tightest'))} onChange={(v) => edit(c.id, c, { tightest: v })} />
                    </Td>
                    <Td>
                      <Num id={`${p}-l`} label={`Loosest tolerance of ${c.name}`} value={r.loosest} disabled={off} invalid={Boolean(issueFor(i, 'loosest'))} onChange={(v) => edit(c.id, c, { loosest: v })} />
                    </Td>
                    <Td>
                      <select
                        aria-label={`Cost curve of ${c.name}`}
                        className="h-8 w-full rounded-md border border-ink-300 bg-white px-1.5 text-sm disabled:bg-ink-50"
                        disabled={off}
                        value={r.form}
                        onChange={(e) => edit(c.id, c, { form: e.target.value as RowDraft['form'] })}
                      >
                        <option value="reciprocal">A + B/T</option>
                        <option value="reciprocal-power">A + B/T^k</option>
                      </select>
                    </Td>
                    <Td>
                      <Num id={`${p}-a`} label={`Cost A of ${c.name}`} value={r.a} disabled={off} invalid={Boolean(issueFor(i, 'cost.a'))} onChange={(v) => edit(c.id, c, { a: v })} />
                    </Td>
                    <Td>
                      <Num id={`${p}-b`} label={`Cost B of ${c.name}`} value={r.b} disabled={off} invalid={Boolean(issueFor(i, 'cost.b'))} onChange={(v) => edit(c.id, c, { b: v })} />
                    </Td>
                    <Td>
                      <Num id={`${p}-k`} label={`Cost exponent k of ${c.name}`} value={r.form === 'reciprocal' ? '1' : r.k} disabled={off || r.form === 'reciprocal'} invalid={Boolean(issueFor(i, 'cost.k'))} onChange={(v) => edit(c.id, c, { k: v })} />
                    </Td>
                  </tr>
                );
              })}
            </tbody>
          </ScrollTable>
          <p className="text-xs leading-snug text-ink-600">
            Tolerances here are half bands, (plus + minus) / 2; a contributor’s plus and minus keep their proportion. Least cost minimises the summed cost index by Lagrange multipliers
            (Spotts 1973; Chase, Greenwood, Loosli &amp; Hauglund 1990), proportional scaling multiplies every changeable tolerance by one factor (Chase &amp; Greenwood 1988); both clamp each
            contributor to its process limits.
          </p>
          <div>
            <Button onClick={propose}>Propose tolerances</Button>
          </div>

          {outcome && !outcome.ok ? (
            <Banner tone="danger" title={outcome.reason}>
              {outcome.binding.length ? (
                <ul className="mt-1 list-disc pl-5">
                  {outcome.binding.map((b) => (
                    <li key={b.id}>
                      {b.name}: {b.why}
                    </li>
                  ))}
                </ul>
              ) : null}
              {outcome.issues.length ? (
                <ul className="mt-1 list-disc pl-5">
                  {outcome.issues.map((iss) => {
                    const row = iss.path[0] === 'rows' && typeof iss.path[1] === 'number' ? model.contributors[iss.path[1]]?.name : null;
                    return <li key={iss.path.join('.') + iss.message}>{row ? `${row}: ${iss.message}` : iss.message}</li>;
                  })}
                </ul>
              ) : null}
              {outcome.binding.length ? <p className="mt-1">Loosen a process limit (a better process), let more contributors change, or relax the target.</p> : null}
            </Banner>
          ) : null}

          {outcome?.ok ? (
            <div className="space-y-3" aria-live="polite">
              <h3 className="text-sm font-semibold text-ink-900">
                Proposal: {outcome.method === 'least-cost' ? 'least cost' : 'proportional scaling'} for {targetText2(outcome.target.kind, outcome.target.value)}
              </h3>
              <ScrollTable caption="Proposed tolerances beside the current ones" minWidth={760}>
                <thead>
                  <tr>
                    <Th className="min-w-44">Contributor</Th>
                    <Th className="w-32 text-right">Current</Th>
                    <Th className="w-32 text-right">Proposed</Th>
                    <Th className="w-20 text-right">Change</Th>
                    <Th className="w-24">Limit</Th>
                    <Th className="w-24 text-right">Cost before</Th>
                    <Th className="w-24 text-right">Cost after</Th>
                  </tr>
                </thead>
                <tbody>
                  {outcome.rows.map((r) => (
                    <tr key={r.id} className={r.change ? undefined : 'text-ink-500'}>
                      <Td className="text-sm">{r.name}</Td>
                      <Td className="num text-right text-sm">
                        +{short(r.plusTol.before)} / −{short(r.minusTol.before)}
                      </Td>
                      <Td className="num text-right text-sm font-semibold">{r.change ? `+${short(r.plusTol.after)} / −${short(r.minusTol.after)}` : 'unchanged'}</Td>
                      <Td className="num text-right text-sm">{r.change ? `${r.after >= r.before ? '+' : '−'}${formatFixed(Math.abs(r.after / r.before - 1) * 100, 0)} %` : '—'}</Td>
                      <Td className="text-sm">{r.atLimit === 'tightest' ? 'at tightest' : r.atLimit === 'loosest' ? 'at loosest' : ''}</Td>
                      <Td className="num text-right text-sm">{r.costBefore === null ? '—' : short(r.costBefore)}</Td>
                      <Td className="num text-right text-sm">{r.costAfter === null ? '—' : short(r.costAfter)}</Td>
                    </tr>
                  ))}
                  <tr>
                    <Td className="text-sm font-semibold">Cost index, changeable contributors</Td>
                    <Td />
                    <Td />
                    <Td />
                    <Td />
                    <Td className="num text-right text-sm font-semibold">{short(outcome.costBefore)}</Td>
                    <Td className="num text-right text-sm font-semibold">{short(outcome.costAfter)}</Td>
                  </tr>
                </tbody>
              </ScrollTable>

              <dl className="grid grid-cols-1 gap-2 text-sm sm:grid-cols-3" aria-label="Predicted and confirmed figures">
                <div className="rounded-md border border-ink-200 px-3 py-2">
                  <dt className="text-xs text-ink-600">Predicted now (RSS, normal gap)</dt>
                  <dd className="num mt-0.5">
                    {outcome.before.ppm === null ? '—' : formatPpm(outcome.before.ppm)} · Ppk {outcome.before.ppk === null ? '—' : formatFixed(outcome.before.ppk, 2)}
                  </dd>
                </div>
                <div className="rounded-md border border-accent-200 bg-accent-50 px-3 py-2">
                  <dt className="text-xs text-ink-600">Predicted with the proposal</dt>
                  <dd className="num mt-0.5 font-semibold" data-testid="allocation-predicted">
                    {outcome.after.ppm === null ? '—' : formatPpm(outcome.after.ppm)} · Ppk {outcome.after.ppk === null ? '—' : formatFixed(outcome.after.ppk, 2)}
                  </dd>
                </div>
                <div className="rounded-md border border-ink-200 px-3 py-2">
                  <dt className="text-xs text-ink-600">Monte Carlo of the proposal ({(confirmModel?.settings.trials ?? 0).toLocaleString('en-US')} trials)</dt>
                  <dd className="num mt-0.5" data-testid="allocation-confirm">
                    {mc ? (
                      <>
                        {mc.ppmObserved === null ? '—' : formatPpm(mc.ppmObserved)}
                        {mc.ppmObservedCi ? ` (95 % ${formatPpm(mc.ppmObservedCi.low)} to ${formatPpm(mc.ppmObservedCi.high)})` : ''} · Ppk {mc.ppk === null ? '—' : formatFixed(mc.ppk, 2)}
                        {confirmVerdict ? (
                          <span className="mt-0.5 block">
                            <StatusMark tone={confirmVerdict.meets ? 'good' : 'bad'}>{confirmVerdict.text}</StatusMark>
                          </span>
                        ) : null}
                      </>
                    ) : sim.status === 'error' ? (
                      <span className="text-danger-700">The run failed: {sim.error?.message}</span>
                    ) : (
                      <span className="text-ink-600">Running{sim.progress ? ` (${Math.round((100 * sim.progress.done) / sim.progress.total)} %)` : ''}…</span>
                    )}
                  </dd>
                </div>
              </dl>
              {outcome.notes.length ? (
                <ul className="list-disc space-y-0.5 pl-5 text-xs text-ink-700">
                  {outcome.notes.map((n) => (
                    <li key={n}>{n}</li>
                  ))}
                </ul>
              ) : null}
              <p className="text-xs leading-snug text-ink-600">
                The prediction treats the gap as normal; the Monte Carlo run samples each contributor’s own distribution, so it is the figure to trust for uniform, triangular or
                correlated contributors. Results support, and never replace, engineering judgement and the drawing’s geometric tolerancing.
              </p>
              <div className="flex flex-wrap gap-2">
                <Button onClick={accept} disabled={!mc}>
                  {mc && confirmVerdict && !confirmVerdict.meets ? 'Accept into the editor anyway' : 'Accept into the editor'}
                </Button>
                <Button variant="secondary" onClick={() => setOutcome(null)}>
                  Discard proposal
                </Button>
              </div>
            </div>
          ) : null}
        </div>
      )}
    </Section>
  );
}
