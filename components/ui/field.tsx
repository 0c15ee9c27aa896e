'use client';

import { useId, type ComponentProps, type ReactNode } from 'react';
import { cx } from './cx';

// Every input has a visible <label>, an optional hint and an error, all tied together with aria-describedby.

interface FieldChrome {
  label: ReactNode;
  hint?: ReactNode;
  error?: string;
  /** Hide the label visually (it stays for screen readers), e.g. a role select inside a table row. */
  hideLabel?: boolean;
  /** Classes for the wrapper. */
  className?: string;
  /** Width class of the control itself (default w-full), e.g. "w-28" for a currency code. */
  controlWidth?: string;
}

function useFieldIds(id: string | undefined, hint: ReactNode, error: string | undefined) {
  const auto = useId();
  const inputId = id ?? `f${auto.replace(/[^a-zA-Z0-9_-]/g, '')}`;
  const hintId = hint ? `${inputId}-hint` : undefined;
  const errorId = error ? `${inputId}-error` : undefined;
  const describedBy = [errorId, hintId].filter(Boolean).join(' ') || undefined;
  return { inputId, hintId, errorId, describedBy };
}

export function FieldError({ id, children }: { id?: string; children: ReactNode }) {
  return (
    <p id={id} className="mt-1.5 flex items-start gap-1.5 text-sm font-medium text-danger-700">
      <svg aria-hidden="true" viewBox="0 0 16 16" className="mt-0.5 h-3.5 w-3.5 flex-none">
        <path d="M8 1.5 15 14H1L8 1.5Z" fill="currentColor" />
        <path d="M8 6v3.5M8 11.3v.2" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
      <span>{children}</span>
    </p>
  );
}

function Label({ htmlFor, hidden, children }: { htmlFor: string; hidden?: boolean; children: ReactNode }) {
  return (
    <label htmlFor={htmlFor} className={hidden ? 'sr-only' : 'mb-1 block text-sm font-medium text-ink-800'}>
      {children}
    </label>
  );
}

function Hint({ id, children }: { id?: string; children: ReactNode }) {
  return (
    <p id={id} className="mt-1 text-[0.8125rem] leading-snug text-ink-600">
      {children}
    </p>
  );
}

export const controlClasses = (invalid: boolean, extra?: string, width = 'w-full') =>
  cx(
    width,
    'block rounded-md border bg-white px-3 text-ink-900 shadow-sm placeholder:text-ink-500',
    'disabled:cursor-not-allowed disabled:bg-ink-100 disabled:text-ink-600 read-only:bg-ink-50',
    invalid ? 'border-danger-600 ring-1 ring-danger-600' : 'border-ink-400 hover:border-ink-500',
    extra,
  );

export type TextFieldProps = FieldChrome &
  Omit<ComponentProps<'input'>, 'className'> & {
    inputClassName?: string;
    /** Something beside the input on the same line, e.g. a colour picker or a button. */
    after?: ReactNode;
  };

export function TextField({ label, hint, error, hideLabel, className, inputClassName, controlWidth, after, id, type = 'text', ...input }: TextFieldProps) {
  const ids = useFieldIds(id, hint, error);
  const control = (
    <input
      id={ids.inputId}
      type={type}
      aria-invalid={error ? true : undefined}
      aria-describedby={ids.describedBy}
      className={controlClasses(Boolean(error), cx('h-10', inputClassName), controlWidth)}
      {...input}
    />
  );
  return (
    <div className={className}>
      <Label htmlFor={ids.inputId} hidden={hideLabel}>
        {label}
      </Label>
      {after ? (
        <div className="flex items-center gap-2">
          {control}
          {after}
        </div>
      ) : (
        control
      )}
      {error ? <FieldError id={ids.errorId}>{error}</FieldError> : null}
      {hint ? <Hint id={ids.hintId}>{hint}</Hint> : null}
    </div>
  );
}

export type NumberFieldProps = Omit<TextFieldProps, 'after'> & { unit?: ReactNode };

