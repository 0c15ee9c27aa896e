'use client';

import { useCallback, useEffect, useMemo, useRef, useState } from 'react';
import { WidgetView } from '@/components/widget/widget-view';
import { createEmbedEngine } from '@/lib/engine/embed-engine';
import type { EmbedWidgetPayload } from '@/lib/embed/payload';
import { createEmbedClient, EmbedAccessError } from './embed-client';
import { EmbedNotice } from './embed-notice';
import { SnapshotRequestForm } from '@/components/snapshots/snapshot-request-form';

// The client viewer's page: exchange the pass in the URL for an in-memory bearer token, load the widget
// through the embed API, and show it. Dial moves are counted (one event per settled move, not per tick).

const DIAL_SETTLE_MS = 800;

type State = { phase: 'loading' } | { phase: 'ready'; payload: EmbedWidgetPayload } | { phase: 'refused'; title: string; body: string };

export function EmbedApp({ passId, origin, title, firmName, brandColor }: { passId: string; origin: string | null; title: string; firmName: string; brandColor: string }) {
  const [state, setState] = useState<State>({ phase: 'loading' });
  const client = useMemo(() => {
    const pass = typeof window === 'undefined' ? '' : (new URLSearchParams(window.location.search).get('pass') ?? '');
    return createEmbedClient({ passId, pass, origin });
  }, [passId, origin]);
  const pending = useRef(new Map<string, ReturnType<typeof setTimeout>>());
  // The view the viewer sees, for "E-mail this view"; empty means the author's values.
  const [dialValues, setDialValues] = useState<Record<string, number>>({});

  useEffect(() => {
    let live = true;
    client
      .loadWidget()
      .then((payload) => live && setState({ phase: 'ready', payload }))
      .catch((err: unknown) => {
        if (!live) return;
        const e = err instanceof EmbedAccessError ? err : new EmbedAccessError(0, 'This widget cannot be shown. Check the connection and reload the page.');
        setState({ phase: 'refused', title: e.title, body: e.body });
      });
    const timers = pending.current;
    return () => {
      live = false;
      for (const t of timers.values()) clearTimeout(t);
    };
  }, [client]);

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
        client.reportDial(dialId, value).catch((err: unknown) => {
          // A pass revoked while the viewer works: the next call says so, and the widget gives way to the notice.
          if (err instanceof EmbedAccessError && (err.status === 401 || err.status === 403)) setState({ phase: 'refused', title: err.title, body: err.body });
        });
      }, DIAL_SETTLE_MS),
    );
  }, [client]);

  if (state.phase === 'refused') return <EmbedNotice title={state.title} body={state.body} firmName={firmName} />;
  if (state.phase === 'loading') {
    return (
      <div className="rounded-lg border border-ink-200 bg-white px-5 py-4" style={{ borderTopColor: brandColor, borderTopWidth: 3 }} aria-busy="true">
        <p className="text-xs text-ink-600">{firmName}</p>
        <h1 className="text-lg font-semibold text-ink-900">{title}</h1>
        <p role="status" className="mt-2 text-sm text-ink-600">
          Loading the model…
        </p>
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
      onDialChange={onDialChange}
      actions={<SnapshotRequestForm send={client.sendSnapshot} dialValues={dialValues} version={p.versionInfo.number} />}
      headingLevel="h1"
    />
  );
}
