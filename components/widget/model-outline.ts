// What the widget reads from a model before it runs: the template and the dials a viewer may move, read from the JSON
// as it is. No schema here, so the embed page's own bundle carries neither zod nor the formula parser nor the matrix
// code: a published version was checked on the server when it was saved, and the engine checks the model again where
// it runs (the web worker), reporting any problem as the run's error.
import type { DialSpec } from './dial-values';

export type WidgetTemplate = 'linear-stack' | 'cost-range' | 'formula';

export type ModelOutline = { ok: true; template: WidgetTemplate; dials: DialSpec[] } | { ok: false; problem: string };

const TEMPLATES: readonly string[] = ['linear-stack', 'cost-range', 'formula'];
const finite = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);

export function modelOutline(model: unknown): ModelOutline {
  if (typeof model !== 'object' || model === null || Array.isArray(model)) return { ok: false, problem: 'the model is not a JSON object' };
  const m = model as { template?: unknown; dials?: unknown };
  if (typeof m.template !== 'string' || !TEMPLATES.includes(m.template)) return { ok: false, problem: 'the model names no known template' };
  const dials: DialSpec[] = [];
  for (const d of Array.isArray(m.dials) ? (m.dials as Record<string, unknown>[]) : []) {
    if (!d || typeof d.id !== 'string' || !finite(d.min) || !finite(d.max) || !finite(d.step) || !finite(d.default) || !(d.min < d.max)) continue;
    dials.push({ id: d.id, label: typeof d.label === 'string' ? d.label : d.id, unit: typeof d.unit === 'string' ? d.unit : '', min: d.min, max: d.max, step: d.step, default: d.default });
  }
  return { ok: true, template: m.template as WidgetTemplate, dials };
}
