/** Builds the server's run worker to `outfile` (default .next/workers/simulate-worker.mjs); resolves to its path. */
export function buildSimulateWorker(outfile?: string): Promise<string>;
