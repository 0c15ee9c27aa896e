import 'server-only';
import { countPassEventsSince, recordPassEvent, type PassEventKind, type PassRecord } from '@/db/passes';
import { writeBehind } from '@/lib/server/ops/write-behind';
import { AppError } from '@/lib/server/http/errors';
import { afterResponse } from '@/lib/server/ops/after-response';

// View analytics per pass. No personal data: a kind, a time and, for dials, which dial moved.
// Loads and dial moves are written in batches after the response (db/write-behind.ts): the read path never
// waits for the write lock, and the counts in the dashboard trail by at most EVENT_FLUSH_MS.

// Caps per pass in a ten-minute window (common practice, no source): enough for a busy meeting room, not a flood.
const WINDOW_MS = 10 * 60_000;
const CAP: Record<PassEventKind, number> = { load: 300, dial: 600, snapshot: 60 };

const since = () => new Date(Date.now() - WINDOW_MS).toISOString();

/** A page load always succeeds; past the cap it is simply not counted again (decided when the batch is written). */
export function noteLoad(pass: Pick<PassRecord, 'id' | 'firmId'>): void {
  afterResponse(writeBehind().addPassEvent({ passId: pass.id, firmId: pass.firmId, kind: 'load', at: new Date().toISOString(), detail: null, cap: { limit: CAP.load, since: since() } }), 'a page load');
}

/** Dial interactions past the cap are refused with 429 and not stored. */
export async function noteDial(pass: Pick<PassRecord, 'id' | 'firmId'>, dialId: string): Promise<void> {
  const s = since();
  if ((await countPassEventsSince(pass.id, 'dial', s)) + writeBehind().pendingCount(pass.id, 'dial') >= CAP.dial) {
    throw new AppError('rate_limited', 'Too many dial events from this widget; they are counted again in a few minutes.', { retryAfter: 60 });
  }
  afterResponse(writeBehind().addPassEvent({ passId: pass.id, firmId: pass.firmId, kind: 'dial', at: new Date().toISOString(), detail: dialId, cap: { limit: CAP.dial, since: s } }), 'a dial move');
}

/** For the snapshot service: a viewer asked for a PDF of this pass's widget. */
export async function noteSnapshot(pass: Pick<PassRecord, 'id' | 'firmId'>): Promise<void> {
  await recordPassEvent({ passId: pass.id, firmId: pass.firmId, kind: 'snapshot' });
}
