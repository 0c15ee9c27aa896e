/**
 * A pool of Node worker threads running the engine's chunks, for the bench and the
 * parity tests (the server's own pool lives elsewhere). Chunk k goes to thread k mod W;
 * the parts are merged on the calling thread in chunk order.
 */
import { build } from 'esbuild';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Worker } from 'node:worker_threads';
import type { ChunkPart } from '@/lib/core/engine/chunks';
import { prepareRun } from '@/lib/core/engine/prepare-run';
import { inputWindow, mergeParts, type RunOptions, type RunResult } from '@/lib/core/engine/simulate';
import { RankStore } from '@/lib/core/engine/stats';
import type { NodeChunksRequest, NodeChunksResponse } from './engine-node-worker';

const root = path.resolve(__dirname, '../..');

export interface NodeEnginePool {
  size: number;
  /** Sampling on the threads, merge and statistics here. */
  run(model: unknown, options?: RunOptions): Promise<RunResult>;
  /** The parts only (no merge), for timing the parallel sampling; window overrides the input columns returned. */
  parts(model: unknown, options?: RunOptions, window?: number): Promise<ChunkPart[]>;
  close(): Promise<void>;
}

export async function createNodeEnginePool(size: number, options: { cache?: boolean } = {}): Promise<NodeEnginePool> {
  const dir = mkdtempSync(path.join(tmpdir(), 'stochos-node-pool-'));
  const file = path.join(dir, 'engine-node-worker.cjs');
  await build({
    entryPoints: [path.join(root, 'tests/support/engine-node-worker.ts')],
    outfile: file,
    bundle: true,
    platform: 'node',
    format: 'cjs',
    target: 'node20',
    absWorkingDir: root,
    tsconfig: path.join(root, 'tsconfig.json'),
    logLevel: 'silent',
  });
  const workers = Array.from({ length: size }, () => new Worker(file, { workerData: { cache: options.cache !== false } }));
  await Promise.all(workers.map((w) => new Promise((resolve) => w.once('online', resolve))));
  let nextId = 1;
  const ranks = new RankStore();

  function ask(w: Worker, req: NodeChunksRequest): Promise<ChunkPart[]> {
    return new Promise((resolve, reject) => {
      const onMessage = (msg: NodeChunksResponse) => {
        if (msg.id !== req.id) return;
        w.off('message', onMessage);
        if (msg.error !== undefined) reject(new Error(msg.error));
        else resolve(msg.parts);
      };
      w.on('message', onMessage);
      w.postMessage(req);
    });
  }

  async function parts(model: unknown, options: RunOptions = {}, windowOverride?: number): Promise<ChunkPart[]> {
    const prep = prepareRun(model, options.dialValues);
    const assigned: number[][] = Array.from({ length: size }, () => []);
    for (let k = 0; k < prep.chunkCount; k++) assigned[k % size].push(k);
    const window = windowOverride ?? inputWindow(prep, options.samples);
    const id = nextId++;
    const got = await Promise.all(
      assigned.map((chunkIndices, i) => (chunkIndices.length ? ask(workers[i], { id, model, dialValues: options.dialValues, chunkIndices, inputWindow: window }) : Promise.resolve([]))),
    );
    return got.flat();
  }

  return {
    size,
    parts,
    async run(model, options = {}) {
      const p = await parts(model, options);
      ranks.beginRun();
      return mergeParts(prepareRun(model, options.dialValues), p, options, { ranks });
    },
    async close() {
      await Promise.all(workers.map((w) => w.terminate()));
      rmSync(dir, { recursive: true, force: true });
    },
  };
}