/** Numbers in tabular mono figures, with the unit shown beside the value. */
export function NumberField({ label, hint, error, hideLabel, className, inputClassName, controlWidth, id, unit, type = 'number', ...input }: NumberFieldProps) {
  const ids = useFieldIds(id, hint, error);
  const unitId = unit ? `${ids.inputId}-unit` : undefined;
  return (
    <div className={className}>
      <Label htmlFor={ids.inputId} hidden={hideLabel}>
        {label}
      </Label>
      <div className="flex items-stretch">
        <input
          id={ids.inputId}
          type={type}
          inputMode={type === 'number' ? 'decimal' : undefined}
          step={type === 'number' ? 'any' : undefined}
          aria-invalid={error ? true : undefined}
          aria-describedby={[ids.describedBy, unitId].filter(Boolean).join(' ') || undefined}
          className={controlClasses(Boolean(error), cx('num h-10 text-right', unit ? 'rounded-r-none' : undefined, inputClassName), controlWidth)}
          {...input}
        />
        {unit ? (
          <span id={unitId} className="num inline-flex items-center rounded-r-md border border-l-0 border-ink-400 bg-ink-100 px-2.5 text-sm text-ink-700">
            {unit}
          </span>
        ) : null}
      </div>
      {error ? <FieldError id={ids.errorId}>{error}</FieldError> : null}
      {hint ? <Hint id={ids.hintId}>{hint}</Hint> : null}
    </div>
  );
}

export interface SelectOption {
  value: string;
  label: string;
  disabled?: boolean;
}

export type SelectProps = FieldChrome & Omit<ComponentProps<'select'>, 'className'> & { options: readonly SelectOption[]; selectClassName?: string };

export function Select({ label, hint, error, hideLabel, className, selectClassName, controlWidth, id, options, ...select }: SelectProps) {
  const ids = useFieldIds(id, hint, error);
  return (
    <div className={className}>
      <Label htmlFor={ids.inputId} hidden={hideLabel}>
        {label}
      </Label>
      <div className={cx('relative', controlWidth && controlWidth !== 'w-full' ? 'w-fit' : undefined)}>
        <select
          id={ids.inputId}
          aria-invalid={error ? true : undefined}
          aria-describedby={ids.describedBy}
          className={controlClasses(Boolean(error), cx('h-10 appearance-none pr-9', selectClassName), controlWidth)}
          {...select}
        >
          {options.map((o) => (
            <option key={o.value} value={o.value} disabled={o.disabled}>
              {o.label}
            </option>
          ))}
        </select>
        <svg aria-hidden="true" viewBox="0 0 16 16" className="pointer-events-none absolute top-1/2 right-3 h-4 w-4 -translate-y-1/2 text-ink-600">
          <path d="m4 6 4 4 4-4" fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
        </svg>
      </div>
      {error ? <FieldError id={ids.errorId}>{error}</FieldError> : null}
      {hint ? <Hint id={ids.hintId}>{hint}</Hint> : null}
    </div>
  );
}

export type CheckboxProps = Omit<FieldChrome, 'hideLabel' | 'controlWidth'> & Omit<ComponentProps<'input'>, 'className' | 'type'>;

export function Checkbox({ label, hint, error, className, id, ...input }: CheckboxProps) {
  const ids = useFieldIds(id, hint, error);
  return (
    <div className={className}>
      <div className="flex items-start gap-2.5">
        <input
          id={ids.inputId}
          type="checkbox"
          aria-invalid={error ? true : undefined}
          aria-describedby={ids.describedBy}
          className="mt-0.5 h-4.5 w-4.5 flex-none rounded border-ink-400 accent-accent-700 disabled:cursor-not-allowed"
          {...input}
        />
        <div className="min-w-0">
          <label htmlFor={ids.inputId} className="block text-sm font-medium text-ink-800">
            {label}
          </label>
          {hint ? <Hint id={ids.hintId}>{hint}</Hint> : null}
        </div>
      </div>
      {error ? <FieldError id={ids.errorId}>{error}</FieldError> : null}
    </div>
  );
}
