import 'server-only';
import { countPassEventsSince, recordPassEvent, type PassEventKind, type PassRecord } from '@/db/passes';
import { AppError } from '@/lib/http/errors';

// View analytics per pass. No personal data: a kind, a time and, for dials, which dial moved.

// Caps per pass in a ten-minute window (common practice, no source): enough for a busy meeting room, not a flood.
const WINDOW_MS = 10 * 60_000;
const CAP: Record<PassEventKind, number> = { load: 300, dial: 600, snapshot: 60 };

const since = () => new Date(Date.now() - WINDOW_MS).toISOString();

/** A page load always succeeds; past the cap it is simply not counted again. */
export async function noteLoad(pass: Pick<PassRecord, 'id' | 'firmId'>): Promise<void> {
  if ((await countPassEventsSince(pass.id, 'load', since())) >= CAP.load) return;
  await recordPassEvent({ passId: pass.id, firmId: pass.firmId, kind: 'load' });
}

/** Dial interactions past the cap are refused with 429 and not stored. */
export async function noteDial(pass: Pick<PassRecord, 'id' | 'firmId'>, dialId: string): Promise<void> {
  if ((await countPassEventsSince(pass.id, 'dial', since())) >= CAP.dial) {
    throw new AppError('rate_limited', 'Too many dial events from this widget; they are counted again in a few minutes.', { retryAfter: 60 });
  }
  await recordPassEvent({ passId: pass.id, firmId: pass.firmId, kind: 'dial', detail: dialId });
}

/** For the snapshot service: a viewer asked for a PDF of this pass's widget. */
export async function noteSnapshot(pass: Pick<PassRecord, 'id' | 'firmId'>): Promise<void> {
  await recordPassEvent({ passId: pass.id, firmId: pass.firmId, kind: 'snapshot' });
}
