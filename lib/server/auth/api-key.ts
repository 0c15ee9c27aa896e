import 'server-only';
import { headers } from 'next/headers';
import { findFirmByApiKey } from '@/db/api-keys';
import { requireMember } from '@/lib/server/auth/guard';
import { AppError } from '@/lib/server/http/errors';
import { writeBehind } from '@/lib/server/ops/write-behind';
import { afterResponse } from '@/lib/server/ops/after-response';
import type { Permission } from '@/lib/core/auth/permissions';

export interface ApiCaller {
  firmId: string;
  /** The member's user id, or null for an API key. */
  userId: string | null;
  /** The API key's id, or null for a signed-in member. */
  keyId: string | null;
  via: 'session' | 'api-key';
}

/** A signed-in member with the permission, or a firm API key sent as `Authorization: Bearer stk_...`. */
export async function requireMemberOrApiKey(permission: Permission): Promise<ApiCaller> {
  const auth = (await headers()).get('authorization');
  if (auth) {
    const match = /^Bearer\s+(stk_[A-Za-z0-9_-]{20,64})$/.exec(auth.trim());
    const found = match ? await findFirmByApiKey(match[1]!) : null;
    if (!found) throw new AppError('unauthorized', 'The API key is not valid or was revoked. The firm owner creates keys in Settings.');
    // Last use is written in a batch after the response, not under the write lock of this read.
    afterResponse(writeBehind().touchApiKey(found.keyId, new Date().toISOString()), "an API key's last use");
    return { firmId: found.firmId, userId: null, keyId: found.keyId, via: 'api-key' };
  }
  const m = await requireMember(permission);
  return { firmId: m.firmId, userId: m.userId, keyId: null, via: 'session' };
}
