import type { Metadata } from 'next';
import { notFound } from 'next/navigation';
import { ChartGallery } from './gallery';

export const metadata: Metadata = { title: 'Chart gallery', robots: { index: false, follow: false } };
// Read the environment at request time, not at build time.
export const dynamic = 'force-dynamic';

/** Development gallery: each template's results and the client widget for the engine's example models. */
export default async function ChartGalleryPage({ searchParams }: { searchParams: Promise<Record<string, string | string[] | undefined>> }) {
  if (process.env.NODE_ENV === 'production' && !['1', 'true'].includes(process.env.STOCHOS_DEMO ?? '')) notFound();
  const q = await searchParams;
  const one = (k: string) => (typeof q[k] === 'string' ? (q[k] as string) : undefined);
  return <ChartGallery only={one('only')} view={one('view')} />;
}
