import { route, parseParams } from '@/lib/server/http/handler';
import { requireMember } from '@/lib/server/auth/guard';
import { idParams } from '@/lib/server/http/params';
import { datasetExport } from '@/lib/server/datasets/service';

export const GET = route<{ id: string }>(async (_req, ctx) => {
  const m = await requireMember('models.read');
  const { id } = parseParams(await ctx.params, idParams);
  const { fileName, csv } = await datasetExport(m, id);
  return new Response(csv, {
    headers: {
      'Content-Type': 'text/csv; charset=utf-8',
      'Content-Disposition': `attachment; filename="${fileName}"`,
      'X-Content-Type-Options': 'nosniff',
      'Cache-Control': 'private, no-store',
    },
  });
});
