import type { AppProps } from 'next/app';
import Head from 'next/head';
import { plexMono, plexSans } from '@/components/fonts';
import '@/app/globals.css';
import './embed.css';

// The Pages Router serves only the embed frame (/embed/[passId]); see DEVELOPERS.md, "The embed frame". Its client
// runtime is much lighter than the App Router's, which is why the frame lives here. The fonts' variables go on the
// root element, as the App Router's root layout does, so that anything the widget places under <body> has them.
const fontVars = `:root{--font-sans:${plexSans.style.fontFamily};--font-mono:${plexMono.style.fontFamily}}`;

export default function EmbedFrameApp({ Component, pageProps }: AppProps) {
  return (
    <>
      <Head>
        <meta name="viewport" content="width=device-width, initial-scale=1" />
        <meta name="theme-color" content="#141c22" />
        <link rel="icon" href="/icon.svg" type="image/svg+xml" />
        <meta name="robots" content="noindex, nofollow" />
        <meta name="referrer" content="no-referrer" />
        <title>Stochos widget</title>
        <style>{fontVars}</style>
      </Head>
      <main className="mx-auto w-full max-w-[1100px] p-px">
        <Component {...pageProps} />
      </main>
    </>
  );
}
