import 'server-only';
import { createHash } from 'node:crypto';
import { writeTransaction } from '@/db/knex';
import { insertDataset, recordDatasetUse } from '@/db/datasets';
import { recordAudit } from '@/db/audit';

// Two invented datasets for the demo firm: 60 measured spigot lengths of the pump bearing housing (nominal
// 12.00 ± 0.03 mm in the demo stack) and 30 cost-growth ratios (outturn / award) of past quay and river works.
// A fixed linear congruential stream with Box–Muller (1958) makes the numbers the same on every seed.

function stream(seed: number): () => number {
  let s = seed;
  return () => {
    s = (s * 1103515245 + 12345) % 2147483648;
    return (s + 0.5) / 2147483648;
  };
}

function normals(seed: number, n: number): number[] {
  const u = stream(seed);
  const out: number[] = [];
  while (out.length < n) {
    const r = Math.sqrt(-2 * Math.log(u()));
    const t = 2 * Math.PI * u();
    out.push(r * Math.cos(t), r * Math.sin(t));
  }
  return out.slice(0, n);
}

/** Spigot lengths in mm: a slightly high-running process, mean about 12.006 mm, sd about 0.008 mm. */
export const DEMO_SPIGOT_LENGTHS = normals(20261201, 60).map((z) => +(12.006 + 0.008 * z).toFixed(4));

/** Outturn / award ratios: right-skewed, lognormal-like around +12 %. */
export const DEMO_COST_GROWTH = normals(7031, 30).map((z) => +Math.exp(Math.log(1.12) + 0.11 * z).toFixed(3));

function csv(header: string, ids: string, values: number[]): string {
  return `${ids},${header}\n` + values.map((v, i) => `${i + 1},${v}`).join('\n') + '\n';
}

export async function seedDatasets(firmId: string): Promise<{ datasets: number }> {
  return writeTransaction(async (trx) => {
    const author = await trx('memberships as m').join('users as u', 'u.id', 'm.user_id').where({ 'm.firm_id': firmId, 'm.role': 'author', 'm.status': 'active' }).orderBy('u.email').first('u.id');
    const userId = (author?.id as string | undefined) ?? null;
    const sets = [
      { name: 'Bearing housing spigot lengths, batch 14', unit: 'mm', columnName: 'spigot_length_mm', fileName: 'housing-spigot-batch14.csv', text: csv('spigot_length_mm', 'part', DEMO_SPIGOT_LENGTHS), values: DEMO_SPIGOT_LENGTHS },
      { name: 'Cost growth of past marine works', unit: 'ratio', columnName: 'outturn_over_award', fileName: 'past-cost-growth.csv', text: csv('outturn_over_award', 'project', DEMO_COST_GROWTH), values: DEMO_COST_GROWTH },
    ];
    for (const s of sets) {
      const bytes = Buffer.from(s.text);
      const hash = createHash('sha256').update(bytes).digest('hex');
      const id = await insertDataset(
        firmId,
        userId,
        { name: s.name, unit: s.unit, columnName: s.columnName, fileName: s.fileName, values: s.values, hash, sizeBytes: bytes.length, rowCount: s.values.length, droppedRows: [] },
        trx,
      );
      await recordAudit({ firmId, actorUserId: userId, action: 'dataset.uploaded', targetType: 'dataset', targetId: id, detail: { name: s.name, seeded: true } }, trx);
      // The pump stack's version 2 takes its spigot length from a normal law fitted to these parts.
      if (s.values === DEMO_SPIGOT_LENGTHS) {
        const pump = await trx('models').where({ firm_id: firmId, title: 'QP-80 pump: impeller front clearance' }).first('id');
        if (pump) await recordDatasetUse(firmId, { datasetId: id, modelId: pump.id as string, hash, method: 'normal', userId }, trx);
      }
    }
    return { datasets: sets.length };
  });
}
