'use client';

import { useCallback, useEffect, useId, useLayoutEffect, useRef, useState, type ReactNode } from 'react';

// The bubble behind Term, apart from the glossary, so that a page that explains one or two terms (the client
// widget's headline) does not carry every explanation.

/**
 * A term with its explanation, shown on hover and on keyboard focus (and on tap). Escape hides it.
 * The explanation is also the element's accessible description.
 */
export function TermTip({ explain: text, children }: { explain?: ReactNode; children: ReactNode }) {
  const [open, setOpen] = useState(false);
  const [shift, setShift] = useState(0);
  const tipId = useId();
  const tipRef = useRef<HTMLSpanElement>(null);
  const hideTimer = useRef<ReturnType<typeof setTimeout> | null>(null);

  const show = useCallback(() => {
    if (hideTimer.current) clearTimeout(hideTimer.current);
    setOpen(true);
  }, []);
  const hideSoon = useCallback(() => {
    if (hideTimer.current) clearTimeout(hideTimer.current);
    hideTimer.current = setTimeout(() => setOpen(false), 120);
  }, []);

  useEffect(() => () => {
    if (hideTimer.current) clearTimeout(hideTimer.current);
  }, []);

  // Keep the bubble inside the viewport on narrow screens.
  useLayoutEffect(() => {
    if (!open || !tipRef.current) {
      setShift(0);
      return;
    }
    const r = tipRef.current.getBoundingClientRect();
    const margin = 8;
    if (r.right > window.innerWidth - margin) setShift(window.innerWidth - margin - r.right);
    else if (r.left < margin) setShift(margin - r.left);
  }, [open]);

  useEffect(() => {
    if (!open) return;
    const onKey = (e: KeyboardEvent) => {
      if (e.key === 'Escape') setOpen(false);
    };
    document.addEventListener('keydown', onKey);
    return () => document.removeEventListener('keydown', onKey);
  }, [open]);

  if (!text) return <>{children}</>;

  return (
    <span className="relative inline-block" onMouseEnter={show} onMouseLeave={hideSoon}>
      <button
        type="button"
        aria-describedby={tipId}
        onFocus={show}
        onBlur={hideSoon}
        onClick={() => setOpen((o) => !o)}
        className="cursor-help border-b border-dotted border-current font-[inherit] text-inherit decoration-transparent"
      >
        {children}
      </button>
      <span
        ref={tipRef}
        id={tipId}
        role="tooltip"
        style={{ transform: `translateX(calc(-50% + ${shift}px))` }}
        className={
          'absolute top-full left-1/2 z-30 mt-2 w-max max-w-[min(18rem,calc(100vw-1rem))] rounded-md bg-ink-900 px-3 py-2 text-left text-[0.8125rem] leading-snug font-normal text-ink-50 shadow-lg ' +
          (open ? 'block' : 'hidden')
        }
      >
        {text}
      </span>
    </span>
  );
}
