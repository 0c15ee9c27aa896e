/**
 * Dials with the model schema: applyDials writes the dial values into a copy of the model and
 * validates the result (set-dials.ts), so a run always sees a consistent model.
 */
import { validateModel, type StochosModel } from './schema';
import { setDials, type AppliedDials } from './set-dials';

export type { AppliedDials, ModelCheck } from './set-dials';

export function applyDials(model: StochosModel, dialValues: Record<string, number> = {}): AppliedDials {
  return setDials(model, dialValues, validateModel);
}
