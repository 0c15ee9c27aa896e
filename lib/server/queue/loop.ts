// The polling loop shared by the outgoing-work queues (snapshot PDFs, notification e-mails): take one due job,
// and when there was one look again at once, otherwise wait `pollMs`. `stop()` lets the job in hand finish.

export interface PollingLoop {
  stop(): Promise<void>;
}

export function startPollingLoop(o: { runOnce: () => Promise<boolean>; pollMs: number; log: (line: string) => void }): PollingLoop {
  let stopped = false;
  let current: Promise<unknown> = Promise.resolve();
  let timer: ReturnType<typeof setTimeout> | null = null;
  const loop = async () => {
    timer = null;
    if (stopped) return;
    let busy = false;
    try {
      const p = o.runOnce();
      current = p;
      busy = await p;
    } catch (err) {
      o.log(`worker error: ${(err as Error).stack ?? err}`);
    }
    if (!stopped) timer = setTimeout(loop, busy ? 0 : o.pollMs);
  };
  timer = setTimeout(loop, 0);
  return {
    async stop() {
      stopped = true;
      if (timer) clearTimeout(timer);
      await current.catch(() => undefined);
    },
  };
}

/** Delay before the next attempt: doubled per attempt from `base`, capped at `max`. */
export function backoffMs(attempts: number, base: number, max: number): number {
  return Math.min(max, base * 2 ** Math.max(0, attempts - 1));
}
