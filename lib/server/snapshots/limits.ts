// Snapshot request limits (common practice, no source): enough for a design review, too few to turn the widget
// into a mail cannon. Each counts requests accepted in the last hour.
export const SNAPSHOT_WINDOW_MS = 60 * 60_000;

export const SNAPSHOT_LIMITS = {
  recipient: 5,
  pass: 30,
  requester: 10,
} as const;

export type LimitKind = keyof typeof SNAPSHOT_LIMITS;

/** Seconds until the oldest counted request leaves the window (at least one). */
export function retryAfterSeconds(oldestIso: string | null, now = Date.now()): number {
  if (!oldestIso) return 60;
  return Math.max(1, Math.ceil((Date.parse(oldestIso) + SNAPSHOT_WINDOW_MS - now) / 1000));
}

/** "about 12 minutes" / "about 40 seconds": what the viewer reads. */
export function waitText(seconds: number): string {
  if (seconds < 90) return `${seconds} second${seconds === 1 ? '' : 's'}`;
  const m = Math.ceil(seconds / 60);
  return `${m} minute${m === 1 ? '' : 's'}`;
}

export function limitMessage(kind: LimitKind, seconds: number): string {
  const wait = waitText(seconds);
  switch (kind) {
    case 'recipient':
      return `This address has been sent ${SNAPSHOT_LIMITS.recipient} snapshots in the last hour, the most we send. Try again in ${wait}.`;
    case 'pass':
      return `This widget has sent ${SNAPSHOT_LIMITS.pass} snapshots in the last hour, the most it may. Try again in ${wait}.`;
    case 'requester':
      return `You have asked for ${SNAPSHOT_LIMITS.requester} snapshots in the last hour, the most we send. Try again in ${wait}.`;
  }
}
