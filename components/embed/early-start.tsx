import { EARLY_SLOT_ID, PASS_WAIT_MS } from './embed-client';

// The embed page's first step, inline in its HTML, so that it runs as soon as the browser reads it instead of
// after the page's JavaScript has loaded and hydrated: take the pass (from the fragment of a direct link, or from
// the loader by postMessage, with the same checks as before), and exchange it for a bearer token and the widget in
// one request. When the widget comes with the server's first figures, their headline and cautions are painted at
// once into the loading slot (EARLY_SLOT_ID), whose content React never hydrates; EmbedApp replaces the slot with the
// widget. EmbedApp (embed-app.tsx) picks up the outcome from window.__stochosStart and removes it. Written without
// imports, helpers or outer names, because it is sent as its own source text.

/** What the early start leaves for EmbedApp. */
export type EarlyOutcome =
  | { pass: null }
  | { pass: string; ok: true; token: string; expiresAt: number; payload: unknown }
  | { pass: string; ok: false; status: number; message: string | null; title: string | null };

export interface EarlyStart {
  passId: string;
  outcome: Promise<EarlyOutcome>;
}

function earlyStart(passId: string, origin: string | null, waitMs: number, slotId: string): void {
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
  // The server's headline figure and cautions, in the markup of the widget's own headline card (text only, via
  // textContent: nothing from the payload is parsed as HTML).
  const paint = function (payload: unknown): void {
    const ff = payload && typeof payload === 'object' ? (payload as { firstFigures?: { early?: unknown } }).firstFigures : undefined;
    const e = ff && ff.early && typeof ff.early === 'object' ? (ff.early as { label?: unknown; value?: unknown; sub?: unknown; trials?: unknown; cautions?: unknown }) : null;
    const slot = document.getElementById(slotId);
    if (!e || typeof e.label !== 'string' || typeof e.value !== 'string' || !Array.isArray(e.cautions)) return;
    if (!slot) {
      // The answer came before the parser reached the slot: paint once it has.
      if (document.readyState === 'loading') document.addEventListener('DOMContentLoaded', function () { paint(payload); }, { once: true });
      return;
    }
    const el = function (tag: string, cls: string, text?: string): HTMLElement {
      const x = document.createElement(tag);
      x.className = cls;
      if (text !== undefined) x.textContent = text;
      return x;
    };
    const brand = (payload as { widget?: { brandColor?: unknown } }).widget;
    const card = el('div', 'rounded-lg border border-l-4 border-ink-200 bg-white px-4 py-3');
    card.setAttribute('aria-live', 'polite');
    card.setAttribute('aria-atomic', 'true');
    if (brand && typeof brand.brandColor === 'string' && /^#[0-9a-fA-F]{6}$/.test(brand.brandColor)) card.style.borderLeftColor = brand.brandColor;
    card.appendChild(el('p', 'text-sm text-ink-700', e.label));
    card.appendChild(el('p', 'num mt-0.5 text-3xl font-semibold whitespace-nowrap text-ink-900', e.value));
    if (typeof e.sub === 'string' && e.sub) card.appendChild(el('p', 'mt-1 text-[0.8125rem] text-ink-600', e.sub));
    const note = el('div', 'rounded-md border border-ink-200 bg-ink-50 px-3 py-2.5 text-[0.8125rem] leading-snug text-ink-700');
    note.setAttribute('role', 'note');
    note.setAttribute('aria-label', 'Cautions');
    note.appendChild(el('p', 'mb-1 text-[0.8125rem] font-semibold text-ink-900', 'Read with care'));
    const list = el('ul', 'space-y-1');
    for (const c of e.cautions as { title?: unknown; text?: unknown; low?: unknown }[]) {
      if (!c || typeof c.title !== 'string' || typeof c.text !== 'string') continue;
      const li = el('li', c.low === true ? 'font-medium text-warn-700' : '');
      li.appendChild(el('span', 'font-medium text-ink-800', c.title + ': '));
      li.appendChild(document.createTextNode(c.text));
      list.appendChild(li);
    }
    note.appendChild(list);
    const foot = el('p', 'text-xs text-ink-600', (typeof e.trials === 'string' ? e.trials + ' trials · ' : '') + 'computed by Stochos for the author’s values · loading the dials and charts…');
    foot.setAttribute('role', 'status');
    slot.replaceChildren(card, note, foot);
    slot.className = 'space-y-3';
  };
  const outcome = pass.then(function (p): EarlyOutcome | Promise<EarlyOutcome> {
    if (!p) return { pass: null };
    return fetch('/api/embed/session', {
      method: 'POST',
      headers: { 'content-type': 'application/json' },
      body: JSON.stringify({ passId: passId, pass: p, origin: origin, widget: true }),
      credentials: 'omit',
      cache: 'no-store',
    })
      .then(function (res): Promise<EarlyOutcome> {
        if (!res.ok) return refused(p, res);
        return res.json().then(function (s: { token: string; expiresAt: number; widget?: unknown }): EarlyOutcome {
          try {
            paint(s.widget);
          } catch {
            // The widget shows the same figures once the page's script has loaded.
          }
          return { pass: p, ok: true, token: s.token, expiresAt: s.expiresAt, payload: s.widget };
        });
      })
      .catch(function (): EarlyOutcome {
        return { pass: p, ok: false, status: 0, message: null, title: null };
      });
  });
  (window as unknown as { __stochosStart?: EarlyStart }).__stochosStart = { passId: passId, outcome: outcome };
}


/** The inline script, with this response's nonce (read from the request by the page's getServerSideProps). */
export function EarlyStartScript({ passId, origin, nonce }: { passId: string; origin: string | null; nonce: string | null }) {
  const args = [passId, origin, PASS_WAIT_MS, EARLY_SLOT_ID].map((a) => JSON.stringify(a).replace(/</g, '\\u003c')).join(',');
  return <script nonce={nonce ?? undefined} dangerouslySetInnerHTML={{ __html: `(${earlyStart.toString()})(${args});` }} />;
}
