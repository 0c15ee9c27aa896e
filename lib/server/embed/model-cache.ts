import 'server-only';
import { storedModel } from '@/db/models';
import { getVersionModelJson } from '@/db/widgets';
import type { CheckedModel } from '@/lib/core/engine/checked-model';

// A published version's model never changes (the database refuses updates to model_versions.model_json), so the
// embed path parses it once per version and keeps both the object and its compact JSON text for the payload.
// Bounded: least recently used versions leave first. The objects are frozen: callers share them.

const MAX_VERSIONS = 256;
const byVersion = new Map<string, { model: CheckedModel; json: string }>();
const jsonOf = new WeakMap<object, string>();

function deepFreeze<T>(v: T): T {
  if (v && typeof v === 'object' && !Object.isFrozen(v)) {
    Object.freeze(v);
    for (const x of Object.values(v)) deepFreeze(x);
  }
  return v;
}

/** The parsed model of a version (null when the firm has no such version). */
export async function versionModel(firmId: string, versionId: string): Promise<CheckedModel | null> {
  const key = `${firmId}:${versionId}`;
  const hit = byVersion.get(key);
  if (hit) {
    // Re-insert: Map order is insertion order, so the first key is the least recently used.
    byVersion.delete(key);
    byVersion.set(key, hit);
    return hit.model;
  }
  const text = await getVersionModelJson(firmId, versionId);
  if (text === null) return null;
  const model = deepFreeze(storedModel(text));
  const json = JSON.stringify(model);
  jsonOf.set(model, json);
  byVersion.set(key, { model, json });
  if (byVersion.size > MAX_VERSIONS) byVersion.delete(byVersion.keys().next().value!);
  return model;
}

/** Compact JSON of a model: from the cache when it came from `versionModel`, else serialised now. */
export function modelJson(model: CheckedModel): string {
  return jsonOf.get(model) ?? JSON.stringify(model);
}
