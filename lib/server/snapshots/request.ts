import 'server-only';
import { createHmac } from 'node:crypto';
import { writeTransaction } from '@/db/knex';
import { newId, nowIso } from '@/db/ids';
import { recordPassEvent } from '@/db/passes';
import { countRequestsSince, insertSnapshotJob, type RateKey } from '@/db/snapshots';
import { env } from '@/lib/server/env';
import { AppError, fieldError } from '@/lib/server/http/errors';
import { clientAddress } from '@/lib/server/http/client-address';
import type { Viewer } from '@/lib/server/embed/access';
import { viewerDials } from '@/lib/core/embed/payload';
import type { CheckedModel } from '@/lib/core/engine/checked-model';
import { SNAPSHOT_LIMITS, SNAPSHOT_WINDOW_MS, limitMessage, retryAfterSeconds, type LimitKind } from './limits';
import { domainAllowed, normaliseEmail, type SnapshotAccepted, type SnapshotRequestInput } from './schemas';

// A viewer's "e-mail this view": every check happens before anything is stored, so a refusal queues nothing.

/** The requesting network address, keyed with the app secret (rate limiting needs equality, not the address). */
export function requesterHash(req: Request): string {
  const ip = clientAddress(req);
  return createHmac('sha256', env().authSecret).update(`snapshot-requester:${ip}`).digest('hex');
}

/** The deterministic Message-ID of a job's e-mail: a resend (by any worker) carries the same id. */
export function snapshotMessageId(jobId: string): string {
  const host = new URL(env().APP_URL).hostname || 'stochos.local';
  return `<snapshot-${jobId}@${host}>`;
}

/** Dial values checked against the widget's viewer dials; missing dials take the author's value. */
export function checkDialValues(model: CheckedModel, dialIds: readonly string[], given: Record<string, number>): Record<string, number> {
  const bounds = viewerDials(model, dialIds);
  const fields: Record<string, string[]> = {};
  for (const [id, v] of Object.entries(given)) {
    const b = bounds.find((d) => d.id === id);
    if (!b) {
      fields[`dialValues.${id}`] = [`This widget has no dial '${id}' that viewers may move.`];
      continue;
    }
    // The same forgiveness as the dial events: decimal rounding in typed entries, nothing more.
    const tol = 1e-9 * Math.max(1, Math.abs(b.min), Math.abs(b.max));
    if (v < b.min - tol || v > b.max + tol) fields[`dialValues.${id}`] = [`The value ${v} is outside the dial's range (${b.min} to ${b.max}).`];
  }
  if (Object.keys(fields).length) throw new AppError('validation_failed', 'Some dial values cannot be used for this widget.', { fields });
  const out: Record<string, number> = {};
  for (const b of bounds) {
    const d = model.dials.find((x) => x.id === b.id);
    const v = given[b.id] ?? d?.default;
    if (v !== undefined) out[b.id] = Math.min(b.max, Math.max(b.min, v));
  }
  return out;
}

/** Field paths of the pinned view's dial values say so (pinnedDialValues.<id>). */
function prefixed<T>(fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    if (err instanceof AppError && err.fields) {
      const fields = Object.fromEntries(Object.entries(err.fields).map(([k, v]) => [k.replace(/^dialValues\./, 'pinnedDialValues.'), v]));
      throw new AppError('validation_failed', 'Some dial values of the pinned view cannot be used for this widget.', { fields });
    }
    throw err;
  }
}

export async function requestSnapshot(v: Viewer, input: SnapshotRequestInput, requester: string): Promise<SnapshotAccepted> {
  const email = normaliseEmail(input.email);
  if (!email.ok) throw fieldError('email', email.message);
  if (!v.client.snapshotAnyAddress && v.client.allowedEmailDomains.length === 0) {
    throw new AppError('forbidden', `Snapshots of this widget cannot be e-mailed: ${v.widget.firmName} has not named any e-mail domain of your organisation for them. Ask them to add one.`, {
      fields: { email: ['No e-mail domain is allowed for snapshots of this widget.'] },
    });
  }
  if (!domainAllowed(email.domain, v.client)) {
    const list = v.client.allowedEmailDomains.map((d) => `@${d}`).join(', ');
    throw new AppError('forbidden', `Snapshots of this widget can only be sent to addresses at ${list}. ${email.domain} is not one of them.`, {
      fields: { email: [`Use an address at ${list}.`] },
    });
  }
  if (input.version !== undefined && input.version !== v.widget.versionNumber) {
    throw new AppError('conflict', `This widget was updated to version ${v.widget.versionNumber} while you were viewing it. Reload the page, then ask for the snapshot again.`);
  }
  const dialValues = checkDialValues(v.widget.model, v.widget.dialIds, input.dialValues);
  const pinnedDialValues = input.pinnedDialValues ? prefixed(() => checkDialValues(v.widget.model, v.widget.dialIds, input.pinnedDialValues!)) : null;

  const keys: [LimitKind, RateKey][] = [
    ['recipient', { recipient: email.address.toLowerCase() }],
    ['requester', { requesterHash: requester }],
    ['pass', { passId: v.pass.id }],
  ];
  // The three limits are checked and the job inserted under a lock per limit key, held by every instance alike.
  const locks = keys.map(([kind, key]) => `snapshot-limit:${kind}:${Object.values(key)[0]}`);
  return writeTransaction(async (trx) => {
    const now = Date.now();
    const since = new Date(now - SNAPSHOT_WINDOW_MS).toISOString();
    for (const [kind, key] of keys) {
      const c = await countRequestsSince(key, since, trx);
      if (c.count >= SNAPSHOT_LIMITS[kind]) {
        const retryAfter = retryAfterSeconds(c.oldest, now);
        throw new AppError('rate_limited', limitMessage(kind, retryAfter), { retryAfter });
      }
    }
    const id = newId();
    await insertSnapshotJob(
      {
        id,
        firmId: v.pass.firmId,
        clientId: v.client.id,
        passId: v.pass.id,
        widgetId: v.widget.id,
        versionId: v.widget.versionId,
        recipient: email.address.toLowerCase(),
        requesterHash: requester,
        dialValues,
        pinnedDialValues,
        messageId: snapshotMessageId(id),
        createdAt: nowIso(),
      },
      trx,
    );
    await recordPassEvent({ passId: v.pass.id, firmId: v.pass.firmId, kind: 'snapshot' }, trx);
    return { id, state: 'queued', recipient: email.address.toLowerCase(), message: `On its way to ${email.address.toLowerCase()}. It usually arrives within a minute.` };
  }, { locks });
}
