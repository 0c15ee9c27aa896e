import { z } from 'zod';
import { route, json } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { validationError } from '@/lib/server/http/errors';
import { auditPage } from '@/lib/server/firm/service';

const query = z.object({ before: z.coerce.number().int().positive().optional() });

export const GET = route(async (req) => {
  const m = await requireMember('audit.read');
  const parsed = query.safeParse(Object.fromEntries(req.nextUrl.searchParams));
  if (!parsed.success) throw validationError(parsed.error);
  return json(await auditPage(m, parsed.data.before));
});
