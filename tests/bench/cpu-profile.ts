import fs from 'node:fs';

// Reads a V8 CPU profile (`node --cpu-prof`) and ranks functions by self time (samples taken while on top of the stack).

interface ProfileNode {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  hitCount?: number;
}

export interface ProfileEntry {
  name: string;
  where: string;
  selfPct: number;
}

export function summariseCpuProfile(file: string, top = 25): { totalSamples: number; top: ProfileEntry[] } {
  const prof = JSON.parse(fs.readFileSync(file, 'utf8')) as { nodes: ProfileNode[]; samples?: number[] };
  const hits = new Map<number, number>();
  if (prof.samples?.length) for (const s of prof.samples) hits.set(s, (hits.get(s) ?? 0) + 1);
  else for (const n of prof.nodes) hits.set(n.id, n.hitCount ?? 0);
  const byFn = new Map<string, { name: string; where: string; n: number }>();
  let total = 0;
  for (const n of prof.nodes) {
    const h = hits.get(n.id) ?? 0;
    if (!h) continue;
    total += h;
    const f = n.callFrame;
    const where = f.url ? `${f.url.replace(/^file:\/\//, '').replace(process.cwd() + '/', '')}:${f.lineNumber + 1}` : '';
    const key = `${f.functionName}@${where}`;
    const e = byFn.get(key) ?? { name: f.functionName || '(anonymous)', where, n: 0 };
    e.n += h;
    byFn.set(key, e);
  }
  const ranked = [...byFn.values()].sort((a, b) => b.n - a.n).slice(0, top);
  return { totalSamples: total, top: ranked.map((e) => ({ name: e.name, where: e.where, selfPct: total ? (100 * e.n) / total : 0 })) };
}
