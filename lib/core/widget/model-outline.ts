// What the widget reads from a model before it runs: the template and the dials a viewer may move. The model is a
// CheckedModel (a type only: the embed page loads neither zod nor the formula parser nor the matrix code): a
// published version was checked on the server when it was saved, so its fields are read as they are.
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import type { DialSpec } from './dial-values';

export type WidgetTemplate = CheckedModel['template'];

export interface ModelOutline {
  template: WidgetTemplate;
  dials: DialSpec[];
}

export function modelOutline(model: CheckedModel): ModelOutline {
  return {
    template: model.template,
    dials: model.dials.map((d) => ({ id: d.id, label: d.label, unit: d.unit, min: d.min, max: d.max, step: d.step, default: d.default })),
  };
}
