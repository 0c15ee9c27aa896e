// A synchronous PostgreSQL handle with the few better-sqlite3 methods the API tests use (prepare().get/all/run,
// pragma, close), so the same tests set up and check rows on either database. The queries run in a worker thread;
// this thread waits on Atomics until the answer is there. Placeholders are SQLite's `?`.
import path from 'node:path';
import { MessageChannel, Worker, receiveMessageOnPort } from 'node:worker_threads';

interface Reply {
  rows?: Record<string, unknown>[];
  rowCount?: number;
  error?: string;
  code?: string;
}

/** `?` → `$1, $2, …`, leaving quoted text alone. */
export function numberPlaceholders(sql: string): string {
  let out = '';
  let n = 0;
  let quote: string | null = null;
  for (const ch of sql) {
    if (quote) {
      if (ch === quote) quote = null;
      out += ch;
    } else if (ch === "'" || ch === '"') {
      quote = ch;
      out += ch;
    } else if (ch === '?') out += `$${++n}`;
    else out += ch;
  }
  return out;
}

export class SyncPg {
  private readonly worker: Worker;
  private readonly flag = new Int32Array(new SharedArrayBuffer(4));
  private readonly channel = new MessageChannel();

  constructor(url: string) {
    this.worker = new Worker(path.join(__dirname, 'pg-sync-worker.mjs'), { workerData: { url, flag: this.flag.buffer } });
    this.worker.postMessage({ port: this.channel.port2 }, [this.channel.port2]);
    this.worker.unref();
  }

  query(sql: string, params: unknown[]): { rows: Record<string, unknown>[]; rowCount: number } {
    Atomics.store(this.flag, 0, 0);
    this.worker.postMessage({ sql: numberPlaceholders(sql), params });
    if (Atomics.wait(this.flag, 0, 0, 30_000) === 'timed-out') throw new Error(`PostgreSQL did not answer within 30 s: ${sql}`);
    const msg = receiveMessageOnPort(this.channel.port1)?.message as Reply | undefined;
    if (!msg) throw new Error(`No answer from the PostgreSQL worker for: ${sql}`);
    if (msg.error) throw Object.assign(new Error(msg.error), { code: msg.code });
    return { rows: msg.rows ?? [], rowCount: msg.rowCount ?? 0 };
  }

  prepare(sql: string) {
    return {
      get: (...params: unknown[]) => this.query(sql, params).rows[0],
      all: (...params: unknown[]) => this.query(sql, params).rows,
      run: (...params: unknown[]) => ({ changes: this.query(sql, params).rowCount }),
    };
  }

  /** SQLite pragmas mean nothing here. */
  pragma(): undefined {
    return undefined;
  }

  close(): void {
    void this.worker.terminate();
  }
}
