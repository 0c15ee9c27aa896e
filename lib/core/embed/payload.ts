// What the embed page receives for a pass: the widget, its version's model, branding and sign-off.
// No React and no server imports: the embed bundle imports these types.
import type { CheckedModel } from '@/lib/core/engine/checked-model';

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
  /** Checked on the server when the version was saved: the embed page trusts it and loads no schema. */
  model: CheckedModel;
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
  /**
   * The version's result at its default dial values, computed by the server's run pool when the version was signed
   * off or published (the same engine, seed and trials give the same numbers as the viewer's browser). Absent while
   * it is being computed: the page then runs the model itself. `result` is the encoded RunResult
   * (lib/core/embed/first-figures.ts).
   */
  firstFigures?: { result: unknown; computedAt: string; early: EarlyFigure | null };
}

/** The headline figure and the cautions in words, for the inline early paint (null when the widget shows no headline). */
export interface EarlyFigure {
  label: string;
  value: string;
  sub: string | null;
  /** The trial count as the widget prints it. */
  trials: string;
  cautions: { title: string; text: string; low: boolean }[];
}

export interface EmbedSessionResponse {
  token: string;
  /** Seconds since the epoch. */
  expiresAt: number;
  passId: string;
  /** The widget payload, when the exchange asked for it (`widget: true`): the embed page's first request. */
  widget?: EmbedWidgetPayload;
}

export interface DialBounds {
  id: string;
  min: number;
  max: number;
}

/** The dials a viewer may move: the widget's dial ids that the model defines, in the model's order. */
export function viewerDials(model: CheckedModel, dialIds: readonly string[]): DialBounds[] {
  return model.dials.filter((d) => dialIds.includes(d.id)).map((d) => ({ id: d.id, min: d.min, max: d.max }));
}
