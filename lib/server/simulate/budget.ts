// The work budget of a server-side run: trials × sampled columns (one column per sampled input). Pure: the request
// thread checks it before a run is queued, and the pool worker checks it again before allocating any column.

export interface RunWork {
  trials: number;
  /** Sampled columns: contributors (stack), line items plus two per risk event (cost), inputs (formula). */
  columns: number;
  work: number;
}

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const len = (v: unknown) => (Array.isArray(v) ? v.length : 0);

/** Work of a model as sent; null when its shape is too broken to count (the model's validation then says why). */
export function workOf(model: unknown): RunWork | null {
  if (!isObject(model) || !isObject(model.settings)) return null;
  const trials = model.settings.trials;
  if (typeof trials !== 'number' || !Number.isFinite(trials) || trials <= 0) return null;
  let columns: number;
  switch (model.template) {
    case 'linear-stack':
      columns = len(model.contributors);
      break;
    case 'cost-range':
      // A risk event samples whether it occurs and its impact: two columns (lib/core/engine/compile.ts).
      columns = len(model.items) + 2 * len(model.riskEvents);
      break;
    case 'formula':
      columns = len(model.inputs);
      break;
    default:
      return null;
  }
  columns = Math.max(1, columns);
  return { trials, columns, work: trials * columns };
}

/** The most trials a model with this many sampled columns may run under the budget. */
export function maxTrialsFor(columns: number, maxWork: number): number {
  return Math.floor(maxWork / Math.max(1, columns));
}

export function budgetMessage(w: RunWork, maxWork: number): string {
  const fmt = (n: number) => n.toLocaleString('en');
  return (
    `This run needs ${fmt(w.trials)} trials × ${fmt(w.columns)} sampled column${w.columns === 1 ? '' : 's'} = ${fmt(w.work)} draws; ` +
    `a server run may use at most ${fmt(maxWork)}. With ${fmt(w.columns)} column${w.columns === 1 ? '' : 's'}, set model.settings.trials to ${fmt(maxTrialsFor(w.columns, maxWork))} or fewer.`
  );
}
