import 'server-only';
import type { Knex } from 'knex';
import { getDb, writeTransaction } from '@/db/knex';
import { nowIso } from '@/db/ids';
import { forUpdateSkipLocked, isPostgres } from '@/db/dialect';

// Lease-based job rows shared by the outgoing-work queues (snapshot_jobs, mail_jobs). Each table has the columns
// id, state, attempts, next_attempt_at, locked_by, locked_until, created_at, updated_at. A job moves
// queued → <work state> → sending → sent | failed; every move is conditional on the current state and lease
// holder, so two workers never both move the same job. 'sending' is the one step never repeated blindly.

export interface LeaseSpec {
  table: string;
  /** The state a claimed job is in before the send starts (its lease may run out and it is then taken again). */
  workState: string;
}

export interface Claim<R> {
  row: R;
  /** The job was found in 'sending' after its worker stopped: the caller settles it without sending again. */
  orphaned: boolean;
}

/** Takes the next due job for `workerId` with a lease until `leaseUntil`; `columns` are selected with alias `j`. */
export async function claimNext(spec: LeaseSpec, columns: string[], workerId: string, leaseUntil: string, now = nowIso()): Promise<Claim<Record<string, unknown>> | null> {
  const claim = async (trx: Knex.Transaction): Promise<Claim<Record<string, unknown>> | null> => {
    const due = trx(`${spec.table} as j`)
      .where((w) =>
        w
          .where((a) => a.where('j.state', 'queued').where('j.next_attempt_at', '<=', now))
          .orWhere((b) => b.whereIn('j.state', [spec.workState, 'sending']).where('j.locked_until', '<', now)),
      )
      .orderBy('j.next_attempt_at')
      .orderBy('j.created_at')
      .select(columns);
    const r = (await forUpdateSkipLocked(trx, due).first()) as Record<string, unknown> | undefined;
    if (!r) return null;
    if (r.state === 'sending') {
      await trx(spec.table).where({ id: r.id, state: 'sending' }).update({ locked_by: workerId, locked_until: leaseUntil, updated_at: now });
      return { row: { ...r, locked_by: workerId, locked_until: leaseUntil }, orphaned: true };
    }
    const attempts = Number(r.attempts) + 1;
    await trx(spec.table).where({ id: r.id, state: r.state }).update({ state: spec.workState, attempts, locked_by: workerId, locked_until: leaseUntil, updated_at: now });
    return { row: { ...r, state: spec.workState, attempts, locked_by: workerId, locked_until: leaseUntil }, orphaned: false };
  };
  // SQLite: the write lock makes the read and the claim one step. PostgreSQL: any number of workers claim at once,
  // each skipping the rows another has locked, in an ordinary transaction.
  const db = getDb();
  return isPostgres(db) ? db.transaction(claim) : writeTransaction(claim);
}

/** Moves a job this worker holds from one state to another; false when it no longer holds it. */
export async function transition(table: string, id: string, workerId: string, from: string, patch: Record<string, unknown>, trx?: Knex.Transaction): Promise<boolean> {
  const n = await (trx ?? getDb())(table)
    .where({ id, locked_by: workerId, state: from })
    .update({ ...patch, updated_at: nowIso() });
  return n === 1;
}

export const leaseOps = (table: string) => ({
  extendLease: (id: string, workerId: string, state: string, until: string) => transition(table, id, workerId, state, { locked_until: until }),
  markSent: (id: string, workerId: string) => transition(table, id, workerId, 'sending', { state: 'sent', sent_at: nowIso(), locked_by: null, locked_until: null, last_error: null }),
  markRetry: (id: string, workerId: string, from: string, error: string, nextAttemptAt: string) =>
    transition(table, id, workerId, from, { state: 'queued', next_attempt_at: nextAttemptAt, locked_by: null, locked_until: null, last_error: error.slice(0, 500) }),
  markFailed: (id: string, workerId: string, from: string, error: string) =>
    transition(table, id, workerId, from, { state: 'failed', locked_by: null, locked_until: null, last_error: error.slice(0, 500) }),
});
