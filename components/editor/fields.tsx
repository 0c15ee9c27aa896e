'use client';

import { createContext, useContext, useEffect, useState, type ReactNode } from 'react';
import { useController, useFormContext } from 'react-hook-form';
import { controlClasses, FieldError } from '@/components/ui/field';
import { cx } from '@/components/ui/cx';
import { useEditor, useMessages } from './editor-context';
import { formatNumberText, listProblem, parseNumberList, parseNumberText, sameNumber } from './numbers';
import { allIds, renameReferences } from './model-helpers';

// Inputs bound to a dotted model path. Each has a label (visible or screen-reader only), shows every message for
// its path right below it, and sets aria-invalid and aria-describedby (message, hint, unit).

/**
 * False inside table rows: a cell keeps its outline and aria-describedby, and the message itself is printed in the
 * row just below (RowMessages), where it has room to be read.
 */
export const InlineMessages = createContext(true);

interface ShellProps {
  path: string;
  label: ReactNode;
  hideLabel?: boolean;
  hint?: ReactNode;
  className?: string;
  /** Extra problems known only to this control (e.g. bad tokens in a list). */
  extra?: string | null;
  children: (a: { id: string; invalid: boolean; describedBy: string | undefined }) => ReactNode;
}

export function FieldShell({ path, label, hideLabel, hint, className, extra, children }: ShellProps) {
  const { idFor } = useEditor();
  const inline = useContext(InlineMessages);
  const messages = useMessages(path);
  const all = extra && !messages.includes(extra) ? [extra, ...messages] : messages;
  const id = idFor(path);
  const errorId = all.length ? `${id}-error` : undefined;
  const hintId = hint ? `${id}-hint` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(' ') || undefined;
  return (
    <div className={className}>
      <label htmlFor={id} className={hideLabel ? 'sr-only' : 'mb-1 block text-[0.8125rem] font-medium text-ink-800'}>
        {label}
      </label>
      {children({ id, invalid: all.length > 0, describedBy })}
      {all.length && inline ? <FieldError id={errorId}>{all.join(' ')}</FieldError> : null}
      {hint ? (
        <p id={hintId} className="mt-1 text-xs leading-snug text-ink-600">
          {hint}
        </p>
      ) : null}
    </div>
  );
}

/** Messages for a path that has no single control (a list, a row, a whole group). */
export function GroupMessages({ path, className }: { path: string; className?: string }) {
  const { idFor } = useEditor();
  const messages = useMessages(path);
  if (!messages.length) return null;
  return (
    <div className={className} id={`${idFor(path)}-error`}>
      {messages.map((m) => (
        <FieldError key={m}>{m}</FieldError>
      ))}
    </div>
  );
}

/**
 * The messages of one table row, under the row: each names its column and carries the id the cell's
 * aria-describedby points at. `labels` maps a path relative to the row ("plusTol", "impact.low") to its column.
 */
export function RowMessages({ prefix, labels, colSpan, exclude = [] }: { prefix: string; labels: Record<string, string>; colSpan: number; exclude?: string[] }) {
  const { messages, idFor } = useEditor();
  const rows: { path: string; rel: string; text: string }[] = [];
  for (const [k, list] of Object.entries(messages)) {
    if (k !== prefix && !k.startsWith(prefix + '.')) continue;
    const rel = k === prefix ? '' : k.slice(prefix.length + 1);
    if (exclude.some((e) => rel === e || rel.startsWith(e + '.'))) continue;
    rows.push({ path: k, rel, text: list.join(' ') });
  }
  if (!rows.length) return null;
  const labelOf = (rel: string) => {
    if (!rel) return null;
    if (labels[rel]) return labels[rel];
    const parts = rel.split('.');
    for (let n = parts.length - 1; n > 0; n--) {
      const l = labels[parts.slice(0, n).join('.')];
      if (l) return l;
    }
    return rel;
  };
  return (
    <tr>
      <td />
      <td colSpan={colSpan - 1} className="border-b border-ink-100 px-1.5 pb-2">
        {rows.map((r) => (
          <FieldError key={r.path} id={r.rel ? `${idFor(r.path)}-error` : undefined}>
            {labelOf(r.rel) ? <strong className="font-semibold">{labelOf(r.rel)}: </strong> : null}
            {r.text}
          </FieldError>
        ))}
      </td>
    </tr>
  );
}

