'use client';

import { useId, useRef, useState, type KeyboardEvent, type ReactNode } from 'react';
import { cx } from './cx';

export interface TabItem {
  id: string;
  label: ReactNode;
  content: ReactNode;
}

export interface TabsProps {
  /** Accessible name of the tab list, e.g. "Message body". */
  label: string;
  tabs: readonly TabItem[];
  defaultTab?: string;
  /** Controlled use: the selected tab id and its setter. */
  value?: string;
  onChange?: (id: string) => void;
  className?: string;
}

/** Tabs with the keyboard model people expect: arrows move between tabs, Home/End jump, Tab goes to the panel. */
export function Tabs({ label, tabs, defaultTab, value, onChange, className }: TabsProps) {
  const [inner, setInner] = useState(defaultTab ?? tabs[0]?.id);
  const selected = value ?? inner;
  const base = useId();
  const refs = useRef<Record<string, HTMLButtonElement | null>>({});

  function select(id: string, focus = false) {
    if (value === undefined) setInner(id);
    onChange?.(id);
    if (focus) refs.current[id]?.focus();
  }

  function onKeyDown(e: KeyboardEvent<HTMLDivElement>) {
    const i = tabs.findIndex((t) => t.id === selected);
    let next: number | null = null;
    if (e.key === 'ArrowRight') next = (i + 1) % tabs.length;
    else if (e.key === 'ArrowLeft') next = (i - 1 + tabs.length) % tabs.length;
    else if (e.key === 'Home') next = 0;
    else if (e.key === 'End') next = tabs.length - 1;
    if (next === null) return;
    e.preventDefault();
    select(tabs[next].id, true);
  }

  const active = tabs.find((t) => t.id === selected) ?? tabs[0];
  return (
    <div className={className}>
      <div role="tablist" aria-label={label} onKeyDown={onKeyDown} className="flex gap-1 overflow-x-auto border-b border-ink-200">
        {tabs.map((t) => {
          const on = t.id === active?.id;
          return (
            <button
              key={t.id}
              ref={(el) => {
                refs.current[t.id] = el;
              }}
              id={`${base}-tab-${t.id}`}
              type="button"
              role="tab"
              aria-selected={on}
              aria-controls={`${base}-panel-${t.id}`}
              tabIndex={on ? 0 : -1}
              onClick={() => select(t.id)}
              className={cx(
                '-mb-px border-b-2 px-3 py-2 text-sm font-medium whitespace-nowrap',
                on ? 'border-accent-700 text-ink-900' : 'border-transparent text-ink-600 hover:border-ink-300 hover:text-ink-800',
              )}
            >
              {t.label}
            </button>
          );
        })}
      </div>
      {active ? (
        <div role="tabpanel" id={`${base}-panel-${active.id}`} aria-labelledby={`${base}-tab-${active.id}`} tabIndex={0} className="pt-4">
          {active.content}
        </div>
      ) : null}
    </div>
  );
}
