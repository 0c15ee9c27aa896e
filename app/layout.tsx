import type { Metadata, Viewport } from 'next';
import { headers } from 'next/headers';
import { plexMono, plexSans } from '@/components/fonts';
import './globals.css';

export const metadata: Metadata = {
  title: { default: 'Stochos: interactive risk models for engineering consultancies', template: '%s · Stochos' },
  description:
    'Author a parametric risk model once, have it checked and signed off, and publish it as an interactive widget in your client’s portal.',
};

export const viewport: Viewport = {
  width: 'device-width',
  initialScale: 1,
  themeColor: '#141c22',
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  // Reading the request makes every page render per request, so each response carries its own script nonce
  // (proxy.ts); a page prerendered at build time could not.
  await headers();
  return (
    <html lang="en" className={`${plexSans.variable} ${plexMono.variable}`}>
      <body className="bg-ink-50 font-sans text-ink-800 antialiased">{children}</body>
    </html>
  );
}
