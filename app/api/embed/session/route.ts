import { z } from 'zod';
import { NextResponse } from 'next/server';
import { route, readJson } from '@/lib/server/http/handler';
import { titled } from '@/lib/server/http/errors';
import { checkPass } from '@/lib/server/embed/access';
import { viewerMessage } from '@/lib/server/embed/messages';
import { normaliseOrigin } from '@/lib/core/embed/schemas';
import { mintSessionToken } from '@/lib/server/embed/tokens';
import { noteLoad } from '@/lib/server/embed/events';
import type { EmbedSessionResponse } from '@/lib/core/embed/payload';
import { widgetRepresentation } from '@/lib/server/embed/widget-response';
import { firstFiguresFor } from '@/lib/server/embed/first-figures';

// The embed page exchanges the pass from its URL for a short-lived bearer token kept in memory
// (no cookies: a browser would not send them inside a cross-site frame anyway). With `widget: true` the answer also
// carries the widget payload (the same body as GET …/widget), so the page's first figures need one request, not
// two: the pass check that grants the token has just read everything the payload holds.
const body = z
  .object({
    passId: z.string().max(64),
    pass: z.string().min(1, 'The pass is missing.').max(2000),
    origin: z.string().max(300).nullable().optional(),
    widget: z.boolean().optional(),
  })
  .strict();

export const POST = route(async (req) => {
  const input = await readJson(req, body);
  const r = await checkPass(input.passId, input.pass);
  if (!r.ok) {
    const msg = viewerMessage(r.failure, r.firmName);
    throw titled(r.failure === 'mismatch' ? 'forbidden' : 'unauthorized', msg.title, msg.body);
  }
  let origin: string | null = null;
  if (input.origin) {
    const o = normaliseOrigin(input.origin);
    if (!o.ok || !r.client.allowedOrigins.includes(o.origin)) {
      const msg = viewerMessage('origin', r.widget.firmName);
      throw titled('forbidden', msg.title, msg.body);
    }
    origin = o.origin;
  }
  const session = await mintSessionToken({ passId: r.pass.id, passJti: r.passJti, keyVersion: r.client.keyVersion, origin }, r.passExpiresAt);
  noteLoad(r.pass);
  const res: EmbedSessionResponse = { token: session.token, expiresAt: session.expiresAt, passId: r.pass.id };
  if (!input.widget) return NextResponse.json(res, { headers: { 'Cache-Control': 'no-store' } });
  const widget = widgetRepresentation(r, await firstFiguresFor(r.pass.firmId, r.widget.versionId)).body();
  return new NextResponse(`${JSON.stringify(res).slice(0, -1)},"widget":${widget}}`, { headers: { 'Cache-Control': 'no-store', 'Content-Type': 'application/json' } });
});
