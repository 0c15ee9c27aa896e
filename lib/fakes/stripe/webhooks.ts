// Webhook delivery: events are POSTed one at a time in creation order, signed the way Stripe signs
// them (`Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<body>" keyed with the
// endpoint secret>`), and retried with exponential backoff while the app answers non-2xx or is
// unreachable. A failing event does not hold back later ones (as at Stripe), so during retries the
// app sees events out of order. Pending deliveries live in the state file and resume after a restart.
import { createHmac } from 'node:crypto';
import type { FakeStripe } from './fake';
import type { StoredEvent } from './state';

export function signatureHeader(payload: string, secret: string, timestamp: number): string {
  const v1 = createHmac('sha256', secret).update(`${timestamp}.${payload}`, 'utf8').digest('hex');
  return `t=${timestamp},v1=${v1}`;
}

/** Delay before attempt n+1 after n failed attempts: base · 2^(n−1), capped. */
export function backoffMs(failedAttempts: number, baseMs: number, maxMs: number): number {
  return Math.min(maxMs, baseMs * 2 ** Math.max(0, failedAttempts - 1));
}

export class Deliverer {
  private timer: NodeJS.Timeout | null = null;
  private running = false;
  private stopped = false;
  private draining: Promise<void> = Promise.resolve();
  private readonly idleWaiters = new Set<() => void>();
  private readonly unsubscribe: () => void;

  constructor(private readonly fake: FakeStripe) {
    this.unsubscribe = fake.onWake(() => this.kick());
  }

  /** A restart is a natural moment to retry: pending events are due at once, in order. */
  start(): void {
    const now = Date.now();
    for (const e of this.fake.state.events) {
      if (e.delivery.status === 'pending') e.delivery.nextAttemptAt = Math.min(e.delivery.nextAttemptAt ?? now, now);
    }
    this.kick();
  }

  /** Stops scheduling and waits for a delivery in flight, so its outcome is recorded before the state is saved. */
  async stop(): Promise<void> {
    this.stopped = true;
    this.unsubscribe();
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    for (const done of [...this.idleWaiters]) done();
    this.idleWaiters.clear();
    await this.draining;
  }

  pendingCount(): number {
    return this.fake.state.events.filter((e) => e.delivery.status === 'pending').length;
  }

  /** Resolves once no event is pending (delivered, given up, or no endpoint), or after `timeoutMs`. */
  waitForIdle(timeoutMs: number): Promise<boolean> {
    if (this.pendingCount() === 0) return Promise.resolve(true);
    return new Promise((resolve) => {
      const timer = setTimeout(() => {
        this.idleWaiters.delete(done);
        resolve(false);
      }, timeoutMs);
      const done = () => {
        clearTimeout(timer);
        this.idleWaiters.delete(done);
        resolve(this.pendingCount() === 0);
      };
      this.idleWaiters.add(done);
    });
  }

  kick(): void {
    if (this.stopped || this.running) return;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    this.running = true;
    this.draining = this.drain().finally(() => {
      this.running = false;
      if (!this.stopped) this.schedule();
    });
  }

  private schedule(): void {
    const pending = this.fake.state.events.filter((e) => e.delivery.status === 'pending');
    if (pending.length === 0) {
      for (const done of [...this.idleWaiters]) done();
      return;
    }
    const next = Math.min(...pending.map((e) => e.delivery.nextAttemptAt ?? Date.now()));
    if (next <= Date.now()) {
      this.kick();
      return;
    }
    this.timer = setTimeout(() => this.kick(), next - Date.now());
    this.timer.unref?.();
  }

  private async drain(): Promise<void> {
    for (;;) {
      if (this.stopped) return;
      const now = Date.now();
      const due = this.fake.state.events.find(
        (e) => e.delivery.status === 'pending' && (e.delivery.nextAttemptAt ?? 0) <= now,
      );
      if (!due) return;
      await this.deliver(due);
    }
  }

  private async deliver(stored: StoredEvent): Promise<void> {
    const { webhookUrl, webhookSecret, retry, log } = this.fake.settings;
    const eventId = stored.event.id;
    if (!webhookUrl || !webhookSecret) {
      stored.delivery.status = 'no_endpoint';
      stored.delivery.nextAttemptAt = null;
      this.fake.persist();
      return;
    }
    const payload = JSON.stringify(stored.event, null, 2);
    const started = Date.now();
    let status: number | null = null;
    let error: string | null = null;
    try {
      const res = await fetch(webhookUrl, {
        method: 'POST',
        headers: {
          'Content-Type': 'application/json; charset=utf-8',
          'User-Agent': 'Stripe/1.0 (+https://stripe.com/docs/webhooks)',
          'Stripe-Signature': signatureHeader(payload, webhookSecret, Math.floor(Date.now() / 1000)),
        },
        body: payload,
        redirect: 'manual',
        signal: AbortSignal.timeout(retry.timeoutMs),
      });
      status = res.status;
      await res.arrayBuffer().catch(() => undefined);
      if (status < 200 || status >= 300) error = `HTTP ${status}`;
    } catch (err) {
      error = err instanceof Error ? (err.cause instanceof Error ? err.cause.message : err.message) : String(err);
    }
    // A reset during the request removes the event; nothing to record then.
    const current = this.fake.state.events.find((e) => e.event.id === eventId);
    if (!current) return;
    current.delivery.attempts.push({ at: started, status, error });
    if (!error) {
      current.delivery.status = 'delivered';
      current.delivery.nextAttemptAt = null;
      (current.event as { pending_webhooks: number }).pending_webhooks = 0;
    } else {
      const failed = current.delivery.attempts.length;
      const firstAt = current.delivery.attempts[0].at;
      if (Date.now() - firstAt >= retry.maxAgeMs) {
        current.delivery.status = 'failed';
        current.delivery.nextAttemptAt = null;
        log(`webhook ${current.event.type} ${eventId}: giving up after ${failed} attempts (${error})`);
      } else {
        const wait = backoffMs(failed, retry.baseMs, retry.maxMs);
        current.delivery.nextAttemptAt = Date.now() + wait;
        log(`webhook ${current.event.type} ${eventId}: attempt ${failed} failed (${error}); retrying in ${wait} ms`);
      }
    }
    this.fake.persist();
  }
}