interface NumberInputProps {
  path: string;
  label: ReactNode;
  hideLabel?: boolean;
  hint?: ReactNode;
  unit?: ReactNode;
  /** 100 shows and enters a 0–1 value as a percentage. */
  scale?: number;
  className?: string;
  inputClassName?: string;
  placeholder?: string;
  /** Compact height for table cells. */
  dense?: boolean;
}

/** A number box: text input with decimal keyboard, mono tabular figures, right-aligned, optional unit. */
export function NumberInput({ path, label, hideLabel, hint, unit, scale = 1, className, inputClassName, placeholder, dense = true }: NumberInputProps) {
  const { control } = useFormContext();
  const { readOnly } = useEditor();
  const { field } = useController({ name: path, control });
  const [text, setText] = useState(() => formatNumberText(field.value, scale));
  const [seen, setSeen] = useState<unknown>(field.value);
  // The value changed from outside (reset, repair, import): show it unless the text already means it.
  if (!sameNumber(seen, field.value)) {
    setSeen(field.value);
    if (!sameNumber(parseNumberText(text, scale), field.value)) setText(formatNumberText(field.value, scale));
  }
  return (
    <FieldShell path={path} label={label} hideLabel={hideLabel} hint={hint} className={className}>
      {({ id, invalid, describedBy }) => (
        <div className="flex items-stretch">
          <input
            id={id}
            ref={field.ref}
            name={field.name}
            type="text"
            inputMode="decimal"
            autoComplete="off"
            spellCheck={false}
            value={text}
            readOnly={readOnly}
            placeholder={placeholder}
            aria-invalid={invalid || undefined}
            aria-describedby={[describedBy, unit ? `${id}-unit` : null].filter(Boolean).join(' ') || undefined}
            onChange={(e) => {
              setText(e.target.value);
              const v = parseNumberText(e.target.value, scale);
              setSeen(v);
              field.onChange(v);
            }}
            onBlur={field.onBlur}
            className={controlClasses(invalid, cx('num text-right', dense ? 'h-8 px-2 text-sm' : 'h-10', unit ? 'rounded-r-none' : undefined, inputClassName))}
          />
          {unit ? (
            <span id={`${id}-unit`} className={cx('num inline-flex items-center rounded-r-md border border-l-0 border-ink-300 bg-ink-100 px-2 text-ink-700', dense ? 'text-xs' : 'text-sm')}>
              {unit}
            </span>
          ) : null}
        </div>
      )}
    </FieldShell>
  );
}

interface TextInputProps {
  path: string;
  label: ReactNode;
  hideLabel?: boolean;
  hint?: ReactNode;
  className?: string;
  inputClassName?: string;
  placeholder?: string;
  dense?: boolean;
  mono?: boolean;
  maxLength?: number;
  /** Transforms the typed text before it is stored (e.g. seeds that are whole numbers). */
  toValue?: (text: string) => unknown;
  /** Called after each change with the value before and after (e.g. to carry a renamed key to its references). */
  onValueChange?: (prev: unknown, next: unknown) => void;
  /**
   * A one-line value that wraps onto more lines instead of scrolling out of sight (long names in narrow table
   * cells): a textarea that grows with its text and takes no line breaks.
   */
  wrap?: boolean;
}

