// Entry of the bundled pool worker: piscina calls the default export with each task.
import os from 'node:os';
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
export default function run(task: RunTask): Uint8Array | Exclude<RunReply, { json: Uint8Array }> {
  const reply = runTask(task);
  if (reply.ok && 'json' in reply) return move(reply.json) as Uint8Array;
  return reply as Exclude<RunReply, { json: Uint8Array }>;
}
