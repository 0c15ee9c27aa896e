import { z } from 'zod';

// The embed page's server-side check travels from proxy.ts to the page on the request: proxy.ts runs it anyway (the
// frame-ancestors of the response depend on it), and the page, a Pages Router page (pages/embed/[passId].tsx), may
// not import the server-only modules that do it. proxy.ts always sets or removes this header on the request it
// forwards, so a value sent by the browser never reaches the page.
export const FRAME_VERDICT_HEADER = 'x-stochos-embed-frame';

const failures = ['missing', 'malformed', 'invalid', 'mismatch', 'expired', 'revoked', 'rotated', 'archived', 'unpublished', 'origin'] as const;

export const frameVerdictSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('framable'), passId: z.string(), firmName: z.string().nullable(), allowedOrigins: z.array(z.string()) }),
  z.object({ kind: z.literal('refused'), failure: z.enum(failures), firmName: z.string().nullable(), allowedOrigins: z.array(z.string()) }),
  // The check failed; `reference` is the id its log line carries.
  z.object({ kind: z.literal('error'), reference: z.string() }),
]);
export type FrameVerdict = z.infer<typeof frameVerdictSchema>;

/** Header values are ASCII: the JSON (a firm's name may not be) goes URI-encoded. */
export const encodeFrameVerdict = (v: FrameVerdict): string => encodeURIComponent(JSON.stringify(v));

export function decodeFrameVerdict(header: string | string[] | undefined | null): FrameVerdict | null {
  if (typeof header !== 'string' || !header) return null;
  try {
    const r = frameVerdictSchema.safeParse(JSON.parse(decodeURIComponent(header)));
    return r.success ? r.data : null;
  } catch {
    return null;
  }
}
