/**
 * Node worker_threads entry for the engine's chunks (the bench's parallel R1 and the
 * worker-threads parity test): the same runChunks the browser workers run. Bundled with
 * esbuild by node-engine-pool.ts.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { ChunkRunner, type ChunkPart } from '@/lib/core/engine/chunks';
import { prepareRun } from '@/lib/core/engine/prepare-run';

export interface NodeChunksRequest {
  id: number;
  model: unknown;
  dialValues?: Record<string, number>;
  chunkIndices: number[];
  inputWindow: number;
}

export type NodeChunksResponse = { id: number; parts: ChunkPart[]; error?: undefined } | { id: number; parts?: undefined; error: string };

// The bench turns the cache off so repeated identical runs measure sampling, not the cache.
const runner = new ChunkRunner({ cache: (workerData as { cache?: boolean } | undefined)?.cache !== false });

parentPort?.on('message', (req: NodeChunksRequest) => {
  try {
    const prep = prepareRun(req.model, req.dialValues);
    runner.beginRun();
    const parts = runner.run(prep, req.chunkIndices, { inputWindow: req.inputWindow });
    const transfer = parts.flatMap((p) => Object.values(p.outputs).map((a) => a.buffer as ArrayBuffer));
    parentPort?.postMessage({ id: req.id, parts } satisfies NodeChunksResponse, transfer);
  } catch (err) {
    parentPort?.postMessage({ id: req.id, error: err instanceof Error ? err.message : String(err) } satisfies NodeChunksResponse);
  }
});
