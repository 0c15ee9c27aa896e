'use client';

import { useCallback, useEffect, useId, useLayoutEffect, useRef, useState, type ReactNode } from 'react';

/** Short explanations in Stochos's own words for trade terms that appear beside numbers. */
export const GLOSSARY = {
  'worst case': 'Every contributor at the tolerance limit that hurts most, all at once. Safe, but usually far more pessimistic than real production.',
  RSS: 'Root sum of squares: the contributors’ variations combined as independent random spreads, σ = √(σ₁² + σ₂² + …). Assumes centred, normal, independent contributors.',
  'Monte Carlo': 'Draws every input many times from its distribution, runs the model for each draw, and reads the results off the spread of outcomes.',
  'Latin hypercube': 'A sampling plan that splits each input’s range into equal-probability strata and draws once from each, so fewer trials cover the range evenly (McKay, Beckman & Conover 1979).',
  Pp: 'Process performance: specification width divided by six overall standard deviations, (USL − LSL) / 6σ. Ignores where the mean sits.',
  Ppk: 'Process performance including centring: the distance from the mean to the nearer limit divided by three overall standard deviations. 1.33 is a common minimum.',
  'Pp/Ppk': 'Pp compares the specification width with the spread, (USL − LSL) / 6σ; Ppk also accounts for centring, using the nearer limit, min(USL − μ, μ − LSL) / 3σ. Both use the overall standard deviation of the simulated output.',
  'Cp/Cpk': 'Like Pp/Ppk, but from short-term (within-subgroup) variation of a running process. Stochos reports Pp/Ppk because a simulation gives overall variation.',
  ppm: 'Parts per million: how many assemblies in a million are expected outside the specification limits.',
  P50: 'The value with a 50 % chance of not being exceeded: the median outcome.',
  P80: 'The value with an 80 % chance of not being exceeded. Often used to set a budget with contingency.',
  P90: 'The value with a 90 % chance of not being exceeded: a cautious figure for a budget or a gap.',
  'S-curve': 'The cumulative distribution: for each value, the probability that the outcome is at or below it. Percentiles such as P80 are read off it.',
  contingency: 'The amount added to the base estimate to reach a chosen confidence, e.g. P80 minus the base estimate.',
  'three-point estimate': 'A low, a most likely and a high value for one uncertain quantity, from which a distribution such as beta-PERT or triangular is built.',
  seed: 'The starting number of the random sequence. The same model, dial values, seed and trial count always give identical results.',
  trials: 'How many times the model is evaluated with fresh random draws. More trials narrow the uncertainty of the estimated percentiles.',
} as const;

export type GlossaryTerm = keyof typeof GLOSSARY;

export interface TermProps {
  /** A glossary entry; its explanation is used unless `explain` is given. */
  term?: GlossaryTerm;
  /** A custom explanation. */
  explain?: ReactNode;
  /** The visible text (defaults to the term itself). */
  children?: ReactNode;
}

/**
 * A term with its explanation, shown on hover and on keyboard focus (and on tap). Escape hides it.
 * The explanation is also the element's accessible description.
 */
export function Term({ term, explain, children }: TermProps) {
  const text = explain ?? (term ? GLOSSARY[term] : null);
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

  if (!text) return <>{children ?? term}</>;

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
        {children ?? term}
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
