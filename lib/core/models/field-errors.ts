// Server field messages for a model arrive under the request's "model" key ("model.items.0.low"); the editor
// names its fields from the model's root ("items.0.low"). Messages about the model as a whole go to "_".
export function editorFieldErrors(fields: Record<string, string[]>): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [k, v] of Object.entries(fields)) {
    if (k === 'model') (out._ ??= []).push(...v);
    else if (k.startsWith('model.')) out[k.slice('model.'.length)] = v;
  }
  return out;
}
