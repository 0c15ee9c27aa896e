import { z } from 'zod';
import { route, json } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { listAudit } from '@/db/audit';
import { validationError } from '@/lib/http/errors';

const query = z.object({ before: z.coerce.number().int().positive().optional() });
const PAGE = 50;

export const GET = route(async (req) => {
  const m = await requireMember('audit.read');
  const parsed = query.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!parsed.success) throw validationError(parsed.error);
  const entries = await listAudit(m.firmId, { limit: PAGE, beforeId: parsed.data.before });
  return json({ entries, nextBefore: entries.length === PAGE ? entries[entries.length - 1]!.id : null });
});
