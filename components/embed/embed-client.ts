// The embed page's API client, over the app's one request helper (lib/client/request.ts: no SWR, no zod). The bearer
// token lives only in this closure (never in cookies or storage): a browser would not send the app's cookies
// inside a cross-site frame, and the page needs none.
import { ApiError, requestJson, type Fallback, type RequestOptions } from '@/lib/client/request';
import type { EmbedSessionResponse, EmbedWidgetPayload } from '@/lib/core/embed/payload';

/** How long the frame waits for the loader's pass before it says the pass is missing. */
export const PASS_WAIT_MS = 10_000;

/** The element EmbedApp shows while loading; the inline early start paints the server's first figures into it. */
export const EARLY_SLOT_ID = 'stochos-early';

const CANNOT_SHOW = 'This widget cannot be shown';

// A refusal without a readable body still reads as a heading and a sentence in the frame.
const embedFallback: Fallback = (status) =>
  status === 429
    ? { code: 'rate_limited', title: 'Too many requests', message: 'Too many requests. Wait a moment and try again.' }
    : { code: status === 401 ? 'unauthorized' : 'unavailable', title: CANNOT_SHOW, message: `${CANNOT_SHOW}. Reload the page to try again.` };

/** What the frame shows instead of the widget: the server's heading and text (a refusal without a heading gets a general one). */
export function refusalOf(err: unknown): { status: number; title: string; body: string } {
  if (err instanceof ApiError && err.status > 0) {
    return err.title ? { status: err.status, title: err.title, body: err.detail } : { status: err.status, title: CANNOT_SHOW, body: err.message };
  }
  return { status: 0, title: CANNOT_SHOW, body: 'Check the connection and reload the page.' };
}

/** "E-mail this view" in words: accepted (202) with the server's sentence, or what was wrong (null: say to try again). */
export interface SnapshotAnswer {
  ok: boolean;
  message: string | null;
}

export interface EmbedClient {
  loadWidget(): Promise<EmbedWidgetPayload>;
  reportDial(dialId: string, value: number): Promise<void>;
  /** Never throws: a refusal says what was wrong (the address, first); a lost connection, an ended session or a server fault gives null. */
  sendSnapshot(body: { email: string; dialValues: Record<string, number>; pinnedDialValues?: Record<string, number>; version?: number }): Promise<SnapshotAnswer>;
}

const base: RequestOptions = { credentials: 'omit', cache: 'no-store', fallback: embedFallback };

/** The refusal the early start met, as the error the page's own steps would have thrown. */
export function earlyRefusal(status: number, message: string | null, title: string | null): ApiError {
  const f = embedFallback(status);
  return new ApiError(status, f.code, message ?? f.message, { title: title ?? (message ? undefined : f.title) });
}

/** `session`: a token the page already holds for this pass (the early start's exchange). */
export function createEmbedClient(o: { passId: string; pass: string; origin: string | null; session?: { token: string; expiresAt: number } }): EmbedClient {
  let token: string | null = o.session?.token ?? null;
  let expiresAt = (o.session?.expiresAt ?? 0) * 1000;

  async function exchange(): Promise<void> {
    const s = await requestJson<EmbedSessionResponse>('/api/embed/session', { ...base, method: 'POST', body: { passId: o.passId, pass: o.pass, origin: o.origin } });
    token = s.token;
    expiresAt = s.expiresAt * 1000;
  }

  /** One call with the bearer; a refused token is exchanged again once (it may simply have run out). */
  async function call<T>(method: 'GET' | 'POST', path: string, body?: unknown): Promise<T> {
    for (let attempt = 0; ; attempt++) {
      if (!token || expiresAt - Date.now() < 30_000) await exchange();
      try {
        return await requestJson<T>(path, { ...base, method, body, headers: { authorization: `Bearer ${token}` } });
      } catch (err) {
        if (attempt > 0 || !(err instanceof ApiError) || err.status !== 401) throw err;
        token = null;
      }
    }
  }

  const passPath = `/api/embed/passes/${encodeURIComponent(o.passId)}`;
  return {
    loadWidget: () => call<EmbedWidgetPayload>('GET', `${passPath}/widget`),
    reportDial: async (dialId, value) => {
      await call<void>('POST', `${passPath}/events`, { kind: 'dial', dialId, value });
    },
    sendSnapshot: (body) =>
      call<{ message?: string } | undefined>('POST', `${passPath}/snapshots`, body).then(
        (a) => ({ ok: true, message: a?.message ?? null }),
        (err: unknown) => {
          const refused = err instanceof ApiError && err.status >= 400 && err.status < 500 && err.status !== 401;
          return { ok: false, message: refused ? ((err.status === 422 && err.fields?.email?.[0]) || err.message) : null };
        },
      ),
  };
}
