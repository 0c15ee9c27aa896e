// Field-level comparison of two saved models, for the checker's side-by-side view. Pure: no React, no server.
//
// Lists of records that carry a string `id` (inputs, contributors, line items, risks, dials...) are matched by id,
// so inserting or reordering one row does not show every later row as changed.

export type DiffKind = 'added' | 'removed' | 'changed' | 'reordered';

export interface DiffEntry {
  kind: DiffKind;
  /** Path into the model as the engine schema and API error messages name it, e.g. "inputs.2.low". */
  path: string;
  /** Path into the previous version (differs from `path` when a row moved); null when added. */
  beforePath: string | null;
  /** Readable location using the rows' names, e.g. "contributors › Shaft shoulder › plus tolerance". */
  label: string;
  before: unknown;
  after: unknown;
}

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };
type Seg = { key: string | number; label: string };

const isObject = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);

function rowName(v: unknown): string | null {
  if (!isObject(v)) return null;
  for (const k of ['name', 'label', 'title', 'id']) {
    const s = v[k];
    if (typeof s === 'string' && s.trim()) return s.trim();
  }
  return null;
}

/** "plusTol" → "plus tol", "sampling_design" → "sampling design". */
export function humanKey(key: string): string {
  return key
    .replace(/_/g, ' ')
    .replace(/([a-z0-9])([A-Z])/g, '$1 $2')
    .toLowerCase();
}

function keyedById(list: unknown[]): Map<string, number> | null {
  if (!list.length) return null;
  const map = new Map<string, number>();
  for (let i = 0; i < list.length; i++) {
    const item = list[i];
    if (!isObject(item) || typeof item.id !== 'string' || map.has(item.id)) return null;
    map.set(item.id, i);
  }
  return map;
}

function sameJson(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (typeof a === 'number' && typeof b === 'number') return Number.isNaN(a) && Number.isNaN(b);
  if (Array.isArray(a) && Array.isArray(b)) return a.length === b.length && a.every((x, i) => sameJson(x, b[i]));
  if (isObject(a) && isObject(b)) {
    const ka = Object.keys(a).filter((k) => a[k] !== undefined);
    const kb = Object.keys(b).filter((k) => b[k] !== undefined);
    return ka.length === kb.length && ka.every((k) => Object.prototype.hasOwnProperty.call(b, k) && sameJson(a[k], b[k]));
  }
  return false;
}

const join = (segs: Seg[]) => segs.map((s) => String(s.key)).join('.');
const labelOf = (segs: Seg[]) => segs.map((s) => s.label).join(' › ') || 'model';

/**
 * Every difference between `before` (the previous version, or null for a first version) and `after`,
 * at the deepest level where they differ. Scalars and arrays of scalars are compared as whole values.
 */
export function diffModels(before: unknown, after: unknown): DiffEntry[] {
  const out: DiffEntry[] = [];
  walk(before as Json, after as Json, [], [], out);
  return out;
}

function walk(a: Json | undefined, b: Json | undefined, pathB: Seg[], pathA: Seg[], out: DiffEntry[]): void {
  if (a === undefined && b === undefined) return;
  if (a === undefined) {
    out.push({ kind: 'added', path: join(pathB), beforePath: null, label: labelOf(pathB), before: undefined, after: b });
    return;
  }
  if (b === undefined) {
    out.push({ kind: 'removed', path: join(pathA), beforePath: join(pathA), label: labelOf(pathA), before: a, after: undefined });
    return;
  }
  if (isObject(a) && isObject(b)) {
    const keys = [...new Set([...Object.keys(a), ...Object.keys(b)])];
    for (const k of keys) {
      const seg = { key: k, label: humanKey(k) };
      walk(a[k] as Json | undefined, b[k] as Json | undefined, [...pathB, seg], [...pathA, seg], out);
    }
    return;
  }
  if (Array.isArray(a) && Array.isArray(b)) {
    const ka = keyedById(a);
    const kb = keyedById(b);
    if (ka && kb) {
      walkKeyed(a, b, ka, kb, pathB, pathA, out);
      return;
    }
    const structured = a.some((x) => isObject(x) || Array.isArray(x)) || b.some((x) => isObject(x) || Array.isArray(x));
    if (structured) {
      const n = Math.max(a.length, b.length);
      for (let i = 0; i < n; i++) {
        const name = rowName(b[i]) ?? rowName(a[i]) ?? `#${i + 1}`;
        walk(a[i], b[i], [...pathB, { key: i, label: name }], [...pathA, { key: i, label: name }], out);
      }
      return;
    }
  }
  if (!sameJson(a, b)) out.push({ kind: 'changed', path: join(pathB), beforePath: join(pathA), label: labelOf(pathB), before: a, after: b });
}

function walkKeyed(a: Json[], b: Json[], ka: Map<string, number>, kb: Map<string, number>, pathB: Seg[], pathA: Seg[], out: DiffEntry[]): void {
  // Rows in the new order first, then rows that were removed.
  for (const [id, ib] of kb) {
    const ia = ka.get(id);
    const name = rowName(b[ib]) ?? id;
    const segB = [...pathB, { key: ib, label: name }];
    if (ia === undefined) {
      out.push({ kind: 'added', path: join(segB), beforePath: null, label: labelOf(segB), before: undefined, after: b[ib] });
      continue;
    }
    walk(a[ia], b[ib], segB, [...pathA, { key: ia, label: rowName(a[ia]) ?? id }], out);
  }
  for (const [id, ia] of ka) {
    if (kb.has(id)) continue;
    const segA = [...pathA, { key: ia, label: rowName(a[ia]) ?? id }];
    out.push({ kind: 'removed', path: join(segA), beforePath: join(segA), label: labelOf(segA), before: a[ia], after: undefined });
  }
  // The order of the rows that stayed.
  const keptA = [...ka.keys()].filter((id) => kb.has(id));
  const keptB = [...kb.keys()].filter((id) => ka.has(id));
  if (keptA.some((id, i) => keptB[i] !== id)) {
    out.push({ kind: 'reordered', path: join(pathB), beforePath: join(pathA), label: labelOf(pathB), before: keptA, after: keptB });
  }
}

/** Counts by kind, for the check page's summary line. */
export function summarise(entries: readonly DiffEntry[]): Record<DiffKind, number> {
  const s: Record<DiffKind, number> = { added: 0, removed: 0, changed: 0, reordered: 0 };
  for (const e of entries) s[e.kind]++;
  return s;
}

/** Whether a path (as the API and the diff name it) lies at or under another path. */
export function pathWithin(path: string, prefix: string): boolean {
  return prefix === '' || path === prefix || path.startsWith(`${prefix}.`);
}

/** A cell value as a short, exact text: numbers in full, lists inline, records as compact JSON. */
export function formatDiffValue(v: unknown): string {
  if (v === undefined) return '—';
  if (v === null) return 'null';
  if (typeof v === 'number') return String(v);
  if (typeof v === 'string') return `“${v}”`;
  if (typeof v === 'boolean') return v ? 'yes' : 'no';
  if (Array.isArray(v) && v.every((x) => typeof x === 'number' || typeof x === 'string')) {
    const s = v.join(', ');
    return s.length > 160 ? `${v.length} values: ${s.slice(0, 150)}…` : `[${s}]`;
  }
  const s = JSON.stringify(v);
  return s.length > 200 ? `${s.slice(0, 190)}…` : s;
}