export function TextInput({ path, label, hideLabel, hint, className, inputClassName, placeholder, dense = true, mono, maxLength, toValue, onValueChange, wrap }: TextInputProps) {
  const { control } = useFormContext();
  const { readOnly } = useEditor();
  const { field } = useController({ name: path, control });
  const value = field.value === undefined || field.value === null ? '' : String(field.value);
  return (
    <FieldShell path={path} label={label} hideLabel={hideLabel} hint={hint} className={className}>
      {({ id, invalid, describedBy }) =>
        wrap ? (
          <textarea
            id={id}
            ref={field.ref}
            name={field.name}
            rows={1}
            autoComplete="off"
            spellCheck={mono ? false : undefined}
            value={value}
            readOnly={readOnly}
            placeholder={placeholder}
            maxLength={maxLength}
            aria-invalid={invalid || undefined}
            aria-describedby={describedBy}
            // A name is one line of text: Enter does not break it, pasted line breaks become spaces.
            onKeyDown={(e) => {
              if (e.key === 'Enter') e.preventDefault();
            }}
            onChange={(e) => {
              const prev = field.value;
              const text = e.target.value.replace(/\s*[\r\n]+\s*/g, ' ');
              const next = toValue ? toValue(text) : text;
              field.onChange(next);
              onValueChange?.(prev, next);
            }}
            onBlur={field.onBlur}
            className={controlClasses(invalid, cx('block min-h-8 resize-none overflow-hidden px-2 py-[0.3125rem] text-sm leading-5 [field-sizing:content]', mono && 'num', inputClassName))}
          />
        ) : (
        <input
          id={id}
          ref={field.ref}
          name={field.name}
          type="text"
          autoComplete="off"
          spellCheck={mono ? false : undefined}
          value={value}
          readOnly={readOnly}
          placeholder={placeholder}
          maxLength={maxLength}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          onChange={(e) => {
            const prev = field.value;
            const next = toValue ? toValue(e.target.value) : e.target.value;
            field.onChange(next);
            onValueChange?.(prev, next);
          }}
          onBlur={field.onBlur}
          className={controlClasses(invalid, cx(dense ? 'h-8 px-2 text-sm' : 'h-10', mono && 'num', inputClassName))}
        />
        )
      }
    </FieldShell>
  );
}

interface TextAreaInputProps {
  path: string;
  label: ReactNode;
  hideLabel?: boolean;
  hint?: ReactNode;
  className?: string;
  rows?: number;
  mono?: boolean;
  placeholder?: string;
  extra?: string | null;
  /** Called with the textarea element, e.g. to insert at the cursor. */
  inputRef?: (el: HTMLTextAreaElement | null) => void;
}

export function TextAreaInput({ path, label, hideLabel, hint, className, rows = 3, mono, placeholder, extra, inputRef }: TextAreaInputProps) {
  const { control } = useFormContext();
  const { readOnly } = useEditor();
  const { field } = useController({ name: path, control });
  return (
    <FieldShell path={path} label={label} hideLabel={hideLabel} hint={hint} className={className} extra={extra}>
      {({ id, invalid, describedBy }) => (
        <textarea
          id={id}
          ref={(el) => {
            field.ref(el);
            inputRef?.(el);
          }}
          name={field.name}
          rows={rows}
          value={typeof field.value === 'string' ? field.value : ''}
          readOnly={readOnly}
          placeholder={placeholder}
          spellCheck={mono ? false : undefined}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          onChange={(e) => field.onChange(e.target.value)}
          onBlur={field.onBlur}
          className={controlClasses(invalid, cx('px-2 py-1.5 text-sm', mono && 'num'))}
        />
      )}
    </FieldShell>
  );
}

export interface Choice<V> {
  value: V;
  label: string;
}

interface SelectInputProps<V> {
  path: string;
  label: ReactNode;
  hideLabel?: boolean;
  hint?: ReactNode;
  className?: string;
  choices: readonly Choice<V>[];
  dense?: boolean;
  /** Called instead of a plain set, e.g. to reshape a distribution when its type changes. */
  onPick?: (value: V) => void;
}

