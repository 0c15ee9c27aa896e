/**
 * Dials: author-chosen parameters a viewer may move. applyDials writes each dial's value
 * (the viewer's, else the dial's default) into a copy of the model and validates the
 * result, so a run always sees a consistent model. A dial's default is therefore the
 * value the model runs with until a viewer moves it: it overrides the value stored at
 * the dial's target (an editor should keep the two in step).
 */
import { ModelValidationError, type ModelIssue } from './errors';
import { resolveDialTarget } from './model-paths';
import type { StochosModel, ValidationResult } from './schema';

export interface AppliedDials {
  model: StochosModel;
  /** The value used for every dial (given or default). */
  values: Record<string, number>;
  /** Dials of kind 'variable': names usable in formulas. */
  variables: Record<string, number>;
}

function setPath(obj: unknown, path: (string | number)[], value: number): void {
  let cur = obj as Record<string | number, unknown>;
  for (let i = 0; i < path.length - 1; i++) cur = cur[path[i]] as Record<string | number, unknown>;
  cur[path[path.length - 1]] = value;
}

/** A model check (the schema's validateModel), or null for a model the server has already checked. */
export type ModelCheck = ((input: unknown) => ValidationResult) | null;

/**
 * Write the dial values into a copy of the model, then check the result with `check`
 * (null: no check, for a published model whose dial values are range-checked here).
 */
export function setDials(model: StochosModel, dialValues: Record<string, number>, check: ModelCheck): AppliedDials {
  const issues: ModelIssue[] = [];
  const dials = model.dials ?? [];
  for (const id of Object.keys(dialValues)) {
    if (!dials.some((d) => d.id === id)) issues.push({ path: ['dialValues', id], message: `No dial has the id '${id}'.` });
  }
  const copy = structuredClone(model) as StochosModel;
  const values: Record<string, number> = {};
  const variables: Record<string, number> = {};
  dials.forEach((dial, i) => {
    const given = Object.prototype.hasOwnProperty.call(dialValues, dial.id) ? dialValues[dial.id] : undefined;
    const v = given ?? dial.default;
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      issues.push({ path: ['dialValues', dial.id], message: `The value for dial '${dial.label}' must be a finite number.` });
      return;
    }
    const slack = 1e-9 * (dial.max - dial.min);
    if (v < dial.min - slack || v > dial.max + slack) {
      issues.push({ path: ['dialValues', dial.id], message: `The value ${v} for dial '${dial.label}' is outside its range ${dial.min} to ${dial.max}.` });
      return;
    }
    values[dial.id] = v;
    const target = resolveDialTarget(copy, dial.target, dial.id);
    if (typeof target === 'string') {
      issues.push({ path: ['dials', i, 'target'], message: target });
      return;
    }
    if (dial.target.kind === 'variable') {
      variables[dial.id] = v;
      return;
    }
    setPath(copy, target.path, v);
    if (dial.target.kind === 'correlation') {
      const p = target.path;
      setPath(copy, [p[0], p[1], p[3], p[2]], v);
    }
  });
  if (issues.length) throw new ModelValidationError(issues);
  if (!check) return { model: copy, values, variables };
  const checked = check(copy);
  if (!checked.ok) {
    const dialNote = dials.length ? ' (with the dial values applied)' : '';
    throw new ModelValidationError(checked.issues.map((iss) => ({ path: iss.path, message: iss.message + dialNote })));
  }
  return { model: checked.model, values, variables };
}
