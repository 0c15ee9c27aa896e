'use client';

import { useCallback, useEffect, useId, useMemo, useRef, useState } from 'react';
import { FormProvider, useForm, useWatch, type FieldErrors } from 'react-hook-form';
import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';
import type { ModelDraft } from './form-values';
import { TEMPLATE_LABELS } from '@/lib/core/models/templates';
import { EditorContext, domIdFor, type EditorContextValue } from './editor-context';
import { flattenFieldErrors, mergeMessages, readablePath, withoutChanged, type FieldMessages } from './error-paths';
import { createModelResolver } from './resolver';
import { TextAreaInput, TextInput, GroupMessages } from './fields';
import { Section } from './parts';
import { LinearStackForm } from './linear-stack-form';
import { CostRangeForm } from './cost-range-form';
import { FormulaForm } from './formula-form';
import { DialsEditor } from './dials-editor';
import { SettingsForm } from './settings-form';
import { ImportExport } from './import-export';
import { markStep } from '@/lib/core/engine/step-marks';

export interface ModelEditorProps {
  /** The model to edit (a saved version, an example, or a draft). */
  value: CheckedModel | ModelDraft;
  /**
   * Called after every change once it is checked. `valid` is true when the engine's schema and whole-model checks
   * pass; the model is then the parsed model (defaults applied). Otherwise it is the draft as typed.
   */
  onChange: (...change: [model: CheckedModel, valid: true] | [model: ModelDraft, valid: false]) => void;
  readOnly?: boolean;
  /** Field problems from the server's 422, keyed by dotted path ("contributors.2.plusTol"); shown beside the field until it is edited. */
  errors?: Record<string, string[]>;
}

/** How long typing must pause before problems are shown at the fields (a valid change reaches the preview at once). */
const VALIDATE_DELAY_MS = 120;
/** Longest check of a keystroke that may run on every keystroke of a burst (ms); a slower one runs on the first only. */
const QUICK_CHECK_BUDGET_MS = 8;

/** The model as form values: lists present, and the schema's defaults filled in where a select shows them. */
function toFormValues(model: CheckedModel | ModelDraft): ModelDraft {
  const v: ModelDraft = structuredClone(model);
  v.dials ??= [];
  const s = (v.settings ??= {});
  s.design ??= 'monte-carlo';
  s.normalMethod ??= 'box-muller';
  s.correlationMethod ??= 'copula';
  const rows = <T,>(list: T[] | undefined): T[] => (Array.isArray(list) ? list : []);
  if (v.template === 'cost-range') {
    v.correlationGroups ??= [];
    v.riskEvents ??= [];
    v.confidence ??= 0.8;
    for (const it of rows(v.items)) if (it && typeof it === 'object') it.distribution ??= 'pert';
    for (const r of rows(v.riskEvents)) if (r?.impact && typeof r.impact === 'object') r.impact.distribution ??= 'pert';
  }
  if (v.template === 'linear-stack') {
    v.limits ??= {};
    for (const c of rows(v.contributors)) if (c && typeof c === 'object') c.meanShift ??= 0;
  }
  return v;
}

/** Moves focus to the control for a path, or the nearest one inside or above it. */
function focusPath(prefix: string, path: string): void {
  const parts = path === '_' ? [] : path.split('.');
  for (let n = parts.length; n > 0; n--) {
    const id = domIdFor(prefix, parts.slice(0, n).join('.'));
    const el = document.getElementById(id) ?? document.querySelector<HTMLElement>(`input[id^="${id}-"], select[id^="${id}-"], textarea[id^="${id}-"]`);
    if (el) {
      el.scrollIntoView({ block: 'center', behavior: 'smooth' });
      el.focus({ preventScroll: true });
      return;
    }
  }
}

function ProblemList({ messages, prefix }: { messages: FieldMessages; prefix: string }) {
  const entries = Object.entries(messages).flatMap(([k, list]) => list.map((m) => ({ key: k, message: m })));
  if (!entries.length) return null;
  return (
    <div className="rounded-md border border-danger-600/30 border-l-4 border-l-danger-700 bg-danger-50 px-3 py-2.5" aria-labelledby={`${prefix}-problems-title`} role="region">
      <p id={`${prefix}-problems-title`} className="text-sm font-medium text-ink-900">
        {entries.length === 1 ? 'One problem to fix' : `${entries.length} problems to fix`} before this model can run or be saved as a version:
      </p>
      <ul className="mt-1 max-h-48 list-none space-y-0.5 overflow-y-auto text-sm">
        {entries.slice(0, 60).map((e, k) => (
          <li key={`${e.key}-${k}`}>
            <a
              href={`#${domIdFor(prefix, e.key)}`}
              className="text-danger-700 underline decoration-danger-600/40 hover:decoration-danger-700"
              onClick={(ev) => {
                ev.preventDefault();
                focusPath(prefix, e.key);
              }}
            >
              {readablePath(e.key)}
            </a>
            <span className="text-ink-800">: {e.message}</span>
          </li>
        ))}
        {entries.length > 60 ? <li className="text-ink-700">…and {entries.length - 60} more.</li> : null}
      </ul>
    </div>
  );
}

