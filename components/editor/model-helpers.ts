// Pure helpers behind the editor's rows, distribution picker and dial picker (no React).

import { createMarginal, type DistributionSpec } from '@/lib/core/engine/distributions';
import { RESERVED_NAMES } from '@/lib/core/engine/formula';
import { DISTRIBUTION_PARAMS, resolveDialTarget, type DialTarget, type Distribution, type StochosModel } from '@/lib/core/engine/schema';
import type { DeepPartialSkipArrayKey } from 'react-hook-form';
import type { DialTargetDraft, ModelDraft } from './form-values';

// ---- Ids ---------------------------------------------------------------------------------------------------

/** An id (a name usable in formulas) from free text, not in `taken`: "Bearing A width" → "bearing_a_width". */
export function makeId(text: string, taken: Iterable<string>, fallback = 'item'): string {
  const used = new Set(taken);
  let base = text
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '_')
    .replace(/^_+|_+$/g, '')
    .slice(0, 40);
  if (!base) base = fallback;
  if (/^[0-9]/.test(base)) base = `${fallback}_${base}`;
  if (RESERVED_NAMES.has(base) || base === 'gap' || base === 'total') base = `${base}_1`;
  if (!used.has(base)) return base;
  for (let k = 2; ; k++) {
    const candidate = `${base}_${k}`;
    if (!used.has(candidate)) return candidate;
  }
}

/** Every id the model defines (rows of every list and dials), for uniqueness of new ones. */
export function allIds(model: Record<string, unknown>): string[] {
  const out: string[] = [];
  for (const key of ['contributors', 'items', 'riskEvents', 'correlationGroups', 'inputs', 'outputs', 'dials']) {
    const list = model[key];
    if (Array.isArray(list)) for (const row of list) if (row && typeof (row as { id?: unknown }).id === 'string') out.push((row as { id: string }).id);
  }
  return out;
}

// ---- Distribution picker -------------------------------------------------------------------------------------

/** What the picker offers; a truncated normal is a normal with bounds. */
export type DistributionKind = Distribution['type'] | 'truncated-normal';

export const DISTRIBUTION_KINDS: { value: DistributionKind; label: string }[] = [
  { value: 'normal', label: 'Normal' },
  { value: 'truncated-normal', label: 'Truncated normal' },
  { value: 'lognormal', label: 'Lognormal' },
  { value: 'uniform', label: 'Uniform' },
  { value: 'triangular', label: 'Triangular' },
  { value: 'pert', label: 'Beta-PERT' },
  { value: 'exponential', label: 'Exponential' },
  { value: 'weibull', label: 'Weibull' },
  { value: 'gamma', label: 'Gamma' },
  { value: 'discrete', label: 'Discrete values' },
  { value: 'bernoulli', label: 'Bernoulli (yes / no)' },
  { value: 'empirical', label: 'Empirical (pasted data)' },
  { value: 'drawn', label: 'Drawn density (points)' },
  { value: 'constant', label: 'Constant' },
];

export function distributionKind(value: object | null | undefined): DistributionKind | undefined {
  const d = value as { type?: unknown; min?: unknown; max?: unknown } | null | undefined;
  if (!d || typeof d.type !== 'string') return undefined;
  if (d.type === 'normal' && (typeof d.min === 'number' || typeof d.max === 'number')) return 'truncated-normal';
  return d.type as DistributionKind;
}

/** Four significant figures, so suggested parameters read cleanly. */
function nice(v: number): number {
  if (!Number.isFinite(v) || v === 0) return 0;
  return +v.toPrecision(4);
}

/** Centre and spread of a distribution, when it can be built; else null. */
export function centreAndSpread(d: unknown): { centre: number; spread: number } | null {
  try {
    const m = createMarginal(d as DistributionSpec);
    const centre = Number.isFinite(m.mean) ? m.mean : m.inv(0.5, 0.5);
    const spread = Number.isFinite(m.variance) && m.variance > 0 ? Math.sqrt(m.variance) : (m.upper - m.lower) / 6;
    if (!Number.isFinite(centre) || !Number.isFinite(spread)) return null;
    return { centre, spread: spread > 0 ? spread : Math.abs(centre) / 10 || 1 };
  } catch {
    return null;
  }
}

/**
 * A new distribution of `kind` with parameters suggested from the previous one's centre and spread, so switching
 * law keeps the input roughly where it was (the author then adjusts).
 */
