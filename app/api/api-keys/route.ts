import { z } from 'zod';
import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { insertApiKey, listApiKeys } from '@/db/api-keys';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';

const createSchema = z.object({ name: z.string().trim().min(1, 'Name the key after what will use it.').max(80, 'Use at most 80 characters.') });

export const GET = route(async () => {
  const m = await requireMember('apikeys.manage');
  return json({ keys: await listApiKeys(m.firmId) });
});

export const POST = route(async (req) => {
  const m = await requireMember('apikeys.manage');
  const { name } = await readJson(req, createSchema);
  const key = await writeTransaction(async (trx) => {
    const k = await insertApiKey(m.firmId, name, m.userId, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'apikey.created', targetType: 'api_key', targetId: k.id, detail: { name, prefix: k.prefix } }, trx);
    return k;
  });
  return json({ key: { id: key.id, name, prefix: key.prefix, secret: key.secret } }, 201);
});
