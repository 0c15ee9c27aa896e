// A run's result arrives in steps (lib/core/engine/merge.ts mergeStaged): the headline figures, then the charts, then
// the drivers. Until a step lands, the parts it computes are shown from the previous result (flagged pending, so
// the view can dim them), which keeps charts in place instead of blanking them for a few milliseconds.
import type { RunResult } from '@/lib/core/engine/simulate';

/** `partial` with the parts not computed yet ('charts': charts and drivers; 'drivers': drivers) taken from `previous`. */
export function withEarlierParts(partial: RunResult, previous: RunResult | null, pending: 'charts' | 'drivers'): RunResult {
  if (!previous || previous.template !== partial.template) return partial;
  const before = new Map(previous.outputs.map((o) => [o.id, o]));
  const outputs = partial.outputs.map((o) => {
    const p = before.get(o.id);
    if (!p) return o;
    return pending === 'charts' ? { ...o, histogram: p.histogram, ecdf: p.ecdf, drivers: p.drivers } : { ...o, drivers: p.drivers };
  });
  let stack = partial.stack;
  if (stack && previous.stack) {
    const earlier = new Map(previous.stack.contributors.map((c) => [c.id, c]));
    stack = {
      ...stack,
      contributors: stack.contributors.map((c) => {
        const e = earlier.get(c.id);
        return e ? { ...c, spearman: e.spearman, monteCarloShare: e.monteCarloShare } : c;
      }),
    };
  }
  // Achieved correlations come with the drivers: keep the previous ones while the same inputs are correlated.
  const correlated = partial.inputs.filter((i) => i.correlated !== null).map((i) => i.id).sort().join(',');
  const earlier = previous.correlation.flatMap((c) => c.ids).sort().join(',');
  const correlation = partial.correlation.length === 0 && correlated === earlier ? previous.correlation : partial.correlation;
  return { ...partial, outputs, stack, correlation };
}