export function reshapeDistribution(prev: unknown, kind: DistributionKind): Distribution {
  const cs = centreAndSpread(prev) ?? { centre: 0, spread: 1 };
  const c = nice(cs.centre);
  const s = nice(cs.spread) || 1;
  switch (kind) {
    case 'constant':
      return { type: 'constant', value: c };
    case 'normal':
      return { type: 'normal', mean: c, sd: s };
    case 'truncated-normal':
      return { type: 'normal', mean: c, sd: s, min: nice(c - 2 * s), max: nice(c + 2 * s) };
    case 'lognormal': {
      if (cs.centre > 0) {
        const cv = cs.spread / cs.centre;
        const sigma = Math.sqrt(Math.log(1 + cv * cv));
        return { type: 'lognormal', mu: nice(Math.log(cs.centre) - (sigma * sigma) / 2), sigma: nice(sigma) || 0.1 };
      }
      return { type: 'lognormal', mu: 0, sigma: 0.25 };
    }
    case 'uniform':
      return { type: 'uniform', min: nice(c - Math.sqrt(3) * s), max: nice(c + Math.sqrt(3) * s) };
    case 'triangular':
      return { type: 'triangular', min: nice(c - Math.sqrt(6) * s), mode: c, max: nice(c + Math.sqrt(6) * s) };
    case 'pert':
      return { type: 'pert', min: nice(c - 3 * s), mode: c, max: nice(c + 3 * s) };
    case 'exponential':
      return { type: 'exponential', rate: cs.centre > 0 ? nice(1 / cs.centre) : 1 };
    case 'weibull':
      // Shape 2: the mean is scale · Γ(1.5) ≈ 0.8862 · scale.
      return { type: 'weibull', shape: 2, scale: cs.centre > 0 ? nice(cs.centre / 0.886227) : 1 };
    case 'gamma': {
      // Matching moments: shape (mean / sd)², scale sd² / mean.
      if (cs.centre > 0) return { type: 'gamma', shape: nice((cs.centre / cs.spread) ** 2) || 1, scale: nice((cs.spread * cs.spread) / cs.centre) || 1 };
      return { type: 'gamma', shape: 2, scale: 1 };
    }
    case 'discrete':
      return { type: 'discrete', values: [nice(c - s), c, nice(c + s)], probabilities: [0.25, 0.5, 0.25] };
    case 'bernoulli':
      return { type: 'bernoulli', p: 0.5 };
    case 'empirical':
      return { type: 'empirical', data: [] };
    case 'drawn':
      return {
        type: 'drawn',
        points: [
          { x: nice(c - 2 * s), y: 0 },
          { x: c, y: 1 },
          { x: nice(c + 2 * s), y: 0 },
        ],
      };
  }
}

// ---- Dial picker ----------------------------------------------------------------------------------------------

export interface DialTargetOption {
  /** Stable text key of the target (for a <select>). */
  key: string;
  group: string;
  label: string;
  target: DialTarget;
  /** The model's value the dial starts from, when the target has one. */
  current: number | undefined;
  /** Hard bounds of the quantity (probabilities, correlations, confidence). */
  bounds?: [number, number];
}

/** A dial target's key, for a checked target or one in the draft (parts may still be missing). */
export function targetKey(t: DialTarget | DialTargetDraft | undefined | null): string {
  if (!t || typeof t !== 'object') return '';
  switch (t.kind) {
    case 'input-param':
      return `input-param:${t.inputId}:${t.param}`;
    case 'limit':
      return `limit:${t.which}:${t.outputId ?? ''}`;
    case 'group-correlation':
      return `group-correlation:${t.groupId}`;
    case 'correlation':
      return `correlation:${t.a}:${t.b}`;
    default:
      return t.kind ?? '';
  }
}

const PARAM_LABELS: Record<string, string> = {
  nominal: 'nominal',
  plusTol: 'plus tolerance',
  minusTol: 'minus tolerance',
  meanShift: 'mean shift',
  k: 'sigmas per tolerance (k)',
  low: 'low estimate',
  mostLikely: 'most likely estimate',
  high: 'high estimate',
  probability: 'probability',
  'impact.low': 'impact, low',
  'impact.mostLikely': 'impact, most likely',
  'impact.high': 'impact, high',
  mean: 'mean',
  sd: 'standard deviation',
  min: 'minimum / lower bound',
  max: 'maximum / upper bound',
  mode: 'most likely value',
  mu: 'mu (mean of ln X)',
  sigma: 'sigma (sd of ln X)',
  rate: 'rate',
  shape: 'shape',
  scale: 'scale',
  value: 'value',
  p: 'probability',
};

function valueAt(model: unknown, path: (string | number)[]): number | undefined {
  let cur: unknown = model;
  for (const p of path) {
    if (!cur || typeof cur !== 'object') return undefined;
    cur = (cur as Record<string | number, unknown>)[p];
  }
  return typeof cur === 'number' ? cur : undefined;
}

