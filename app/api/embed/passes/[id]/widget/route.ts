import { NextResponse } from 'next/server';
import { route } from '@/lib/server/http/handler';
import { requireViewer } from '@/lib/server/embed/access';
import { ifNoneMatch, widgetRepresentation } from '@/lib/server/embed/widget-response';
import { firstFiguresFor } from '@/lib/server/embed/first-figures';

// The widget for the embed page, authorised by the bearer token alone (client viewers have no session).
// The pass is checked on every call; the payload carries a strong ETag, and a browser (or CDN) that holds it
// revalidates (no-cache) and gets 304 without a body when nothing changed. The version's first figures, once the
// server has computed them, come with it (and change the ETag).
export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = await ctx.params;
  const v = await requireViewer(req, id);
  const rep = widgetRepresentation(v, await firstFiguresFor(v.pass.firmId, v.widget.versionId));
  const headers = { ETag: rep.etag, 'Cache-Control': 'private, no-cache' };
  if (ifNoneMatch(req.headers.get('if-none-match'), rep.etag)) return new NextResponse(null, { status: 304, headers });
  return new NextResponse(rep.body(), { headers: { ...headers, 'Content-Type': 'application/json' } });
});