/** A select over typed values (numbers such as +1/−1 survive the round trip through option strings). */
export function SelectInput<V extends string | number>({ path, label, hideLabel, hint, className, choices, dense = true, onPick }: SelectInputProps<V>) {
  const { control } = useFormContext();
  const { readOnly } = useEditor();
  const { field } = useController({ name: path, control });
  const index = choices.findIndex((c) => c.value === field.value);
  return (
    <FieldShell path={path} label={label} hideLabel={hideLabel} hint={hint} className={className}>
      {({ id, invalid, describedBy }) => (
        <div className="relative">
          <select
            id={id}
            ref={field.ref}
            name={field.name}
            value={index < 0 ? '' : String(index)}
            disabled={readOnly}
            aria-invalid={invalid || undefined}
            aria-describedby={describedBy}
            onChange={(e) => {
              const c = choices[Number(e.target.value)];
              if (!c) return;
              if (onPick) onPick(c.value);
              else field.onChange(c.value);
            }}
            onBlur={field.onBlur}
            className={controlClasses(invalid, cx('appearance-none pr-7', dense ? 'h-8 pl-2 text-sm' : 'h-10 pl-3'))}
          >
            {index < 0 ? <option value="">Choose…</option> : null}
            {choices.map((c, k) => (
              <option key={String(c.value)} value={String(k)}>
                {c.label}
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

interface NumberListInputProps {
  path: string;
  label: ReactNode;
  hideLabel?: boolean;
  hint?: ReactNode;
  className?: string;
  rows?: number;
}

/**
 * A row's key (its name in formulas and the handle other rows use). Renaming it carries the new key to the
 * correlation matrix, correlation groups and dial targets, unless another row already has that key.
 */
export function KeyInput(props: Omit<TextInputProps, 'mono' | 'onValueChange'>) {
  const { getValues, setValue } = useFormContext();
  return (
    <TextInput
      {...props}
      mono
      onValueChange={(prev, next) => {
        if (typeof prev !== 'string' || typeof next !== 'string' || !prev || !next || prev === next) return;
        const values = getValues();
        if (allIds(values).filter((x) => x === next).length > 1) return;
        for (const w of renameReferences(values, prev, next)) setValue(w.path, w.value, { shouldDirty: true });
      }}
    />
  );
}

/** A pasted list of numbers (measured data, empirical samples). Text that is not a number is named beside the box. */
export function NumberListInput({ path, label, hideLabel, hint, className, rows = 3 }: NumberListInputProps) {
  const { control } = useFormContext();
  const { readOnly, setLocal } = useEditor();
  const { field } = useController({ name: path, control });
  const toText = (v: unknown) => (Array.isArray(v) ? v.join('\n') : '');
  const [text, setText] = useState(() => toText(field.value));
  const [seen, setSeen] = useState<unknown>(field.value);
  const [problem, setProblem] = useState<string | null>(null);
  if (seen !== field.value) {
    setSeen(field.value);
    const parsed = parseNumberList(text);
    const same = Array.isArray(field.value) && parsed.bad.length === 0 && parsed.values.length === field.value.length && parsed.values.every((x, k) => x === (field.value as number[])[k]);
    if (!same && !problem) setText(toText(field.value));
  }
  // A list that goes away (another law picked, row removed) takes its local problem with it.
  useEffect(() => () => setLocal(path, null), [path, setLocal]);
  const count = Array.isArray(field.value) ? field.value.length : 0;
  return (
    <FieldShell
      path={path}
      label={label}
      hideLabel={hideLabel}
      className={className}
      extra={problem}
      hint={
        <>
          <span className="num">{count.toLocaleString('en-US')}</span> value{count === 1 ? '' : 's'}
          {hint ? <> · {hint}</> : null}
        </>
      }
    >
      {({ id, invalid, describedBy }) => (
        <textarea
          id={id}
          ref={field.ref}
          name={field.name}
          rows={rows}
          value={text}
          readOnly={readOnly}
          spellCheck={false}
          placeholder={'12.01\n11.98\n12.03'}
          aria-invalid={invalid || undefined}
          aria-describedby={describedBy}
          onChange={(e) => {
            setText(e.target.value);
            const parsed = parseNumberList(e.target.value);
            const msg = listProblem(parsed);
            setProblem(msg);
            setLocal(path, msg);
            setSeen(parsed.values);
            field.onChange(parsed.values);
          }}
          onBlur={field.onBlur}
          className={controlClasses(invalid, 'num px-2 py-1.5 text-sm')}
        />
      )}
    </FieldShell>
  );
}
