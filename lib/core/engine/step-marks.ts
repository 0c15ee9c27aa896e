// User Timing marks at the steps between an edit and its figures ('stochos:<step>'), read by profiles and by
// tests/e2e/studio-speed.spec.ts for its breakdown. Only the latest mark of each step is kept, so none pile up.
export type Step = 'edit-valid' | 'run-start' | 'parts-in' | 'headline';

export function markStep(step: Step): void {
  if (typeof performance === 'undefined' || typeof performance.mark !== 'function') return;
  const name = `stochos:${step}`;
  performance.clearMarks(name);
  performance.mark(name);
}
