'use client';

import { useCallback, useEffect, useRef, useState } from 'react';
import { WidgetView } from '@/components/widget/widget-view';
import { createEmbedEngine, dropWarmEngine, prewarmEmbedEngine } from '@/lib/core/engine/embed-engine';
import type { EmbedWidgetPayload } from '@/lib/core/embed/payload';
import { decodeRunResult } from '@/lib/core/embed/first-figures';
import type { RunResult } from '@/lib/core/engine/merge';
import { ApiError } from '@/lib/client/request';
import { createEmbedClient, EARLY_SLOT_ID, earlyRefusal, PASS_WAIT_MS, refusalOf, type EmbedClient } from './embed-client';
import type { EarlyStart } from './early-start';
import { EmbedNotice } from './embed-notice';
import { SnapshotRequestForm } from '@/components/snapshots/snapshot-request-form';

// The client viewer's page: receive the pass (from the loader by postMessage, or from the URL fragment of a
// direct link), exchange it for an in-memory bearer token, load the widget through the embed API, and show
// it. The pass is never in a URL the server sees. Dial moves are counted (one event per settled move).

const DIAL_SETTLE_MS = 800;
const LOADING_HTML = { __html: '<p role="status" class="text-sm text-ink-600">Loading the model…</p>' };

/**
 * The inline early start's work for this pass (early-start.tsx), taken once: the pass, the token and the widget,
 * fetched while the page's scripts loaded. Null when it did not run (the page then does the same steps itself).
 */
let taken: { passId: string; loaded: Promise<{ client: EmbedClient; payload: EmbedWidgetPayload }> } | null = null;
function takeEarlyStart(passId: string, origin: string | null, noPass: { title: string; body: string }): Promise<{ client: EmbedClient; payload: EmbedWidgetPayload }> | null {
  // Kept here once taken, so a second mount (React's development checks) finds it too.
  if (taken) return taken.passId === passId ? taken.loaded : null;
  const w = window as unknown as { __stochosStart?: EarlyStart };
  const early = w.__stochosStart;
  delete w.__stochosStart;
  if (!early || early.passId !== passId) return null;
  const loaded = early.outcome.then((o) => {
    if (!o.pass) throw missingPass(noPass.title, noPass.body);
    if (!o.ok) throw o.status === 0 ? new Error('network') : earlyRefusal(o.status, o.message, o.title);
    const client = createEmbedClient({ passId, pass: o.pass, origin, session: { token: o.token, expiresAt: o.expiresAt } });
    // The exchange carries the widget; should it not (a server from before that), the page asks for it.
    return o.payload ? { client, payload: o.payload as EmbedWidgetPayload } : client.loadWidget().then((payload) => ({ client, payload }));
  });
  taken = { passId, loaded };
  return loaded;
}


function missingPass(title: string, body: string): ApiError {
  return new ApiError(401, 'unauthorized', `${title}. ${body}`, { title });
}

type FirstFigures = { result: RunResult; computedAt: string };
type State = { phase: 'loading' } | { phase: 'ready'; payload: EmbedWidgetPayload; first: FirstFigures | null } | { phase: 'refused'; title: string; body: string };

/** The server's result at the author's values, when the payload carries one (older versions may not yet). */
function firstFiguresOf(p: EmbedWidgetPayload): FirstFigures | null {
  const f = p.firstFigures;
  return f && typeof f.computedAt === 'string' && f.result && typeof f.result === 'object' ? { result: decodeRunResult(f.result), computedAt: f.computedAt } : null;
}

/**
 * The pass for this frame. A fragment (`#pass=…`) is read and removed from the address at once. In a frame,
 * the page asks its parent, and takes an answer only from the parent window at the host origin the server
 * checked against the client's allowed origins, naming this pass.
 */
function receivePass(passId: string, origin: string | null): { promise: Promise<string | null>; cancel: () => void } {
  const fromFragment = new URLSearchParams(window.location.hash.slice(1)).get('pass');
  if (fromFragment) {
    window.history.replaceState(window.history.state, '', window.location.pathname + window.location.search);
    return { promise: Promise.resolve(fromFragment), cancel: () => undefined };
  }
  if (!origin || window.parent === window) return { promise: Promise.resolve(null), cancel: () => undefined };
  let cleanup = () => undefined as void;
  const promise = new Promise<string | null>((resolve) => {
    const onMessage = (e: MessageEvent) => {
      if (e.source !== window.parent || e.origin !== origin) return;
      const d = e.data as { type?: unknown; passId?: unknown; token?: unknown } | null;
      if (!d || typeof d !== 'object' || d.type !== 'stochos:pass' || d.passId !== passId || typeof d.token !== 'string') return;
      cleanup();
      resolve(d.token);
    };
    const timer = setTimeout(() => {
      cleanup();
      resolve(null);
    }, PASS_WAIT_MS);
    cleanup = () => {
      clearTimeout(timer);
      window.removeEventListener('message', onMessage);
    };
    window.addEventListener('message', onMessage);
    window.parent.postMessage({ type: 'stochos:ready', passId }, origin);
  });
  return { promise, cancel: () => cleanup() };
}

