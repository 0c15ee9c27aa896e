import { z } from 'zod';
import { route, noContent, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { revokeApiKey } from '@/db/api-keys';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { notFound } from '@/lib/http/errors';

export const DELETE = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('apikeys.manage');
  const { id } = parseParams(await ctx.params, z.object({ id: z.uuid() }));
  await writeTransaction(async (trx) => {
    if (!(await revokeApiKey(m.firmId, id, trx))) throw notFound('That API key');
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'apikey.revoked', targetType: 'api_key', targetId: id }, trx);
  });
  return noContent();
});
