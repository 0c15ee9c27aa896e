import { checkPass } from '@/lib/embed/access';
import { viewerMessage } from '@/lib/embed/messages';
import { normaliseOrigin } from '@/lib/embed/schemas';
import { EmbedNotice } from '@/components/embed/embed-notice';
import { EmbedApp } from '@/components/embed/embed-app';
import { FrameFit } from '@/components/embed/frame-fit';

// Headers (frame-ancestors = the client's allowed origins, Referrer-Policy: no-referrer) come from proxy.ts.
export const dynamic = 'force-dynamic';

type Search = Record<string, string | string[] | undefined>;
const one = (v: string | string[] | undefined) => (typeof v === 'string' ? v : null);

export default async function EmbedPage({ params, searchParams }: { params: Promise<{ passId: string }>; searchParams: Promise<Search> }) {
  const { passId } = await params;
  const sp = await searchParams;
  const claimed = one(sp.origin);
  const r = await checkPass(passId, one(sp.pass));
  if (!r.ok) {
    const allowed = claimed ? normaliseOrigin(claimed) : null;
    const fitTo = allowed?.ok && r.client?.allowedOrigins.includes(allowed.origin) ? allowed.origin : null;
    return (
      <>
        <EmbedNotice {...viewerMessage(r.failure, r.firmName)} firmName={r.firmName} />
        <FrameFit origin={fitTo} />
      </>
    );
  }
  let origin: string | null = null;
  if (claimed) {
    const o = normaliseOrigin(claimed);
    if (!o.ok || !r.client.allowedOrigins.includes(o.origin)) {
      return <EmbedNotice {...viewerMessage('origin', r.widget.firmName)} firmName={r.widget.firmName} />;
    }
    origin = o.origin;
  }
  return (
    <>
      <EmbedApp passId={r.pass.id} origin={origin} title={r.widget.title} firmName={r.widget.firmName} brandColor={r.widget.brandColor} />
      <FrameFit origin={origin} />
    </>
  );
}
