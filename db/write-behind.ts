import 'server-only';
import type { Knex } from 'knex';
import { getDb } from '@/db/knex';
import type { Logger } from 'pino';
import type { PassEventKind } from '@/db/passes';

// Writes that ride on read paths (a page load or dial move counted for a pass, an API key's last use) are
// gathered in memory and written in one transaction every EVENT_FLUSH_MS, so the read path never waits for the
// database's write lock. `add` returns a promise that settles once the row is committed: route handlers hand it
// to Next's `after()`, and Next awaits those before a clean stop (SIGTERM), so a clean stop loses nothing.
// A failed flush is retried with the next batch; after MAX_ATTEMPTS the rows are logged and dropped.

export interface PendingPassEvent {
  passId: string;
  firmId: string;
  kind: PassEventKind;
  at: string;
  detail: string | null;
  /** At most `limit` events of this kind per pass since `since`, counting those already stored (others are dropped). */
  cap?: { limit: number; since: string };
}

interface Batch {
  events: PendingPassEvent[];
  apiKeysUsed: Map<string, string>;
  attempts: number;
  waiters: { resolve: () => void; reject: (e: unknown) => void }[];
}

const MAX_ATTEMPTS = 5;
const CHUNK = 100;

const newBatch = (): Batch => ({ events: [], apiKeysUsed: new Map(), attempts: 0, waiters: [] });

/** What the buffer needs from the server around it, read at each use (tests change the interval between files). */
export interface WriteBehindOptions {
  /** How long rows wait before they are written (EVENT_FLUSH_MS). */
  flushMs(): number;
  log(): Pick<Logger, 'warn' | 'error'>;
}

class WriteBehind {
  constructor(private readonly o: WriteBehindOptions) {}

  private batch = newBatch();
  private timer: NodeJS.Timeout | null = null;
  private flushing: Promise<void> = Promise.resolve();
  /** Events not yet committed, per pass and kind (for rate caps checked in the request). */
  private pending = new Map<string, number>();

  addPassEvent(e: PendingPassEvent): Promise<void> {
    this.batch.events.push(e);
    const k = `${e.passId}:${e.kind}`;
    this.pending.set(k, (this.pending.get(k) ?? 0) + 1);
    return this.wait();
  }

  touchApiKey(keyId: string, at: string): Promise<void> {
    this.batch.apiKeysUsed.set(keyId, at);
    return this.wait();
  }

  pendingCount(passId: string, kind: PassEventKind): number {
    return this.pending.get(`${passId}:${kind}`) ?? 0;
  }

  private wait(): Promise<void> {
    const b = this.batch;
    const p = new Promise<void>((resolve, reject) => b.waiters.push({ resolve, reject }));
    this.timer ??= setTimeout(() => void this.flush(), this.o.flushMs());
    return p;
  }

  /** Writes everything gathered so far; resolves when it is committed (or given up). */
  flush(): Promise<void> {
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    const b = this.batch;
    this.batch = newBatch();
    this.flushing = this.flushing.then(() => this.write(b));
    return this.flushing;
  }

  private async write(b: Batch): Promise<void> {
    if (!b.events.length && !b.apiKeysUsed.size) {
      for (const w of b.waiters) w.resolve();
      return;
    }
    try {
      await getDb().transaction((trx) => writeBatch(trx, b));
      this.settle(b);
      for (const w of b.waiters) w.resolve();
    } catch (err) {
      b.attempts++;
      if (b.attempts >= MAX_ATTEMPTS) {
        this.settle(b);
        this.o.log().error({ err, events: b.events.length, apiKeys: b.apiKeysUsed.size }, 'gave up writing batched events');
        for (const w of b.waiters) w.reject(err);
        return;
      }
      this.o.log().warn({ err, attempt: b.attempts }, 'batched event write failed; retrying with the next batch');
      // Merge into the current batch (older rows first) and make sure a flush is scheduled.
      const cur = this.batch;
      cur.events = [...b.events, ...cur.events];
      for (const [k, v] of b.apiKeysUsed) if (!cur.apiKeysUsed.has(k)) cur.apiKeysUsed.set(k, v);
      cur.waiters = [...b.waiters, ...cur.waiters];
      cur.attempts = Math.max(cur.attempts, b.attempts);
      this.timer ??= setTimeout(() => void this.flush(), this.o.flushMs() * 2 ** b.attempts);
    }
  }

  private settle(b: Batch): void {
    for (const e of b.events) {
      const k = `${e.passId}:${e.kind}`;
      const n = (this.pending.get(k) ?? 1) - 1;
      if (n > 0) this.pending.set(k, n);
      else this.pending.delete(k);
    }
  }
}

async function writeBatch(trx: Knex.Transaction, b: Batch): Promise<void> {
  // Apply caps per pass and kind against what is already stored.
  const groups = new Map<string, PendingPassEvent[]>();
  for (const e of b.events) {
    const k = `${e.passId}:${e.kind}`;
    const g = groups.get(k);
    if (g) g.push(e);
    else groups.set(k, [e]);
  }
  const rows: { pass_id: string; firm_id: string; kind: PassEventKind; at: string; detail: string | null }[] = [];
  const lastView = new Map<string, { firmId: string; at: string }>();
  for (const g of groups.values()) {
    const first = g[0]!;
    let room = g.length;
    if (first.cap) {
      const r = await trx('pass_events').where({ pass_id: first.passId, kind: first.kind }).where('at', '>=', first.cap.since).count({ n: '*' }).first();
      room = Math.max(0, first.cap.limit - Number(r?.n ?? 0));
    }
    for (const e of g.slice(0, room)) rows.push({ pass_id: e.passId, firm_id: e.firmId, kind: e.kind, at: e.at, detail: e.detail ? e.detail.slice(0, 200) : null });
    if (first.kind === 'load') {
      const at = g.reduce((m, e) => (e.at > m ? e.at : m), first.at);
      lastView.set(first.passId, { firmId: first.firmId, at });
    }
  }
  for (let i = 0; i < rows.length; i += CHUNK) await trx('pass_events').insert(rows.slice(i, i + CHUNK));
  for (const [passId, v] of lastView) {
    await trx('passes')
      .where({ id: passId, firm_id: v.firmId })
      .where((q) => q.whereNull('last_view_at').orWhere('last_view_at', '<', v.at))
      .update({ last_view_at: v.at });
  }
  for (const [id, at] of b.apiKeysUsed) {
    await trx('api_keys')
      .where({ id })
      .where((q) => q.whereNull('last_used_at').orWhere('last_used_at', '<', at))
      .update({ last_used_at: at });
  }
}

// One buffer per process (kept on globalThis so development reloads do not strand a batch); the first caller's
// options stay. Server code calls `writeBehind()` from lib/server/ops/write-behind.ts, which passes the environment's.
const g = globalThis as unknown as { __stochosWriteBehind?: WriteBehind };
export function writeBehindBuffer(o: WriteBehindOptions): WriteBehind {
  if (!g.__stochosWriteBehind) {
    const wb = new WriteBehind(o);
    g.__stochosWriteBehind = wb;
    // On a clean stop, write at once rather than at the next tick of the timer (Next awaits the requests' promises).
    // Only joined when someone (next start) already handles SIGTERM: a listener would otherwise cancel the default exit.
    if (process.listenerCount('SIGTERM') > 0) process.once('SIGTERM', () => void wb.flush());
  }
  return g.__stochosWriteBehind;
}
