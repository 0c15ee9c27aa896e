import 'server-only';
import { hostname } from 'node:os';
import { randomUUID } from 'node:crypto';
import { claimNextMailJob, extendMailLease, markMailFailed, markMailRetry, markMailSending, markMailSent, type MailJob, type MailJobState } from '@/db/notifications';
import { classifySendError, sendMail } from '@/lib/server/mail/send';
import { backoffMs, startPollingLoop } from '@/lib/server/queue/loop';
import { UNCERTAIN_MESSAGE, type SnapshotWorker, type WorkerOptions } from '@/lib/server/snapshots/worker';

// The notification-mail worker: the same lease, retry and "never resend an uncertain hand-over" rules as the
// snapshot worker (db/job-lease.ts, lib/server/queue/loop.ts), with no rendering step: the text was fixed when queued.

export function startMailWorker(o: WorkerOptions = {}): SnapshotWorker {
  const id = o.id ?? `${hostname()}:${process.pid}:mail:${randomUUID().slice(0, 8)}`;
  const pollMs = o.pollMs ?? 1000;
  const leaseMs = o.leaseMs ?? 60_000;
  const base = o.retryBaseMs ?? 5000;
  const maxDelay = o.maxDelayMs ?? 15 * 60_000;
  const maxAttempts = o.maxAttempts ?? 10;
  const log = o.log ?? ((line: string) => console.log(`[mail] ${line}`));
  const until = () => new Date(Date.now() + leaseMs).toISOString();

  async function retryOrFail(job: MailJob, from: MailJobState, error: string): Promise<void> {
    if (job.attempts >= maxAttempts) {
      await markMailFailed(job.id, id, from, `Gave up after ${job.attempts} attempts: ${error}`);
      log(`mail ${job.id} failed after ${job.attempts} attempts: ${error}`);
      return;
    }
    const delay = backoffMs(job.attempts, base, maxDelay);
    await markMailRetry(job.id, id, from, error, new Date(Date.now() + delay).toISOString());
    log(`mail ${job.id} attempt ${job.attempts} failed (${error}); next in ${Math.round(delay / 1000)} s`);
  }

  async function handle(job: MailJob): Promise<void> {
    if (!(await markMailSending(job.id, id, until()))) {
      log(`mail ${job.id}: lease lost before sending; another worker has it`);
      return;
    }
    const beat = setInterval(() => void extendMailLease(job.id, id, 'sending', until()).catch(() => undefined), Math.max(200, Math.floor(leaseMs / 3)));
    try {
      await sendMail({ to: job.recipient, subject: job.subject, text: job.text, html: job.html || undefined, messageId: job.messageId });
    } catch (err) {
      const kind = classifySendError(err);
      const msg = `Mail server: ${(err as Error).message}`.slice(0, 400);
      if (kind === 'retry') await retryOrFail(job, 'sending', msg);
      else if (kind === 'permanent') await markMailFailed(job.id, id, 'sending', `The mail server refused the message: ${(err as Error).message}`);
      else await markMailFailed(job.id, id, 'sending', `${UNCERTAIN_MESSAGE} (${msg})`);
      return;
    } finally {
      clearInterval(beat);
    }
    await markMailSent(job.id, id);
    log(`mail ${job.id} (${job.kind}) sent to ${job.recipient}`);
  }

  async function runOnce(): Promise<boolean> {
    const claimed = await claimNextMailJob(id, until());
    if (!claimed) return false;
    if (claimed.orphaned) {
      await markMailFailed(claimed.job.id, id, 'sending', UNCERTAIN_MESSAGE);
      log(`mail ${claimed.job.id}: found in 'sending' after its worker stopped; settled as uncertain`);
      return true;
    }
    await handle(claimed.job);
    return true;
  }

  const loop = startPollingLoop({ runOnce, pollMs, log });
  return { id, runOnce, stop: () => loop.stop() };
}
