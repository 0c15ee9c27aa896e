'use client';

import { useCallback, useRef, useState } from 'react';

/**
 * Width of an element, kept current with a ResizeObserver. Before the first measurement (and during
 * server rendering) it reports `fallback`, and the chart's SVG scales to fit until it is redrawn.
 */
export function useElementWidth<T extends HTMLElement = HTMLDivElement>(fallback = 640): [(el: T | null) => void, number] {
  const [width, setWidth] = useState(fallback);
  const observer = useRef<ResizeObserver | null>(null);
  const ref = useCallback((el: T | null) => {
    observer.current?.disconnect();
    observer.current = null;
    if (!el) return;
    const measure = (w: number) => {
      // Whole pixels, and ignore sub-pixel jitter so charts do not redraw for nothing.
      const next = Math.max(240, Math.floor(w));
      setWidth((prev) => (Math.abs(prev - next) >= 1 ? next : prev));
    };
    measure(el.getBoundingClientRect().width || fallback);
    if (typeof ResizeObserver !== 'undefined') {
      observer.current = new ResizeObserver((entries) => {
        const w = entries[0]?.contentRect.width;
        if (w) measure(w);
      });
      observer.current.observe(el);
    }
  }, [fallback]);
  return [ref, width];
}
