// Decodes Stripe-style form bodies and query strings: `metadata[firm_id]=f1`,
// `line_items[0][price]=price_x`, `expand[]=subscription`, `expand[0]=subscription`.
// Values stay strings; objects whose keys are all array indices become arrays.

export type FormValue = string | FormValue[] | { [key: string]: FormValue };
export type FormObject = { [key: string]: FormValue };

function decode(part: string): string {
  try {
    return decodeURIComponent(part.replace(/\+/g, ' '));
  } catch {
    return part;
  }
}

function splitKey(raw: string): string[] {
  const first = raw.indexOf('[');
  if (first <= 0) return [raw];
  const segments = [raw.slice(0, first)];
  const re = /\[([^\]]*)\]/g;
  let m: RegExpExecArray | null;
  while ((m = re.exec(raw.slice(first))) !== null) segments.push(m[1]);
  return segments;
}

const APPEND = '\u0000append';

export function parseForm(input: string): FormObject {
  const root: Record<string, unknown> = {};
  if (!input) return {};
  for (const pair of input.split('&')) {
    if (!pair) continue;
    const eq = pair.indexOf('=');
    const key = decode(eq < 0 ? pair : pair.slice(0, eq));
    const value = eq < 0 ? '' : decode(pair.slice(eq + 1));
    const path = splitKey(key).map((s) => (s === '' ? APPEND : s));
    let node = root;
    for (let i = 0; i < path.length; i += 1) {
      let seg = path[i];
      if (seg === APPEND) {
        // `a[]` appends: use the next free numeric index.
        seg = String(Object.keys(node).filter((k) => /^\d+$/.test(k)).length);
      }
      if (seg === '__proto__' || seg === 'constructor' || seg === 'prototype') break;
      if (i === path.length - 1) {
        node[seg] = value;
      } else {
        const next = node[seg];
        if (typeof next !== 'object' || next === null) node[seg] = {};
        node = node[seg] as Record<string, unknown>;
      }
    }
  }
  return toArrays(root) as FormObject;
}

function toArrays(value: unknown): FormValue {
  if (typeof value !== 'object' || value === null) return value as string;
  const obj = value as Record<string, unknown>;
  const keys = Object.keys(obj);
  if (keys.length > 0 && keys.every((k) => /^\d+$/.test(k))) {
    return keys
      .map(Number)
      .sort((a, b) => a - b)
      .map((k) => toArrays(obj[String(k)]));
  }
  const out: FormObject = {};
  for (const k of keys) out[k] = toArrays(obj[k]);
  return out;
}
