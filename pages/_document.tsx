import Document, { Head, Html, Main, NextScript, type DocumentContext, type DocumentInitialProps } from 'next/document';
import { EarlyStartScript } from '@/components/embed/early-start';
import type { EmbedPageProps } from './embed/[passId]';

// The embed frame's HTML. Every script carries this response's nonce, which proxy.ts put on the request (x-nonce)
// next to the response's Content-Security-Policy. The inline early start goes in the head, so it runs as soon as the
// browser reads it; it is written here (the document never ships to the browser), so its source text is not in the
// page's JavaScript as well.
type Props = DocumentInitialProps & { nonce: string | null };

export default class EmbedDocument extends Document<Props> {
  static async getInitialProps(ctx: DocumentContext): Promise<Props> {
    const initial = await Document.getInitialProps(ctx);
    const nonce = ctx.req?.headers['x-nonce'];
    return { ...initial, nonce: typeof nonce === 'string' && nonce ? nonce : null };
  }

  render() {
    const nonce = this.props.nonce ?? undefined;
    const page = this.props.__NEXT_DATA__.props?.pageProps as EmbedPageProps | undefined;
    return (
      <Html lang="en">
        <Head nonce={nonce}>{page?.view === 'widget' ? <EarlyStartScript passId={page.passId} origin={page.origin} nonce={nonce ?? null} /> : null}</Head>
        <body className="bg-ink-50 font-sans text-ink-800 antialiased">
          <Main />
          <NextScript nonce={nonce} />
        </body>
      </Html>
    );
  }
}
