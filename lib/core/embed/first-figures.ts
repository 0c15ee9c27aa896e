// First figures: a published version's result at its default dial values, computed once on the server's run pool
// and carried in the widget payload (EmbedWidgetPayload.firstFigures). JSON alone loses NaN, ±Infinity and -0, which
// a result may hold (e.g. a skewness of a constant column), so those travel as tagged objects and come back exact:
// every finite double survives JSON's shortest round-trip form bit for bit. No React and no server imports.
import type { RunResult } from '@/lib/core/engine/merge';

const TAG = '$num';

/** The stored text of a result (sample columns are never stored: the widget asks for none). */
export function encodeRunResult(result: RunResult): string {
  return JSON.stringify({ ...result, samples: null }, (_k, v: unknown) => {
    if (typeof v !== 'number') return v;
    if (Number.isNaN(v)) return { [TAG]: 'NaN' };
    if (v === Infinity) return { [TAG]: 'Infinity' };
    if (v === -Infinity) return { [TAG]: '-Infinity' };
    if (Object.is(v, -0)) return { [TAG]: '-0' };
    return v;
  });
}

const SPECIAL: Record<string, number> = { NaN: NaN, Infinity: Infinity, '-Infinity': -Infinity, '-0': -0 };

function revive(v: unknown): unknown {
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) v[i] = revive(v[i]);
    return v;
  }
  if (v && typeof v === 'object') {
    const o = v as Record<string, unknown>;
    const keys = Object.keys(o);
    if (keys.length === 1 && keys[0] === TAG && typeof o[TAG] === 'string' && o[TAG] in SPECIAL) return SPECIAL[o[TAG]];
    for (const k of keys) o[k] = revive(o[k]);
  }
  return v;
}

/** The result from its parsed stored form (changed in place). */
export function decodeRunResult(parsed: unknown): RunResult {
  return revive(parsed) as RunResult;
}
