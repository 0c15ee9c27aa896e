'use client';

import { useId, useState } from 'react';
import { cx } from '@/components/ui/cx';
import { dialDisplay, dialText, parseDialInput, type DialSpec } from '@/lib/core/widget/dial-values';

export interface DialControlProps {
  dial: DialSpec;
  value: number;
  onChange: (value: number) => void;
}

/**
 * One dial: a slider (arrows, Page keys, Home/End) and a number field for typing an exact value,
 * with the unit, the range and the author's value. A typed value is taken on Enter or when leaving the field.
 */
export function DialControl({ dial, value, onChange }: DialControlProps) {
  const id = useId().replace(/[^a-zA-Z0-9_-]/g, '');
  // What the viewer is typing; null shows the dial's current value (so the slider and resets show through).
  const [draft, setDraft] = useState<string | null>(null);
  const [error, setError] = useState<string | null>(null);
  const text = draft ?? dialText(dial, value);

  function commit() {
    if (draft === null) return;
    const r = parseDialInput(draft, dial);
    if (r.ok) {
      setError(null);
      setDraft(null);
      if (r.value !== value) onChange(r.value);
    } else setError(r.message);
  }

  function slide(v: number) {
    setDraft(null);
    setError(null);
    onChange(v);
  }

  const unit = dial.unit ? ` ${dial.unit}` : '';
  const changed = value !== dial.default;
  return (
    <div className="min-w-0">
      <div className="flex items-baseline justify-between gap-2">
        <label htmlFor={`${id}-range`} className="text-sm font-medium text-ink-900">
          {dial.label}
        </label>
        {changed ? <span className="text-xs text-ink-600">moved</span> : null}
      </div>
      <div className="mt-1 flex items-center gap-2">
        <input
          id={`${id}-range`}
          type="range"
          min={dial.min}
          max={dial.max}
          step={dial.step}
          value={value}
          aria-valuetext={`${dialDisplay(dial, value)}${unit}`}
          aria-describedby={`${id}-hint`}
          onChange={(e) => slide(Number(e.target.value))}
          className="h-8 min-w-0 flex-1 cursor-pointer"
          style={{ accentColor: 'var(--st-brand)' }}
        />
        <input
          id={`${id}-num`}
          type="text"
          inputMode="decimal"
          aria-label={`${dial.label}, exact value${dial.unit ? ` in ${dial.unit}` : ''}`}
          aria-invalid={error ? true : undefined}
          aria-describedby={error ? `${id}-err ${id}-hint` : `${id}-hint`}
          value={text}
          onChange={(e) => setDraft(e.target.value)}
          onBlur={commit}
          onKeyDown={(e) => {
            if (e.key === 'Enter') {
              e.preventDefault();
              commit();
            } else if (e.key === 'Escape') {
              setDraft(null);
              setError(null);
            }
          }}
          className={cx(
            'num h-9 w-24 flex-none rounded-md border bg-white px-2 text-right text-sm text-ink-900 shadow-sm',
            error ? 'border-danger-600 ring-1 ring-danger-600' : 'border-ink-400 hover:border-ink-500',
          )}
        />
        {/* The unit slot keeps every dial's slider the same length, with or without a unit. */}
        <span className="w-10 flex-none text-sm text-ink-700">{dial.unit}</span>
      </div>
      {error ? (
        <p id={`${id}-err`} role="alert" className="mt-1 text-[0.8125rem] font-medium text-danger-700">
          {error}
        </p>
      ) : null}
      <p id={`${id}-hint`} className="mt-0.5 text-xs text-ink-600">
        <span className="num">
          {dialDisplay(dial, dial.min)} to {dialDisplay(dial, dial.max)}
          {unit}
        </span>{' '}
        · author’s value <span className="num">{dialDisplay(dial, dial.default)}</span>
      </p>
    </div>
  );
}