/** The editor's draft as watched (react-hook-form's view of it: every field optional). */
export type WatchedDraft = DeepPartialSkipArrayKey<ModelDraft>;

/**
 * Everything a dial could move in this model (a checked one or the draft being typed), grouped for a picker;
 * targets the engine would refuse are left out.
 */
export function dialTargetOptions(model: StochosModel | WatchedDraft): DialTargetOption[] {
  const out: DialTargetOption[] = [];
  const add = (group: string, label: string, target: DialTarget, bounds?: [number, number]) => {
    let resolved: ReturnType<typeof resolveDialTarget>;
    try {
      // The engine's resolver reads a draft too: a part still missing throws, and the target is left out.
      resolved = resolveDialTarget(model as StochosModel, target, '');
    } catch {
      return;
    }
    if (typeof resolved === 'string') return;
    out.push({ key: targetKey(target), group, label, target, current: resolved.path.length ? valueAt(model, resolved.path) : undefined, bounds });
  };
  const name = (row: { name?: unknown; id?: unknown }) => (typeof row.name === 'string' && row.name.trim() ? row.name : String(row.id ?? '?'));

  if (model.template === 'linear-stack') {
    for (const c of model.contributors ?? []) {
      if (!c || typeof c.id !== 'string') continue;
      for (const p of ['nominal', 'plusTol', 'minusTol', 'meanShift', 'k']) add(name(c), PARAM_LABELS[p], { kind: 'input-param', inputId: c.id, param: p });
    }
    add('Gap', 'lower limit', { kind: 'limit', which: 'lower' });
    add('Gap', 'upper limit', { kind: 'limit', which: 'upper' });
    const cids = model.correlation?.inputs ?? [];
    for (let i = 0; i < cids.length; i++)
      for (let j = i + 1; j < cids.length; j++) add('Correlations', `${cids[i]} with ${cids[j]}`, { kind: 'correlation', a: cids[i], b: cids[j] }, [-1, 1]);
  } else if (model.template === 'cost-range') {
    add('Estimate', 'budget', { kind: 'budget' });
    add('Estimate', 'confidence level (P-level)', { kind: 'confidence' }, [0, 1]);
    add('Estimate', 'base estimate', { kind: 'base-estimate' });
    for (const it of model.items ?? []) {
      if (!it || typeof it.id !== 'string') continue;
      for (const p of ['low', 'mostLikely', 'high']) add(name(it), PARAM_LABELS[p], { kind: 'input-param', inputId: it.id, param: p });
    }
    for (const r of model.riskEvents ?? []) {
      if (!r || typeof r.id !== 'string') continue;
      add(`Risk: ${name(r)}`, 'probability', { kind: 'input-param', inputId: r.id, param: 'probability' }, [0, 1]);
      for (const p of ['impact.low', 'impact.mostLikely', 'impact.high']) add(`Risk: ${name(r)}`, PARAM_LABELS[p], { kind: 'input-param', inputId: r.id, param: p });
    }
    for (const g of model.correlationGroups ?? []) {
      if (!g || typeof g.id !== 'string') continue;
      add('Correlation groups', `${g.name?.trim() || g.id}: correlation`, { kind: 'group-correlation', groupId: g.id }, [-1, 1]);
    }
  } else if (model.template === 'formula') {
    for (const inp of model.inputs ?? []) {
      if (!inp || typeof inp.id !== 'string' || !inp.distribution?.type) continue;
      for (const p of DISTRIBUTION_PARAMS[inp.distribution.type] ?? []) {
        add(name(inp), PARAM_LABELS[p] ?? p, { kind: 'input-param', inputId: inp.id, param: p }, p === 'p' ? [0, 1] : undefined);
      }
    }
    for (const o of model.outputs ?? []) {
      if (!o || typeof o.id !== 'string') continue;
      add(`Output: ${name(o)}`, 'lower limit', { kind: 'limit', which: 'lower', outputId: o.id });
      add(`Output: ${name(o)}`, 'upper limit', { kind: 'limit', which: 'upper', outputId: o.id });
    }
    const ids = model.correlation?.inputs ?? [];
    for (let i = 0; i < ids.length; i++)
      for (let j = i + 1; j < ids.length; j++) add('Correlations', `${ids[i]} with ${ids[j]}`, { kind: 'correlation', a: ids[i], b: ids[j] }, [-1, 1]);
    add('Formula', 'a named value used in formulas (the dial’s key)', { kind: 'variable' });
  }
  return out;
}

