// Pure helpers that put every validation message on one flat map keyed by dotted path
// ("contributors.2.plusTol"), the same keys the server's 422 uses (lib/server/http/errors.ts fieldsFromZod),
// so client, server and import messages are shown beside the same field.

import type { ModelIssue } from '@/lib/core/engine/errors';
import type { FieldErrors as FieldMessages } from '@/lib/core/api-types';

export type { FieldMessages };

/** Dotted key of an issue path; the whole model is "_" (as in the server's 422). */
export function pathKey(path: readonly (string | number)[]): string {
  return path.length ? path.map(String).join('.') : '_';
}

function push(map: FieldMessages, key: string, message: string): void {
  const list = (map[key] ??= []);
  if (!list.includes(message)) list.push(message);
}

/** Engine issues (path arrays) → flat map. */
export function issuesToMessages(issues: readonly ModelIssue[]): FieldMessages {
  const out: FieldMessages = {};
  for (const issue of issues) push(out, pathKey(issue.path), issue.message);
  return out;
}

/** Merges maps; messages already present at a key are not repeated. */
export function mergeMessages(...maps: (FieldMessages | null | undefined)[]): FieldMessages {
  const out: FieldMessages = {};
  for (const m of maps) {
    if (!m) continue;
    for (const [k, list] of Object.entries(m)) for (const msg of list) push(out, k, msg);
  }
  return out;
}

interface ErrorNode {
  message?: unknown;
  type?: unknown;
  types?: Record<string, unknown>;
  ref?: unknown;
  root?: ErrorNode;
  [key: string]: unknown;
}

const RESERVED = new Set(['message', 'type', 'types', 'ref', 'root']);

/**
 * react-hook-form's nested error tree → flat map. Handles `root` (errors on a field array as a whole),
 * `types` (every message of a path when criteriaMode is 'all') and array indices.
 */
export function flattenFieldErrors(tree: unknown, prefix: string[] = [], out: FieldMessages = {}): FieldMessages {
  if (!tree || typeof tree !== 'object') return out;
  const node = tree as ErrorNode;
  const key = pathKey(prefix);
  if (typeof node.message === 'string' && node.message) push(out, key, node.message);
  if (node.types && typeof node.types === 'object') {
    for (const v of Object.values(node.types)) {
      if (typeof v === 'string' && v) push(out, key, v);
      else if (Array.isArray(v)) for (const s of v) if (typeof s === 'string' && s) push(out, key, s);
    }
  }
  if (node.root && typeof node.root === 'object') flattenFieldErrors(node.root, prefix, out);
  for (const [k, child] of Object.entries(node)) {
    if (RESERVED.has(k) || !child || typeof child !== 'object') continue;
    flattenFieldErrors(child, [...prefix, k], out);
  }
  return out;
}

/** True when `a` is `b`, or one is an ancestor of the other ("items.2" and "items.2.low"). */
export function pathsOverlap(a: string, b: string): boolean {
  return a === b || a.startsWith(b + '.') || b.startsWith(a + '.');
}

/**
 * Server messages stay beside their field until that field (or an ancestor or descendant) changes;
 * editing a row, or adding or removing rows of a list, clears what the server said about them.
 */
export function withoutChanged(server: FieldMessages, changed: string): FieldMessages {
  const out: FieldMessages = {};
  for (const [k, v] of Object.entries(server)) if (!pathsOverlap(k, changed)) out[k] = v;
  return out;
}

/** Messages at `key` exactly. */
export function messagesAt(map: FieldMessages, key: string): string[] {
  return map[key] ?? [];
}

/** Messages at `key` or below it (for a row or group summary). */
export function messagesUnder(map: FieldMessages, key: string): { key: string; message: string }[] {
  const out: { key: string; message: string }[] = [];
  for (const [k, list] of Object.entries(map)) if (k === key || k.startsWith(key + '.')) for (const m of list) out.push({ key: k, message: m });
  return out;
}

/** How a path reads to a person: "contributors.2.plusTol" → "Contributor 3 › plus tolerance". */
const SEGMENT_LABELS: Record<string, string> = {
  contributors: 'Contributor',
  items: 'Line item',
  riskEvents: 'Risk',
  correlationGroups: 'Correlation group',
  inputs: 'Input',
  outputs: 'Output',
  dials: 'Dial',
  points: 'Point',
  data: 'Value',
  values: 'Value',
  probabilities: 'Probability',
  matrix: 'Row',
};

const FIELD_LABELS: Record<string, string> = {
  plusTol: 'plus tolerance',
  minusTol: 'minus tolerance',
  meanShift: 'mean shift',
  mostLikely: 'most likely',
  baseEstimate: 'base estimate',
  sd: 'standard deviation',
  rho: 'correlation',
  trials: 'trials',
  _: 'model',
};

export function readablePath(key: string): string {
  if (key === '_') return 'Model';
  const parts = key.split('.');
  const out: string[] = [];
  for (let i = 0; i < parts.length; i++) {
    const p = parts[i];
    const next = parts[i + 1];
    if (SEGMENT_LABELS[p] && next !== undefined && /^\d+$/.test(next)) {
      out.push(`${SEGMENT_LABELS[p]} ${Number(next) + 1}`);
      i++;
    } else if (/^\d+$/.test(p)) {
      out.push(`#${Number(p) + 1}`);
    } else {
      out.push(FIELD_LABELS[p] ?? p.replace(/([a-z])([A-Z])/g, '$1 $2').toLowerCase());
    }
  }
  const s = out.join(' › ');
  return s.charAt(0).toUpperCase() + s.slice(1);
}
