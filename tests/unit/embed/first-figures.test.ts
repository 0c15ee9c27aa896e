// First figures: the stored result of a published version at its default dial values. The job is computed on the real
// worker-thread pool (tests/support/run-worker-setup.ts builds it), survives a worker that stops mid-run, and its
// result equals a Node run of the same version bit for bit; the widget payload carries it once stored.
import { beforeAll, describe, expect, it } from 'vitest';
import { useFreshDb } from '../../support/test-db';
import { getDb, writeTransaction } from '@/db/knex';
import { claimNextFirstFigures, listFirstFigures, markFirstFiguresDone, readFirstFigures } from '@/db/first-figures';
import { engineBuild, firstFiguresFor, queueFirstFigures } from '@/lib/server/embed/first-figures';
import { startFirstFiguresWorker } from '@/lib/server/embed/first-figures-worker';
import { widgetRepresentation } from '@/lib/server/embed/widget-response';
import { decodeRunResult, encodeRunResult } from '@/lib/core/embed/first-figures';
import { runCheckedModelSync, type RunResult } from '@/lib/core/engine';
import { headlineFigure } from '@/lib/core/results/headline';
import { lowTrialCaution } from '@/lib/core/cautions';
import { seedWidget, STACK_MODEL, viewerFor } from '../snapshots/fixture';

beforeAll(async () => {
  await useFreshDb();
});

const quiet = () => undefined;
/** Everything a run reproduces: the wall-clock timing is not part of the result. */
const reproducible = (r: RunResult) => JSON.parse(encodeRunResult({ ...r, timing: { samplingMs: 0, statisticsMs: 0, totalMs: 0 } })) as unknown;

