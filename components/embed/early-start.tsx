import { headers } from 'next/headers';
import { PASS_WAIT_MS } from './embed-client';

// The embed page's first step, inline in its HTML, so that it runs as soon as the browser reads it instead of
// after the page's JavaScript has loaded and hydrated: take the pass (from the fragment of a direct link, or from
// the loader by postMessage, with the same checks as before), exchange it for a bearer token and fetch the widget.
// EmbedApp (embed-app.tsx) picks up the outcome from window.__stochosStart and removes it. Written without imports,
// helpers or outer names, because it is sent as its own source text.

/** What the early start leaves for EmbedApp. */
export type EarlyOutcome =
  | { pass: null }
  | { pass: string; ok: true; token: string; expiresAt: number; payload: unknown }
  | { pass: string; ok: false; status: number; message: string | null; title: string | null };

export interface EarlyStart {
  passId: string;
  outcome: Promise<EarlyOutcome>;
}

function earlyStart(passId: string, origin: string | null, waitMs: number): void {
  const pass = new Promise<string | null>(function (resolve) {
    const fromFragment = new URLSearchParams(window.location.hash.slice(1)).get('pass');
    if (fromFragment) {
      window.history.replaceState(window.history.state, '', window.location.pathname + window.location.search);
      resolve(fromFragment);
      return;
    }
    if (!origin || window.parent === window) {
      resolve(null);
      return;
    }
    const onMessage = function (e: MessageEvent) {
      if (e.source !== window.parent || e.origin !== origin) return;
      const d = e.data as { type?: unknown; passId?: unknown; token?: unknown } | null;
      if (!d || typeof d !== 'object' || d.type !== 'stochos:pass' || d.passId !== passId || typeof d.token !== 'string') return;
      clearTimeout(timer);
      window.removeEventListener('message', onMessage);
      resolve(d.token);
    };
    const timer = setTimeout(function () {
      window.removeEventListener('message', onMessage);
      resolve(null);
    }, waitMs);
    window.addEventListener('message', onMessage);
    window.parent.postMessage({ type: 'stochos:ready', passId: passId }, origin);
  });
  const refused = function (p: string, res: Response): Promise<EarlyOutcome> {
    return res
      .json()
      .then(
        function (b: { error?: { message?: unknown; title?: unknown } } | null) {
          const e = b && b.error;
          return { message: e && typeof e.message === 'string' ? e.message : null, title: e && typeof e.title === 'string' ? e.title : null };
        },
        function () {
          return { message: null, title: null };
        },
      )
      .then(function (r: { message: string | null; title: string | null }): EarlyOutcome {
        return { pass: p, ok: false, status: res.status, message: r.message, title: r.title };
      });
  };
  const outcome = pass.then(function (p): EarlyOutcome | Promise<EarlyOutcome> {
    if (!p) return { pass: null };
    return fetch('/api/embed/session', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ passId: passId, pass: p, origin: origin }),
      credentials: 'omit',
      cache: 'no-store',
    })
      .then(function (res): Promise<EarlyOutcome> {
        if (!res.ok) return refused(p, res);
        return res.json().then(function (s: { token: string; expiresAt: number }) {
          return fetch('/api/embed/passes/' + encodeURIComponent(passId) + '/widget', {
            headers: { authorization: 'Bearer ' + s.token },
            credentials: 'omit',
            cache: 'no-store',
          }).then(function (w): Promise<EarlyOutcome> {
            if (!w.ok) return refused(p, w);
            return w.json().then(function (payload: unknown): EarlyOutcome {
              return { pass: p, ok: true, token: s.token, expiresAt: s.expiresAt, payload: payload };
            });
          });
        });
      })
      .catch(function (): EarlyOutcome {
        return { pass: p, ok: false, status: 0, message: null, title: null };
      });
  });
  (window as unknown as { __stochosStart?: EarlyStart }).__stochosStart = { passId: passId, outcome: outcome };
}


/** The inline script, with this response's nonce (server component). */
export async function EarlyStartScript({ passId, origin }: { passId: string; origin: string | null }) {
  const nonce = (await headers()).get('x-nonce') ?? undefined;
  const args = [passId, origin, PASS_WAIT_MS].map((a) => JSON.stringify(a).replace(/</g, '\\u003c')).join(',');
  return <script nonce={nonce} dangerouslySetInnerHTML={{ __html: `(${earlyStart.toString()})(${args});` }} />;
}
