// The snapshot worker as its own process (started by lib/dev/stack.ts beside `next start`, or on its own):
//   node --conditions=react-server node_modules/tsx/dist/cli.mjs lib/snapshots/worker-main.ts
import { startSnapshotWorker, workerOptionsFromEnv } from './worker';

const worker = startSnapshotWorker(workerOptionsFromEnv());
console.log(`[snapshots] worker ${worker.id} started`);

let stopping = false;
const stop = (signal: string) => {
  if (stopping) return;
  stopping = true;
  console.log(`[snapshots] ${signal}: finishing the job in hand`);
  void worker.stop().then(() => process.exit(0));
};
process.on('SIGTERM', () => stop('SIGTERM'));
process.on('SIGINT', () => stop('SIGINT'));
