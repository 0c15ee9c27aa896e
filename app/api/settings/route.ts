import { route, readJson, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { settingsSchema } from '@/lib/auth/schemas';
import { getFirm, updateFirmSettings, type Firm } from '@/db/firms';
import { writeTransaction } from '@/db/knex';
import { recordAudit } from '@/db/audit';
import { notFound } from '@/lib/http/errors';

const view = (f: Firm) => ({ name: f.name, unitsDefault: f.unitsDefault, currencyDefault: f.currencyDefault, brandColor: f.brandColor, requireCheck: f.requireCheck, paperSize: f.paperSize });

export const GET = route(async () => {
  const m = await requireMember();
  const firm = await getFirm(m.firmId);
  if (!firm) throw notFound('Your firm');
  return json(view(firm));
});

export const PATCH = route(async (req) => {
  const m = await requireMember('settings.manage');
  const patch = await readJson(req, settingsSchema);
  const firm = await writeTransaction(async (trx) => {
    await updateFirmSettings(m.firmId, patch, trx);
    await recordAudit({ firmId: m.firmId, actorUserId: m.userId, action: 'settings.changed', targetType: 'firm', targetId: m.firmId, detail: patch }, trx);
    return getFirm(m.firmId, trx);
  });
  return json(view(firm!));
});
