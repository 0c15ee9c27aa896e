import { beforeAll, afterAll, describe, expect, it } from 'vitest';
import { useFreshDb } from '../../support/test-db';
import { closeDb, writeTransaction } from '@/db/knex';
import { insertFirmWithOwner, insertUser } from '@/db/users';
import { insertMembership } from '@/db/team';
import { getDataset, listDatasets } from '@/db/datasets';
import { seedDatasets, DEMO_SPIGOT_LENGTHS } from '@/lib/dev/seed/datasets';
import { fitAll } from '@/lib/core/datasets/fit';

// The demo seed's datasets go through the same table and queries the app reads.
let firmId: string;
let authorId: string;

beforeAll(async () => {
  await useFreshDb();
  ({ firmId, authorId } = await writeTransaction(async (trx) => {
    const owner = await insertUser({ email: 'owner@seed-firm.example', name: 'Owner', passwordHash: null, verified: true }, trx);
    const firmId = await insertFirmWithOwner({ name: 'Invented Seed Firm' }, owner, trx);
    const authorId = await insertUser({ email: 'author@seed-firm.example', name: 'Author', passwordHash: null, verified: true }, trx);
    await insertMembership(firmId, authorId, 'author', trx);
    return { firmId, authorId };
  }));
});
afterAll(() => closeDb());

describe('seedDatasets', () => {
  it('stores the spigot lengths and cost growth with hash, size and the author as uploader', async () => {
    expect(await seedDatasets(firmId)).toEqual({ datasets: 2 });
    const rows = await listDatasets(firmId);
    expect(rows.map((r) => r.rowCount).sort((a, b) => a - b)).toEqual([30, 60]);
    const spigot = rows.find((r) => r.rowCount === 60)!;
    expect(spigot.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(spigot.uploadedBy).toBe(authorId);
    expect(spigot.useCount).toBe(0);
    const full = await getDataset(firmId, spigot.id);
    expect(full!.values).toEqual(DEMO_SPIGOT_LENGTHS);
    expect(fitAll(full!.values).every((f) => f.ok)).toBe(true);
  });
});
