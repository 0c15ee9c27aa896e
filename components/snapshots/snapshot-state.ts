import type { StatusKind } from '@/components/ui/badge';
import type { SnapshotState } from '@/lib/core/api-types';

/** How a snapshot's delivery state reads in the dashboard: a pill shape and its words. */
export function snapshotStatus(state: SnapshotState, attempts: number): { kind: StatusKind; text: string } {
  switch (state) {
    case 'queued':
      return attempts > 0 ? { kind: 'warn', text: 'Waiting to retry' } : { kind: 'waiting', text: 'Queued' };
    case 'rendering':
      return { kind: 'info', text: 'Making the PDF' };
    case 'sending':
      return { kind: 'info', text: 'Sending' };
    case 'sent':
      return { kind: 'ok', text: 'Sent' };
    case 'failed':
      return { kind: 'stopped', text: 'Not sent' };
  }
}

// Socket and SMTP codes the worker records, in words an account owner can act on.
const CAUSES: ReadonlyArray<[RegExp, string]> = [
  [/ECONNREFUSED|ENOTFOUND|EHOSTUNREACH|ECONNRESET|ETIMEDOUT|ESOCKET|ECONNECTION|Greeting never received|timeout/i, 'The mail server could not be reached.'],
  [/\b55[0-4]\b|mailbox unavailable|user unknown|no such user|recipient/i, 'The mail server refused the recipient address.'],
  [/\b45[0-2]\b|try again later|temporar/i, 'The mail server was busy and asked us to try later.'],
  [/\b552\b|too large/i, 'The mail server refused the message as too large.'],
];

/** The last error of a job in plain words, with what happens next. */
export function snapshotErrorText(lastError: string | null, state: SnapshotState): string | null {
  if (!lastError) return null;
  const cause = CAUSES.find(([re]) => re.test(lastError))?.[1];
  const next = state === 'queued' ? ' It will be tried again automatically.' : state === 'failed' ? ' It will not be tried again; the viewer can ask for a new snapshot.' : '';
  // Messages the worker already wrote in words (e.g. "The widget ... no longer exists.") are shown as they are.
  if (!cause) return `${lastError.replace(/\s+/g, ' ').trim()}${/[.!?)]$/.test(lastError.trim()) ? '' : '.'}${next}`;
  return `${cause}${next}`;
}
