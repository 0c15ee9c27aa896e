import { NextResponse } from 'next/server';
import { route } from '@/lib/http/handler';
import { requireViewer } from '@/lib/embed/access';
import type { EmbedWidgetPayload } from '@/lib/embed/payload';
import { getLogo } from '@/db/logos';

// The widget for the embed page, authorised by the bearer token alone (client viewers have no session).
export const GET = route<{ id: string }>(async (req, ctx) => {
  const { id } = await ctx.params;
  const v = await requireViewer(req, id);
  const w = v.widget;
  const logo = w.showLogo ? await getLogo(v.pass.firmId) : null;
  const payload: EmbedWidgetPayload = {
    passId: v.pass.id,
    clientName: v.client.name,
    widget: { id: w.id, title: w.title, panels: w.panels, headline: w.headline, dialIds: w.dialIds, brandColor: w.brandColor, showLogo: w.showLogo },
    model: w.model,
    branding: { firmName: w.firmName, brandColor: w.brandColor, showLogo: w.showLogo, logoUrl: logo ? `/api/branding/logo/${v.pass.firmId}?v=${logo.hash.slice(0, 12)}` : null },
    versionInfo: { number: w.versionNumber, createdAt: w.versionCreatedAt, checkState: w.versionCheckState, checkedAt: w.checkedAt, checkerName: w.checkerName, authorName: w.authorName },
  };
  return NextResponse.json(payload, { headers: { 'Cache-Control': 'no-store' } });
});
