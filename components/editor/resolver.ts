// The editor's react-hook-form resolver: the engine's own model schema through @hookform/resolvers/zod (so the
// browser says exactly what the server's 422 says), plus the whole-model checks the schema runs only once the
// structure is sound (so an unknown name in a formula is flagged even while another field is still wrong), plus
// validateModel's last check that each distribution can be sampled. No React: usable in unit tests.

import { zodResolver } from '@hookform/resolvers/zod';
import { get, set, type FieldError, type FieldErrors, type Resolver, type ResolverOptions } from 'react-hook-form';
import { modelSchema, semanticIssues, validateModel, type CheckedModel, type StochosModel } from '@/lib/core/engine/schema';
import type { ModelDraft } from './form-values';
import type { ModelIssue } from '@/lib/core/engine/errors';

function addIssue(errors: FieldErrors, issue: ModelIssue): void {
  const path = issue.path.map(String).join('.');
  if (!path) {
    const root = (errors.root ??= {} as FieldError) as FieldError & { types?: Record<string, string | string[]> };
    if (!root.message) Object.assign(root, { type: 'custom', message: issue.message });
    return;
  }
  const existing = get(errors, path) as (FieldError & { root?: FieldError; types?: Record<string, unknown> }) | undefined;
  if (!existing) {
    set(errors, path, { type: 'custom', message: issue.message });
  } else if (!existing.message && !existing.root) {
    // A list or object whose children already carry problems: keep this one as its root message.
    existing.root = { type: 'custom', message: issue.message };
  } else if (existing.message !== issue.message) {
    const types = (existing.types ??= {}) as Record<string, unknown>;
    const prev = types.semantic;
    types.semantic = Array.isArray(prev) ? [...prev, issue.message] : typeof prev === 'string' ? [prev, issue.message] : issue.message;
  }
}

/**
 * Builds the resolver. `onResult` receives the validated model (defaults applied) when the draft is valid, else
 * null, and the error tree just computed (react-hook-form's formState snapshot can lag a render behind).
 */
export function createModelResolver(onResult?: (model: CheckedModel | null, errors: FieldErrors<ModelDraft>) => void): Resolver<ModelDraft, unknown, CheckedModel> {
  // The schema parses any input; the draft's fields are the schema's input fields, each possibly still missing.
  const base = zodResolver<ModelDraft, unknown, StochosModel>(modelSchema);
  return async (values, context, options: ResolverOptions<ModelDraft>) => {
    const result = await base(values, context, { ...options, criteriaMode: 'all' });
    const failed = Object.keys(result.errors).length > 0;
    if (!failed) {
      const checked = validateModel(result.values);
      if (checked.ok) {
        onResult?.(checked.model, {});
        return { values: checked.model, errors: {} };
      }
      const errors: FieldErrors = {};
      for (const issue of checked.issues) addIssue(errors, issue);
      onResult?.(null, errors);
      return { values: {}, errors };
    }
    // Whole-model rules on a draft whose structure is still partly wrong; they are written to tolerate that.
    let extra: ModelIssue[] = [];
    try {
      extra = semanticIssues(values as StochosModel);
    } catch {
      extra = [];
    }
    if (!extra.length) {
      onResult?.(null, result.errors);
      return { values: {}, errors: result.errors };
    }
    const errors = structuredCloneErrors(result.errors);
    for (const issue of extra) addIssue(errors, issue);
    onResult?.(null, errors);
    return { values: {}, errors };
  };
}

/** Copies an error tree without the DOM refs react-hook-form attaches (refs cannot be cloned). */
function structuredCloneErrors(tree: FieldErrors): FieldErrors {
  const copy = (node: unknown): unknown => {
    if (!node || typeof node !== 'object') return node;
    const out: Record<string, unknown> = Array.isArray(node) ? ([] as unknown as Record<string, unknown>) : {};
    for (const [k, v] of Object.entries(node)) out[k] = k === 'ref' ? v : copy(v);
    return out;
  };
  return copy(tree) as FieldErrors;
}
