import { checkPassFrame } from '@/lib/server/embed/access';
import { viewerMessage } from '@/lib/server/embed/messages';
import { normaliseOrigin } from '@/lib/core/embed/schemas';
import { EmbedNotice } from '@/components/embed/embed-notice';
import { EmbedApp } from '@/components/embed/embed-app';
import { FrameFit } from '@/components/embed/frame-fit';
import { EarlyStartScript } from '@/components/embed/early-start';

// Headers (frame-ancestors = the client's allowed origins, Referrer-Policy: no-referrer) come from proxy.ts.
// The pass token is not in this page's URL: the frame receives it from the loader by postMessage (or, for a
// direct link, from the fragment, which the browser never sends), and exchanges it for a bearer token.
export const dynamic = 'force-dynamic';

type Search = Record<string, string | string[] | undefined>;
const one = (v: string | string[] | undefined) => (typeof v === 'string' ? v : null);

export default async function EmbedPage({ params, searchParams }: { params: Promise<{ passId: string }>; searchParams: Promise<Search> }) {
  const { passId } = await params;
  const sp = await searchParams;
  const claimed = one(sp.origin);
  const r = await checkPassFrame(passId);
  const o = claimed ? normaliseOrigin(claimed) : null;
  const allowed = o?.ok && r.client?.allowedOrigins.includes(o.origin) ? o.origin : null;
  if (!r.ok) {
    return (
      <>
        <EmbedNotice {...viewerMessage(r.failure, r.firmName)} firmName={r.firmName} />
        <FrameFit origin={allowed} />
      </>
    );
  }
  if (claimed && !allowed) return <EmbedNotice {...viewerMessage('origin', r.firmName)} firmName={r.firmName} />;
  return (
    <>
      <EarlyStartScript passId={r.pass.id} origin={allowed} />
      <EmbedApp passId={r.pass.id} origin={allowed} firmName={r.firmName} noPass={viewerMessage('missing', null)} />
      <FrameFit origin={allowed} />
    </>
  );
}
