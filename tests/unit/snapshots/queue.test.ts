// The snapshot queue's claim under competing workers. On SQLite the claims queue behind the write lock; under
// `npm run test:postgres` the same test runs on PostgreSQL, where the claims race for real (FOR UPDATE SKIP LOCKED
// over a pool of connections). Either way every job is taken by exactly one worker.
import { beforeAll, describe, expect, it } from 'vitest';
import { randomUUID } from 'node:crypto';
import { useFreshDb } from '../../support/test-db';
import { getDb, writeTransaction } from '@/db/knex';
import { claimNextJob, getSnapshotJob, insertSnapshotJob, markSending, markSent } from '@/db/snapshots';
import { seedWidget } from './fixture';

beforeAll(async () => {
  await useFreshDb();
});

async function queueJobs(n: number): Promise<string[]> {
  const s = await seedWidget();
  const version = (await getDb()('widgets').where({ id: s.widgetId }).select('version_id').first()) as { version_id: string };
  const ids: string[] = [];
  await writeTransaction(async (trx) => {
    for (let i = 0; i < n; i++) {
      const id = randomUUID();
      ids.push(id);
      await insertSnapshotJob(
        {
          id,
          firmId: s.firmId,
          clientId: s.clientId,
          passId: s.passId,
          widgetId: s.widgetId,
          versionId: version.version_id,
          recipient: `reader-${i}@client.example`,
          requesterHash: 'a'.repeat(64),
          dialValues: {},
          messageId: `<${id}@stochos.test>`,
          createdAt: new Date(Date.now() - 1000).toISOString(),
        },
        trx,
      );
    }
  });
  return ids;
}

describe('snapshot queue claims', () => {
  it('hands each of 40 jobs to exactly one of 6 competing workers', async () => {
    const ids = await queueJobs(40);
    const taken: { job: string; worker: string }[] = [];
    const lease = () => new Date(Date.now() + 60_000).toISOString();
    const worker = async (name: string) => {
      for (;;) {
        const c = await claimNextJob(name, lease());
        if (!c) return;
        taken.push({ job: c.job.id, worker: name });
        expect(await markSending(c.job.id, name, lease(), { pdfBytes: 1, renderMs: 1 })).toBe(true);
        expect(await markSent(c.job.id, name)).toBe(true);
      }
    };
    await Promise.all(['w1', 'w2', 'w3', 'w4', 'w5', 'w6'].map(worker));
    expect(taken.map((t) => t.job).sort()).toEqual([...ids].sort());
    for (const id of ids) expect((await getSnapshotJob(id))?.state).toBe('sent');
  });

  it('gives a job whose lease ran out to another worker, and only one of them', async () => {
    const [id] = await queueJobs(1);
    const first = await claimNextJob('crashed', new Date(Date.now() - 1).toISOString());
    expect(first?.job.id).toBe(id);
    // The crashed worker's lease is over: of several workers asking at once, one takes the job again.
    const again = await Promise.all(['a', 'b', 'c', 'd'].map((w) => claimNextJob(w, new Date(Date.now() + 60_000).toISOString())));
    const winners = again.filter((c) => c?.job.id === id);
    expect(winners).toHaveLength(1);
    expect(winners[0]).toMatchObject({ orphaned: false, job: { state: 'rendering', attempts: 2 } });
    // The crashed worker can no longer move it forward.
    expect(await markSending(id!, 'crashed', new Date(Date.now() + 60_000).toISOString(), { pdfBytes: 1, renderMs: 1 })).toBe(false);
  });
});