/** Where two JSON values differ (paths and both sides), for a readable failure. */
function differences(a: unknown, b: unknown, path = '', out: string[] = []): string[] {
  if (out.length >= 10) return out;
  if (a && b && typeof a === 'object' && typeof b === 'object') {
    for (const k of new Set([...Object.keys(a), ...Object.keys(b)])) differences((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`, out);
  } else if (JSON.stringify(a) !== JSON.stringify(b)) out.push(`${path}: ${JSON.stringify(a)} ≠ ${JSON.stringify(b)}`);
  return out;
}

async function versionOf(widgetId: string): Promise<string> {
  return (await getDb()('widgets').where({ id: widgetId }).first('version_id')).version_id as string;
}

describe('first figures', () => {
  it('encodes NaN, ±Infinity and -0 so they come back exact, and every finite double bit for bit', () => {
    const odd = { a: NaN, b: Infinity, c: -Infinity, d: -0, e: 0.1 + 0.2, f: 5e-324, g: -1.7976931348623157e308, h: [NaN, 1 / 3] };
    const back = decodeRunResult(JSON.parse(encodeRunResult(odd as unknown as RunResult))) as unknown as typeof odd;
    expect(Number.isNaN(back.a)).toBe(true);
    expect(back.b).toBe(Infinity);
    expect(back.c).toBe(-Infinity);
    expect(Object.is(back.d, -0)).toBe(true);
    expect(back.e).toBe(0.1 + 0.2);
    expect(back.f).toBe(5e-324);
    expect(back.g).toBe(-1.7976931348623157e308);
    expect(Number.isNaN(back.h[0])).toBe(true);
    expect(back.h[1]).toBe(1 / 3);
  });

  it('a job survives a worker that stops mid-run: another takes it when the lease runs out, and stores the Node run bit for bit', async () => {
    const s = await seedWidget();
    const versionId = await versionOf(s.widgetId);
    const build = engineBuild();
    expect(build).toMatch(/^[0-9a-f]{32}$/);
    await writeTransaction((trx) => queueFirstFigures(s.firmId, versionId, trx));
    // Queuing twice (sign-off, then publish) keeps one job.
    await writeTransaction((trx) => queueFirstFigures(s.firmId, versionId, trx));
    expect(await listFirstFigures(s.firmId, versionId)).toHaveLength(1);

    // Worker A claims the job with a short lease and stops (no heartbeat, no result): the process died.
    const a = await claimNextFirstFigures('worker-a', new Date(Date.now() + 300).toISOString());
    expect(a?.versionId).toBe(versionId);
    expect((await listFirstFigures(s.firmId, versionId))[0]!.state).toBe('computing');

    // A new worker (the restarted process) leaves it alone while A's lease holds, then takes it over.
    const b = startFirstFiguresWorker({ id: 'worker-b', pollMs: 50, leaseMs: 60_000, log: quiet });
    try {
      await expect.poll(async () => (await readFirstFigures(s.firmId, versionId, build!))?.state, { timeout: 30_000, interval: 100 }).toBe('done');
    } finally {
      await b.stop();
    }
    const rows = await listFirstFigures(s.firmId, versionId);
    expect(rows).toMatchObject([{ state: 'done', attempts: 2, engineBuild: build, lastError: null }]);
    // Worker A coming back late cannot overwrite what B stored.
    expect(await markFirstFiguresDone(a!.id, 'worker-a', '{}', 1)).toBe(false);

    const stored = await firstFiguresFor(s.firmId, versionId);
    expect(stored).not.toBeNull();
    const fromServer = decodeRunResult(JSON.parse(stored!.resultJson));
    const inNode = runCheckedModelSync(STACK_MODEL, { samples: 'none' });
    expect(differences(reproducible(fromServer), reproducible(inNode))).toEqual([]);
    expect(fromServer.run.dialValues).toEqual(Object.fromEntries(STACK_MODEL.dials.map((d) => [d.id, d.default])));
  });

  it('the widget payload carries the stored figures (with the headline in words) and a new ETag; without them it is as before', async () => {
    const s = await seedWidget();
    const versionId = await versionOf(s.widgetId);
    const v = await viewerFor(s);
    const before = widgetRepresentation(v, await firstFiguresFor(s.firmId, versionId));
    expect(JSON.parse(before.body())).not.toHaveProperty('firstFigures');
    // The read above found no row for a version published before first figures: it queued one (the lazy path).
    await expect.poll(async () => (await listFirstFigures(s.firmId, versionId)).length, { timeout: 5000, interval: 50 }).toBe(1);

    const w = startFirstFiguresWorker({ id: 'worker-c', pollMs: 50, log: quiet });
    try {
      await expect.poll(async () => (await listFirstFigures(s.firmId, versionId))[0]!.state, { timeout: 30_000, interval: 100 }).toBe('done');
    } finally {
      await w.stop();
    }
    const after = widgetRepresentation(v, await firstFiguresFor(s.firmId, versionId));
    expect(after.etag).not.toBe(before.etag);
    const body = JSON.parse(after.body()) as { firstFigures: { result: unknown; computedAt: string; early: { label: string; value: string; cautions: { title: string }[] } } };
    const result = decodeRunResult(body.firstFigures.result);
    const h = headlineFigure(result, 'mean');
    expect(body.firstFigures.early).toMatchObject({ label: h.label, value: h.value, sub: h.sub });
    // The cautions the widget shows beside these figures (DESIGN.md §12), the low-trial flag first when it applies.
    const low = lowTrialCaution(result.outputs);
    expect(body.firstFigures.early.cautions.map((c) => c.title)).toEqual([...(low ? [low.title] : []), 'Tolerance results', 'Assumptions']);
    expect(Date.parse(body.firstFigures.computedAt)).toBeGreaterThan(0);
  });

  it('rows are scoped by firm: another firm cannot queue or read a version it does not own', async () => {
    const s = await seedWidget();
    const other = await seedWidget();
    const versionId = await versionOf(s.widgetId);
    await writeTransaction((trx) => queueFirstFigures(other.firmId, versionId, trx));
    expect(await listFirstFigures(s.firmId, versionId)).toHaveLength(0);
    expect(await listFirstFigures(other.firmId, versionId)).toHaveLength(0);
    expect(await firstFiguresFor(other.firmId, versionId)).toBeNull();
  });
});
