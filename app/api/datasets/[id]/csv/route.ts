import { z } from 'zod';
import { route, parseParams } from '@/lib/http/handler';
import { requireMember } from '@/lib/auth/guard';
import { getDataset } from '@/db/datasets';
import { notFound } from '@/lib/http/errors';
import { datasetCsv } from '@/lib/datasets/export';

const params = z.object({ id: z.uuid() });

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, params);
  const ds = await getDataset(m.firmId, id);
  if (!ds) throw notFound('That dataset');
  const slug = ds.name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 60) || 'dataset';
  return new Response(datasetCsv(ds.name, ds.unit, ds.values), {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${slug}.csv"`,
      'X-Content-Type-Options': 'nosniff',
      'Cache-Control': 'private, no-store',
    },
  });
});
