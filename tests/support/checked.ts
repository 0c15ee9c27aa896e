import { validateModel, type CheckedModel } from '@/lib/core/engine/schema';

/** A test's model through the schema, as every entry point does: a CheckedModel, or the first problem thrown. */
export function checked(model: unknown): CheckedModel {
  const r = validateModel(model);
  if (!r.ok) throw new Error(`The test model does not validate: ${r.issues[0]?.message ?? 'unknown problem'}`);
  return r.model;
}
