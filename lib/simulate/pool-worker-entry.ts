// Entry of the bundled pool worker: piscina calls the default export with each task.
import { move } from 'piscina';
import { runTask, type RunReply, type RunTask } from './pool-worker';

/** A JSON body comes back as bare bytes, moved to the request thread instead of copied; anything else as is. */
export default function run(task: RunTask): Uint8Array | Exclude<RunReply, { json: Uint8Array }> {
  const reply = runTask(task);
  if (reply.ok && 'json' in reply) return move(reply.json) as Uint8Array;
  return reply as Exclude<RunReply, { json: Uint8Array }>;
}
