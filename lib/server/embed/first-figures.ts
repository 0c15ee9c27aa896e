import 'server-only';
import { createHash } from 'node:crypto';
import fs from 'node:fs';
import type { Knex } from 'knex';
import { writeTransaction } from '@/db/knex';
import { enqueueFirstFigures, readFirstFigures, type StoredFirstFigures } from '@/db/first-figures';
import { workerFile } from '@/lib/server/simulate/pool';
import { afterResponse } from '@/lib/server/ops/after-response';
import { logger } from '@/lib/server/ops/log';
import { decodeRunResult } from '@/lib/core/embed/first-figures';
import { headlineFigure } from '@/lib/core/results/headline';
import { cautionsFor, lowTrialCaution } from '@/lib/core/cautions';
import { formatCount } from '@/lib/core/charts/format';
import type { EarlyFigure } from '@/lib/core/embed/payload';

// First figures (migrations/20261205200100_first_figures.ts): a published version has exactly one result at its default
// dial values, so the server's run pool computes it once (lib/server/embed/first-figures-worker.ts) and the widget
// payload carries it. Results are kept per engine build: the build is the hash of the run worker the pool loads,
// which bundles the same engine code as the browser's worker, so a changed engine computes them again rather than
// sending figures the viewer's own runs would not reproduce.

let build: { file: string; hash: string | null } | null = null;

/** The engine build the stored results belong to (null when the run worker is missing: no first figures then). */
export function engineBuild(): string | null {
  const file = workerFile();
  if (build?.file === file) return build.hash;
  let hash: string | null = null;
  try {
    hash = createHash('sha256').update(fs.readFileSync(/*turbopackIgnore: true*/ file)).digest('hex').slice(0, 32);
  } catch {
    hash = null;
  }
  build = { file, hash };
  return hash;
}

/** Queues the version's first figures (inside the caller's transaction): on sign-off, publish, and a change of version. */
export async function queueFirstFigures(firmId: string, versionId: string, trx: Knex.Transaction): Promise<void> {
  const b = engineBuild();
  if (b) await enqueueFirstFigures(firmId, versionId, b, trx);
}

// Done rows never change (a version is immutable and the build is part of the key): kept once read.
const MAX_CACHED = 256;
const done = new Map<string, StoredFirstFigures>();
// Versions this process has queued lazily, so a busy widget does not ask again on every load.
const asked = new Set<string>();

/**
 * The stored first figures of a published version, or null. A version published before first figures existed (or
 * under another engine build) has no row: it is queued after the response, and the page runs the model itself.
 */
export async function firstFiguresFor(firmId: string, versionId: string): Promise<StoredFirstFigures | null> {
  const b = engineBuild();
  if (!b) return null;
  const key = `${firmId}:${versionId}:${b}`;
  const hit = done.get(key);
  if (hit) return hit;
  const row = await readFirstFigures(firmId, versionId, b);
  if (row?.stored) {
    if (done.size >= MAX_CACHED) done.delete(done.keys().next().value!);
    done.set(key, row.stored);
    return row.stored;
  }
  if (!row && !asked.has(key)) {
    if (asked.size >= 10_000) asked.clear();
    asked.add(key);
    afterResponse(
      writeTransaction((trx) => enqueueFirstFigures(firmId, versionId, b, trx)).then(() => logger().info({ versionId }, 'first figures queued for a version published before them')),
      'a first figures job',
    );
  }
  return null;
}

// The early paint's words per stored result and headline id (both immutable once stored).
const early = new WeakMap<StoredFirstFigures, Map<string, EarlyFigure>>();

/**
 * The headline figure and the cautions in words, for the embed page's inline script to show the moment the payload
 * arrives, before the page's JavaScript has loaded: the same text the widget prints (lib/core/results/headline.ts,
 * lib/core/cautions.ts), worded here because the inline script can import nothing.
 */
export function earlyFigure(stored: StoredFirstFigures, headlineId: string): EarlyFigure {
  let byId = early.get(stored);
  if (!byId) early.set(stored, (byId = new Map()));
  const hit = byId.get(headlineId);
  if (hit) return hit;
  const result = decodeRunResult(JSON.parse(stored.resultJson));
  const h = headlineFigure(result, headlineId);
  const low = lowTrialCaution(result.outputs);
  const e: EarlyFigure = {
    label: h.label,
    value: h.value,
    sub: h.sub,
    trials: formatCount(result.run.trials),
    cautions: [...(low ? [low] : []), ...cautionsFor(result.template)].map((c) => ({ title: c.title, text: c.text, low: c.id === 'low-trials' })),
  };
  byId.set(headlineId, e);
  return e;
}
