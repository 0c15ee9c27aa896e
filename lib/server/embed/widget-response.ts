import 'server-only';
import { createHash } from 'node:crypto';
import type { Granted } from '@/lib/server/embed/access';
import type { EmbedWidgetPayload } from '@/lib/core/embed/payload';
import { modelJson } from '@/lib/server/embed/model-cache';
import type { StoredFirstFigures } from '@/db/first-figures';
import { earlyFigure } from '@/lib/server/embed/first-figures';

// The widget payload as an HTTP representation with a strong validator. The body is a pure function of the
// version id (whose model never changes) and a few small fields (titles, names, branding, sign-off), so the ETag
// is a hash of those alone: a revalidation with a matching If-None-Match costs no model serialisation. Stored first
// figures (immutable once computed) enter the hash by their time of computation and go into the body as stored text.

export interface WidgetRepresentation {
  etag: string;
  /** The JSON body; only built when asked for. */
  body(): string;
}

export function widgetRepresentation(v: Pick<Granted, 'pass' | 'client' | 'widget' | 'logoHash'>, first: StoredFirstFigures | null = null): WidgetRepresentation {
  const w = v.widget;
  const rest: Omit<EmbedWidgetPayload, 'model' | 'firstFigures'> = {
    passId: v.pass.id,
    clientName: v.client.name,
    widget: { id: w.id, title: w.title, panels: w.panels, headline: w.headline, dialIds: w.dialIds, brandColor: w.brandColor, showLogo: w.showLogo },
    branding: {
      firmName: w.firmName,
      brandColor: w.brandColor,
      showLogo: w.showLogo,
      logoUrl: w.showLogo && v.logoHash ? `/api/branding/logo/${v.pass.firmId}?v=${v.logoHash.slice(0, 12)}` : null,
    },
    versionInfo: { number: w.versionNumber, createdAt: w.versionCreatedAt, checkState: w.versionCheckState, checkedAt: w.checkedAt, checkerName: w.checkerName, authorName: w.authorName },
  };
  const restJson = JSON.stringify(rest);
  const etag = `"${createHash('sha256').update(w.versionId).update('\n').update(restJson).update('\n').update(first?.computedAt ?? '').digest('base64url').slice(0, 32)}"`;
  // Only when a body is sent (a 304 needs none): the early words decode the stored result once per process.
  const firstJson = () => {
    if (!first) return '';
    const early = w.panels.includes('headline') ? earlyFigure(first, w.headline) : null;
    return `,"firstFigures":{"computedAt":${JSON.stringify(first.computedAt)},"early":${JSON.stringify(early)},"result":${first.resultJson}}`;
  };
  return { etag, body: () => `${restJson.slice(0, -1)},"model":${modelJson(w.model)}${firstJson()}}` };
}

/** RFC 9110 §13.1.2: If-None-Match uses the weak comparison; `*` matches any current representation. */
export function ifNoneMatch(header: string | null, etag: string): boolean {
  if (!header) return false;
  if (header.trim() === '*') return true;
  const bare = (t: string) => t.trim().replace(/^W\//, '');
  return header.split(',').some((t) => bare(t) === bare(etag));
}
