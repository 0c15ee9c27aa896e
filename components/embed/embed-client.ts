// The embed page's API client. The bearer token lives only in this closure (never in cookies or storage):
// a browser would not send the app's cookies inside a cross-site frame, and the page needs none.
import type { EmbedSessionResponse, EmbedWidgetPayload } from '@/lib/embed/payload';

/** How long the frame waits for the loader's pass before it says the pass is missing. */
export const PASS_WAIT_MS = 10_000;

export class EmbedAccessError extends Error {
  readonly status: number;
  readonly title: string;
  readonly body: string;
  constructor(status: number, message: string) {
    super(message);
    this.status = status;
    const i = message.indexOf('. ');
    this.title = i > 0 ? message.slice(0, i) : 'This widget cannot be shown';
    this.body = i > 0 ? message.slice(i + 2) : message;
  }
}

/** The error for a refused answer: the server's message, or a plain one for its status. */
export function accessError(status: number, serverMessage: string | null): EmbedAccessError {
  const fallback = status === 429 ? 'Too many requests. Wait a moment and try again.' : 'This widget cannot be shown. Reload the page to try again.';
  return new EmbedAccessError(status, serverMessage ?? fallback);
}

async function readError(res: Response): Promise<EmbedAccessError> {
  let message: string | null = null;
  try {
    const b = (await res.json()) as { error?: { message?: unknown } };
    if (typeof b.error?.message === 'string') message = b.error.message;
  } catch {
    // no body
  }
  return accessError(res.status, message);
}

export interface EmbedClient {
  loadWidget(): Promise<EmbedWidgetPayload>;
  reportDial(dialId: string, value: number): Promise<void>;
  /** "E-mail this view": the answer is returned as it is (202, or a refusal the form explains). */
  sendSnapshot(body: { email: string; dialValues: Record<string, number>; version?: number }): Promise<Response>;
}

/** `session`: a token the page already holds for this pass (the early start's exchange). */
export function createEmbedClient(o: { passId: string; pass: string; origin: string | null; session?: { token: string; expiresAt: number } }): EmbedClient {
  let token: string | null = o.session?.token ?? null;
  let expiresAt = (o.session?.expiresAt ?? 0) * 1000;

  async function exchange(): Promise<void> {
    const res = await fetch('/api/embed/session', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ passId: o.passId, pass: o.pass, origin: o.origin }),
      credentials: 'omit',
      cache: 'no-store',
    });
    if (!res.ok) throw await readError(res);
    const s = (await res.json()) as EmbedSessionResponse;
    token = s.token;
    expiresAt = s.expiresAt * 1000;
  }

  /** One call with the bearer; a refused token is exchanged again once (it may simply have run out). */
  async function call(method: 'GET' | 'POST', path: string, body?: unknown, acceptRefusals = false): Promise<Response> {
    for (let attempt = 0; attempt < 2; attempt++) {
      if (!token || expiresAt - Date.now() < 30_000) await exchange();
      const res = await fetch(path, {
        method,
        headers: { authorization: `Bearer ${token}`, ...(body === undefined ? {} : { 'content-type': 'application/json' }) },
        body: body === undefined ? undefined : JSON.stringify(body),
        credentials: 'omit',
        cache: 'no-store',
      });
      if (res.status === 401 && attempt === 0) {
        token = null;
        continue;
      }
      if (!res.ok && !(acceptRefusals && res.status >= 400 && res.status < 500 && res.status !== 401)) throw await readError(res);
      return res;
    }
    throw new EmbedAccessError(401, 'This widget cannot be shown. Reload the page to try again.');
  }

  const base = `/api/embed/passes/${encodeURIComponent(o.passId)}`;
  return {
    loadWidget: async () => (await (await call('GET', `${base}/widget`)).json()) as EmbedWidgetPayload,
    reportDial: async (dialId, value) => {
      await call('POST', `${base}/events`, { kind: 'dial', dialId, value });
    },
    sendSnapshot: (body) => call('POST', `${base}/snapshots`, body, true),
  };
}
