import type { NextPageContext } from 'next';
import { EmbedNotice } from '@/components/embed/embed-notice';
import { EMBED_NOT_FOUND, EmbedError } from '@/components/embed/embed-error';

// The Pages Router holds only the embed frame (the App Router's own screens cover every other address), so its
// error screen is the frame's: the "not here" notice for a 404, the widget's error screen otherwise. A failure in
// the page's server-side checks shows the same screen with the logged reference (pages/embed/[passId].tsx).
function EmbedFrameError({ statusCode }: { statusCode: number }) {
  if (statusCode === 404) return <EmbedNotice {...EMBED_NOT_FOUND} />;
  return <EmbedError reference={null} />;
}

EmbedFrameError.getInitialProps = ({ res, err }: NextPageContext) => ({ statusCode: res?.statusCode ?? err?.statusCode ?? 500 });

export default EmbedFrameError;
