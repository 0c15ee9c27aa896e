// Entry of the bundled pool worker: piscina calls the default export with each task.
import os from 'node:os';
import type { MessagePort } from 'node:worker_threads';
import { move } from 'piscina';
import { runTask, type RunReply, type RunTask } from './pool-worker';

// Runs give way to requests when the cores are busy: on Linux the nice value belongs to the thread, so this lowers
// the priority of this worker thread only, never the request thread's. Elsewhere it is a no-op or may be refused.
try {
  os.setPriority(10);
} catch {
  // not permitted here: runs keep the normal priority
}

/** A JSON body comes back as bare bytes, moved to the request thread instead of copied; anything else as is. */
export default function run(task: RunTask & { started?: MessagePort }): Uint8Array | Exclude<RunReply, { json: Uint8Array }> {
  const { started, ...rest } = task;
  // Tell the pool the run has a thread now: its time limit counts from here, not from the queue.
  started?.postMessage('started');
  started?.close();
  const reply = runTask(rest);
  if (reply.ok && 'json' in reply) return move(reply.json) as Uint8Array;
  return reply as Exclude<RunReply, { json: Uint8Array }>;
}
