// What the embed page receives for a pass: the widget, its version's model, branding and sign-off.
// No React and no server imports: the embed bundle imports these types.

export interface EmbedWidgetPayload {
  passId: string;
  clientName: string;
  widget: {
    id: string;
    title: string;
    panels: string[];
    headline: string;
    dialIds: string[];
    brandColor: string;
    showLogo: boolean;
  };
  model: unknown;
  /** logoUrl: the firm's uploaded logo when the widget shows the logo slot and a logo exists. */
  branding: { firmName: string; brandColor: string; showLogo: boolean; logoUrl: string | null };
  versionInfo: {
    number: number;
    createdAt: string;
    checkState: 'unchecked' | 'signed_off' | 'sent_back';
    checkedAt: string | null;
    checkerName: string | null;
    authorName: string | null;
  };
}

export interface EmbedSessionResponse {
  token: string;
  /** Seconds since the epoch. */
  expiresAt: number;
  passId: string;
}

export interface DialBounds {
  id: string;
  min: number;
  max: number;
}

/** The dials a viewer may move, read from the model JSON (tolerant: a dial without a finite range is left out). */
export function viewerDials(model: unknown, dialIds: readonly string[]): DialBounds[] {
  const dials = (model as { dials?: unknown } | null)?.dials;
  if (!Array.isArray(dials)) return [];
  const out: DialBounds[] = [];
  for (const d of dials as { id?: unknown; min?: unknown; max?: unknown }[]) {
    if (typeof d?.id !== 'string' || !dialIds.includes(d.id)) continue;
    if (typeof d.min !== 'number' || typeof d.max !== 'number' || !Number.isFinite(d.min) || !Number.isFinite(d.max)) continue;
    out.push({ id: d.id, min: d.min, max: d.max });
  }
  return out;
}
