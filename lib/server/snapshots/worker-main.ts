// The outgoing-mail worker as its own process (started by lib/dev/stack.ts beside `next start`, or on its own):
//   node --conditions=react-server node_modules/tsx/dist/cli.mjs lib/server/snapshots/worker-main.ts
// It runs both queues: snapshot PDFs and notification e-mails (the review loop), with the same loop and leases.
import { startSnapshotWorker, workerOptionsFromEnv } from './worker';
import { startMailWorker } from '@/lib/server/notifications/worker';

const worker = startSnapshotWorker(workerOptionsFromEnv());
const mail = startMailWorker(workerOptionsFromEnv());
console.log(`[snapshots] worker ${worker.id} started; notification mails by ${mail.id}`);

let stopping = false;
const stop = (signal: string) => {
  if (stopping) return;
  stopping = true;
  console.log(`[snapshots] ${signal}: finishing the jobs in hand`);
  void Promise.all([worker.stop(), mail.stop()]).then(() => process.exit(0));
};
process.on('SIGTERM', () => stop('SIGTERM'));
process.on('SIGINT', () => stop('SIGINT'));