/** A step of 1, 2 or 5 times a power of ten, about a twentieth of the range. */
export function niceStep(range: number): number {
  if (!(range > 0) || !Number.isFinite(range)) return 1;
  const raw = range / 20;
  const p = 10 ** Math.floor(Math.log10(raw));
  const f = raw / p;
  const m = f < 1.5 ? 1 : f < 3.5 ? 2 : f < 7.5 ? 5 : 10;
  return +(m * p).toPrecision(6);
}

/** A starting range, step and default for a new dial on `option`: the current value ± 20 % (inside any bounds). */
export function suggestDial(option: DialTargetOption): { min: number; max: number; step: number; default: number } {
  const cur = option.current ?? (option.target.kind === 'variable' ? 1 : 0);
  let half = Math.abs(cur) * 0.2 || 1;
  let min = cur - half;
  let max = cur + half;
  if (option.target.kind === 'confidence') {
    // P50 to P95 in steps of 5 points: the levels clients ask about.
    return { min: 0.5, max: 0.95, step: 0.05, default: Math.min(0.95, Math.max(0.5, cur)) };
  }
  if (option.bounds) {
    const [lo, hi] = option.bounds;
    half = (hi - lo) / 4;
    min = Math.max(lo, cur - half);
    max = Math.min(hi, cur + half);
  }
  const step = niceStep(max - min);
  const round = (v: number) => +(Math.round(v / step) * step).toPrecision(10);
  min = round(min);
  max = round(max);
  if (option.bounds) {
    min = Math.max(option.bounds[0], min);
    max = Math.min(option.bounds[1], max);
  }
  if (!(min < max)) max = min + step;
  return { min, max, step, default: Math.min(max, Math.max(min, cur)) };
}

// ---- References between rows ------------------------------------------------------------------------------------

type Draft = Record<string, unknown>;

/**
 * Paths and values to write so that every reference to `from` (correlation lists, group members, dial targets)
 * names `to` instead, after a key is renamed. Formulas are left alone: the schema flags a formula that still
 * uses the old name, and the author decides.
 */
export function renameReferences(model: Draft, from: string, to: string): { path: string; value: unknown }[] {
  const out: { path: string; value: unknown }[] = [];
  if (!from || from === to) return out;
  const corr = model.correlation as { inputs?: unknown } | undefined;
  if (corr && Array.isArray(corr.inputs) && corr.inputs.includes(from)) {
    out.push({ path: 'correlation.inputs', value: corr.inputs.map((x) => (x === from ? to : x)) });
  }
  const groups = model.correlationGroups;
  if (Array.isArray(groups)) {
    groups.forEach((g, i) => {
      const items = (g as { items?: unknown })?.items;
      if (Array.isArray(items) && items.includes(from)) out.push({ path: `correlationGroups.${i}.items`, value: items.map((x) => (x === from ? to : x)) });
    });
  }
  const dials = model.dials;
  if (Array.isArray(dials)) {
    dials.forEach((d, i) => {
      const t = (d as { target?: Record<string, unknown> })?.target;
      if (!t || typeof t !== 'object') return;
      const next = { ...t };
      let hit = false;
      for (const key of ['inputId', 'groupId', 'outputId', 'a', 'b']) {
        if (next[key] === from) {
          next[key] = to;
          hit = true;
        }
      }
      if (hit) out.push({ path: `dials.${i}.target`, value: next });
    });
  }
  return out;
}

/**
 * Paths and values to write when the row with key `id` is removed: it leaves the correlation matrix (its row and
 * column go) and every correlation group. Dials on it stay, flagged, so the author chooses a new target.
 */
export function removeReferences(model: Draft, id: string): { path: string; value: unknown }[] {
  const out: { path: string; value: unknown }[] = [];
  const corr = model.correlation as { inputs?: unknown; matrix?: unknown } | undefined;
  if (corr && Array.isArray(corr.inputs) && corr.inputs.includes(id)) {
    const keep = corr.inputs.map((x, k) => ({ x, k })).filter((e) => e.x !== id);
    if (keep.length === 0) out.push({ path: 'correlation', value: undefined });
    else {
      const m = Array.isArray(corr.matrix) ? (corr.matrix as unknown[][]) : [];
      out.push({
        path: 'correlation',
        value: { inputs: keep.map((e) => e.x), matrix: keep.map((a) => keep.map((b) => (a.k === b.k ? 1 : typeof m[a.k]?.[b.k] === 'number' ? m[a.k][b.k] : 0))) },
      });
    }
  }
  const groups = model.correlationGroups;
  if (Array.isArray(groups)) {
    groups.forEach((g, i) => {
      const items = (g as { items?: unknown })?.items;
      if (Array.isArray(items) && items.includes(id)) out.push({ path: `correlationGroups.${i}.items`, value: items.filter((x) => x !== id) });
    });
  }
  return out;
}
