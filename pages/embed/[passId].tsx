import type { GetServerSideProps } from 'next';
import { viewerMessage } from '@/lib/server/embed/messages';
import { normaliseOrigin } from '@/lib/core/embed/schemas';
import { decodeFrameVerdict, FRAME_VERDICT_HEADER } from '@/lib/core/embed/frame-verdict';
import { EmbedNotice } from '@/components/embed/embed-notice';
import { EmbedError } from '@/components/embed/embed-error';
import { EmbedApp } from '@/components/embed/embed-app';
import { FrameFit } from '@/components/embed/frame-fit';

// The client viewer's frame: no dashboard chrome, no sign-in code; only the widget. A Pages Router page for its
// lighter client runtime (DEVELOPERS.md, "The embed frame"). Headers (frame-ancestors = the client's allowed
// origins, Referrer-Policy: no-referrer, the policy's script nonce) and the pass check come from proxy.ts. The pass token is not in this
// page's URL: the frame receives it from the loader by postMessage (or, for a direct link, from the fragment, which
// the browser never sends), and exchanges it for a bearer token. pages/_document.tsx writes the inline early start
// (components/embed/early-start.tsx) for a `widget` answer.

type Notice = { title: string; body: string };
export type EmbedPageProps =
  | { view: 'widget'; passId: string; origin: string | null; firmName: string | null; noPass: Notice }
  | { view: 'refused'; notice: Notice; firmName: string | null; origin: string | null }
  | { view: 'error'; reference: string | null };

const one = (v: string | string[] | undefined) => (typeof v === 'string' ? v : null);

export const getServerSideProps: GetServerSideProps<EmbedPageProps> = async ({ query, req, res }) => {
  // The pass check (lib/server/embed/access.ts, server-only) ran in proxy.ts for this very request; the Pages Router
  // may not import server-only modules, so its verdict comes on the request (lib/core/embed/frame-verdict.ts).
  const r = decodeFrameVerdict(req.headers[FRAME_VERDICT_HEADER]);
  if (!r || r.kind === 'error') {
    // No verdict only if proxy.ts did not run, which its matcher rules out: fail closed all the same.
    res.statusCode = 500;
    return { props: { view: 'error', reference: r?.reference ?? null } };
  }
  const claimed = one(query.origin);
  const o = claimed ? normaliseOrigin(claimed) : null;
  const allowed = o?.ok && r.allowedOrigins.includes(o.origin) ? o.origin : null;
  if (r.kind === 'refused') return { props: { view: 'refused', notice: viewerMessage(r.failure, r.firmName), firmName: r.firmName, origin: allowed } };
  // A claimed host that is not the client's: no frame fitting, since nobody allowed is listening.
  if (claimed && !allowed) return { props: { view: 'refused', notice: viewerMessage('origin', r.firmName), firmName: r.firmName, origin: null } };
  return { props: { view: 'widget', passId: r.passId, origin: allowed, firmName: r.firmName, noPass: viewerMessage('missing', null) } };
};

export default function EmbedPage(p: EmbedPageProps) {
  if (p.view === 'error') return <EmbedError reference={p.reference} />;
  if (p.view === 'refused') {
    return (
      <>
        <EmbedNotice {...p.notice} firmName={p.firmName} />
        <FrameFit origin={p.origin} />
      </>
    );
  }
  return (
    <>
      <EmbedApp passId={p.passId} origin={p.origin} firmName={p.firmName} noPass={p.noPass} />
      <FrameFit origin={p.origin} />
    </>
  );
}