function Dials() {
  // The dial picker reads the draft as it stands; its helpers tolerate missing fields.
  const all = useWatch<ModelDraft>();
  return <DialsEditor model={all} />;
}

/**
 * The model editor: one form over the whole model, validated with the engine's own schema. Every problem shows
 * beside its field (aria-invalid, aria-describedby) and in a list at the top that links to the field.
 */
export function ModelEditor({ value, onChange, readOnly = false, errors }: ModelEditorProps) {
  const prefix = 'me' + useId().replace(/[^a-zA-Z0-9_-]/g, '');
  const parsed = useRef<CheckedModel | null>(null);
  const latestErrors = useRef<FieldErrors>({});
  const resolver = useMemo(
    () =>
      createModelResolver((m, errs) => {
        parsed.current = m;
        latestErrors.current = errs;
      }),
    [],
  );
  const form = useForm<ModelDraft, unknown, CheckedModel>({ defaultValues: toFormValues(value), resolver, criteriaMode: 'all', mode: 'onSubmit', reValidateMode: 'onSubmit' });

  const [client, setClient] = useState<FieldMessages>({});
  const [local, setLocalState] = useState<FieldMessages>({});
  const localRef = useRef<FieldMessages>({});
  const [serverSource, setServerSource] = useState(errors);
  const [server, setServer] = useState<FieldMessages>(errors ?? {});
  if (errors !== serverSource) {
    setServerSource(errors);
    setServer(errors ?? {});
  }
  const [valid, setValid] = useState(true);
  // Nothing is claimed about the model until the first check has run in the browser.
  const [checked, setChecked] = useState(false);

  const onChangeRef = useRef(onChange);
  useEffect(() => {
    onChangeRef.current = onChange;
  }, [onChange]);

  const seq = useRef(0);
  const lastSeen = useRef(JSON.stringify(value));
  const resetting = useRef(false);
  const timer = useRef<ReturnType<typeof setTimeout> | null>(null);

  // What the parent last heard (or the model it gave us): list components echo events after a reset, and those
  // must not count as changes.
  const baseline = useRef<{ raw: string; valid: boolean | null }>({ raw: '', valid: null });

  const validate = useCallback(
    async (emit: boolean) => {
      const mine = ++seq.current;
      const ok = await form.trigger();
      if (mine !== seq.current) return;
      const found = flattenFieldErrors(latestErrors.current);
      // Unchanged problems keep their object, so the fields do not render again after every pause in typing.
      setClient((prev) => (JSON.stringify(prev) === JSON.stringify(found) ? prev : found));
      const isValid = ok && Object.keys(localRef.current).length === 0;
      setValid(isValid);
      setChecked(true);
      const raw = JSON.stringify(form.getValues());
      if (!emit) {
        baseline.current = { raw, valid: isValid };
        return;
      }
      if (raw === baseline.current.raw && isValid === baseline.current.valid) return;
      baseline.current = { raw, valid: isValid };
      const model = isValid ? parsed.current : null;
      if (model) {
        lastSeen.current = JSON.stringify(model);
        markStep('edit-valid');
        onChangeRef.current(model, true);
      } else {
        const draft = form.getValues();
        lastSeen.current = JSON.stringify(draft);
        onChangeRef.current(draft, false);
      }
    },
    [form],
  );

  const schedule = useCallback(() => {
    if (timer.current) clearTimeout(timer.current);
    timer.current = setTimeout(() => void validate(true), VALIDATE_DELAY_MS);
  }, [validate]);

  // A change that makes a valid model goes to the parent at once, inside the input event (so the preview's run
  // starts before the page paints the keystroke); one that does not waits for validate(), so problems appear at the
  // fields only once typing pauses. Synchronous, and apart from the field check's state (parsed, latestErrors). The
  // resolver parses, then runs validateModel on the result; the schema has defaults and refinements but no
  // transforms, so one validateModel gives the same model.
  // A large model makes the check slow: then only the first keystroke of a burst is checked at once, and the rest
  // wait for typing to pause as before, so typing never drags.
  const quickMs = useRef(0);
  const lastChangeAt = useRef(-Infinity);
  const quickCheck = useCallback(() => {
    const now = performance.now();
    const inBurst = now - lastChangeAt.current < VALIDATE_DELAY_MS;
    lastChangeAt.current = now;
    if (inBurst && quickMs.current > QUICK_CHECK_BUDGET_MS) return;
    if (Object.keys(localRef.current).length) return;
    const values = form.getValues();
    const raw = JSON.stringify(values);
    if (raw === baseline.current.raw) return;
    const checked = validateModel(values);
    quickMs.current = performance.now() - now;
    if (!checked.ok) return;
    baseline.current = { raw, valid: true };
    lastSeen.current = JSON.stringify(checked.model);
    markStep('edit-valid');
    onChangeRef.current(checked.model, true);
  }, [form]);

  // Every change: forget what the server said about that field, then check the whole model again.
  useEffect(() => {
    // watch(callback) fires only for value changes (not for the error updates trigger() makes), which is what we want.
    // eslint-disable-next-line react-hooks/incompatible-library
    const sub = form.watch((_, info) => {
      if (resetting.current) return;
      const name = info?.name;
      // The same object when nothing is dropped: a new one would render every field again on each keystroke.
      if (name)
        setServer((s) => {
          const next = withoutChanged(s, name);
          return Object.keys(next).length === Object.keys(s).length ? s : next;
        });
      quickCheck();
      schedule();
    });
    return () => {
      sub.unsubscribe();
      if (timer.current) clearTimeout(timer.current);
    };
  }, [form, schedule, quickCheck]);

  // First check on mount, so a loaded model shows its problems straight away.
  useEffect(() => {
    void validate(false);
  }, [validate]);

  // A new model from outside (another version, a reset) replaces the form; our own echo does not.
  useEffect(() => {
    const text = JSON.stringify(value);
    if (text === lastSeen.current) return;
    lastSeen.current = text;
    resetting.current = true;
    form.reset(toFormValues(value));
    resetting.current = false;
    localRef.current = {};
    setLocalState({});
    void validate(false);
  }, [value, form, validate]);

  const setLocal = useCallback(
    (path: string, message: string | null) => {
      const cur = localRef.current;
      if ((cur[path]?.[0] ?? null) === message) return;
      const next = { ...cur };
      if (message) next[path] = [message];
      else delete next[path];
      localRef.current = next;
      setLocalState(next);
      schedule();
    },
    [schedule],
  );

  const messages = useMemo(() => mergeMessages(local, client, server), [local, client, server]);
  const ctx = useMemo<EditorContextValue>(() => ({ readOnly, messages, idFor: (p) => domIdFor(prefix, p), setLocal }), [readOnly, messages, prefix, setLocal]);
  const template = value.template;

  const importModel = (model: CheckedModel) => {
    resetting.current = true;
    form.reset(toFormValues(model));
    resetting.current = false;
    localRef.current = {};
    setLocalState({});
    setServer({});
    void validate(true);
  };

  return (
    <FormProvider {...form}>
      <EditorContext.Provider value={ctx}>
        <form
          noValidate
          data-checked={checked ? 'true' : undefined}
          aria-label={`${TEMPLATE_LABELS[template]} model editor`}
          onSubmit={(e) => e.preventDefault()}
          // A container: the editor lays itself out by the width it is given (full page, or beside a preview).
          className="@container space-y-4"
        >
          <div className="flex flex-wrap items-start justify-between gap-3">
            <p role="status" className="pt-1 text-sm text-ink-700">
              <span className="mr-2 inline-flex items-center rounded bg-ink-100 px-1.5 py-0.5 text-xs font-medium text-ink-700 ring-1 ring-ink-200 ring-inset">{TEMPLATE_LABELS[template]}</span>
              {!checked ? 'Checking…' : readOnly ? 'Read only.' : Object.keys(messages).length === 0 ? 'No problems found.' : null}
            </p>
            <ImportExport getModel={() => (parsed.current && valid ? parsed.current : form.getValues())} valid={valid} template={template} readOnly={readOnly} onImport={importModel} />
          </div>

          <ProblemList messages={messages} prefix={prefix} />

          <Section id="about" title="About this model">
            <GroupMessages path="_" className="mb-2" />
            <div className="grid gap-4 @3xl:grid-cols-[minmax(0,1fr)_minmax(0,1.4fr)]">
              <TextInput path="title" label="Title" dense={false} maxLength={120} />
              <TextAreaInput path="description" label="Description (optional)" rows={2} />
            </div>
          </Section>

          {template === 'linear-stack' ? <LinearStackForm /> : template === 'cost-range' ? <CostRangeForm /> : <FormulaForm />}

          <Dials />
          <SettingsForm />
        </form>
      </EditorContext.Provider>
    </FormProvider>
  );
}
