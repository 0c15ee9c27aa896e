// The outgoing-mail worker as its own process (started by lib/dev/stack.ts beside `next start`, or on its own):
//   node --conditions=react-server node_modules/tsx/dist/cli.mjs lib/server/snapshots/worker-main.ts
// It runs the queues: snapshot PDFs, notification e-mails (the review loop) and the first figures of published
// versions (lib/server/embed/first-figures-worker.ts), with the same loop and leases.
import { startSnapshotWorker, workerOptionsFromEnv } from './worker';
import { startMailWorker } from '@/lib/server/notifications/worker';
import { firstFiguresOptionsFromEnv, startFirstFiguresWorker } from '@/lib/server/embed/first-figures-worker';

const worker = startSnapshotWorker(workerOptionsFromEnv());
const mail = startMailWorker(workerOptionsFromEnv());
const first = startFirstFiguresWorker(firstFiguresOptionsFromEnv());
console.log(`[snapshots] worker ${worker.id} started; notification mails by ${mail.id}; first figures by ${first.id}`);

let stopping = false;
const stop = (signal: string) => {
  if (stopping) return;
  stopping = true;
  console.log(`[snapshots] ${signal}: finishing the jobs in hand`);
  void Promise.all([worker.stop(), mail.stop(), first.stop()]).then(() => process.exit(0));
};
process.on('SIGTERM', () => stop('SIGTERM'));
process.on('SIGINT', () => stop('SIGINT'));