/** `noPass`: what to show when no pass arrives (worded on the server, so the viewer messages stay out of this bundle). */
export function EmbedApp({ passId, origin, firmName, noPass }: { passId: string; origin: string | null; firmName: string | null; noPass: { title: string; body: string } }) {
  const [state, setState] = useState<State>({ phase: 'loading' });
  const { title: noPassTitle, body: noPassBody } = noPass;
  const [client, setClient] = useState<EmbedClient | null>(null);
  const pending = useRef(new Map<string, ReturnType<typeof setTimeout>>());
  // The view the viewer sees, for "E-mail this view"; empty means the author's values.
  const [dialValues, setDialValues] = useState<Record<string, number>>({});

  useEffect(() => {
    let live = true;
    // The engine's workers start now, not at the first run. (Started before hydration, when this module loads, they
    // slowed the page's own start on a busy 2-core machine: first figures 1.7-2.1 s against 1.3 s from here.)
    prewarmEmbedEngine();
    let wait: ReturnType<typeof receivePass> | null = null;
    let loaded = takeEarlyStart(passId, origin, { title: noPassTitle, body: noPassBody });
    if (!loaded) {
      wait = receivePass(passId, origin);
      loaded = wait.promise.then(async (pass) => {
        if (!pass) throw missingPass(noPassTitle, noPassBody);
        const c = createEmbedClient({ passId, pass, origin });
        return { client: c, payload: await c.loadWidget() };
      });
    }
    loaded
      .then(({ client: c, payload }) => {
        if (!live) return;
        setClient(c);
        setState({ phase: 'ready', payload, first: firstFiguresOf(payload) });
      })
      .catch((err: unknown) => {
        if (!live) return;
        const r = refusalOf(err);
        dropWarmEngine();
        setState({ phase: 'refused', title: r.title, body: r.body });
      });
    const timers = pending.current;
    return () => {
      live = false;
      wait?.cancel();
      for (const t of timers.values()) clearTimeout(t);
    };
  }, [passId, origin, noPassTitle, noPassBody]);

  const onDialChange = useCallback((values: Record<string, number>, dialId: string | null) => {
    setDialValues(values);
    // A reset moves every dial back; analytics count moves of one dial.
    if (dialId === null) return;
    const value = values[dialId];
    if (value === undefined) return;
    const timers = pending.current;
    clearTimeout(timers.get(dialId));
    timers.set(
      dialId,
      setTimeout(() => {
        timers.delete(dialId);
        client?.reportDial(dialId, value).catch((err: unknown) => {
          // A pass revoked while the viewer works: the next call says so, and the widget gives way to the notice.
          const r = refusalOf(err);
          if (r.status === 401 || r.status === 403) setState({ phase: 'refused', title: r.title, body: r.body });
        });
      }, DIAL_SETTLE_MS),
    );
  }, [client]);

  if (state.phase === 'refused') return <EmbedNotice title={state.title} body={state.body} firmName={firmName} />;
  if (state.phase === 'loading' || !client) {
    // The slot's content is the inline early start's (it may already hold the server's first figures): React renders
    // it as fixed HTML and never hydrates or compares what is inside.
    return (
      <div className="rounded-lg border border-ink-200 bg-white px-5 py-4" aria-busy="true">
        <div id={EARLY_SLOT_ID} suppressHydrationWarning dangerouslySetInnerHTML={LOADING_HTML} />
      </div>
    );
  }
  const p = state.payload;
  const signedOffAt = p.versionInfo.checkState === 'signed_off' ? p.versionInfo.checkedAt : null;
  return (
    <WidgetView
      createEngine={createEmbedEngine}
      model={p.model}
      widget={p.widget}
      branding={{ firmName: p.branding.firmName, brandColor: p.branding.brandColor, logoUrl: p.branding.logoUrl }}
      versionInfo={{ number: p.versionInfo.number, signedOffAt }}
      firstFigures={state.first}
      onDialChange={onDialChange}
      actions={<SnapshotRequestForm send={client.sendSnapshot} dialValues={dialValues} version={p.versionInfo.number} />}
      headingLevel="h1"
    />
  );
}
