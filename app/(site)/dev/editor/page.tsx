import type { Metadata } from 'next';
import Link from 'next/link';
import { notFound } from 'next/navigation';
import { Logo } from '@/components/ui/logo';
import { PageHeader } from '@/components/ui/page-header';
import { EditorDemo } from '@/components/editor/editor-demo';
import { TEMPLATE_IDS, TEMPLATE_LABELS } from '@/lib/core/models/templates';
import type { TemplateId } from '@/lib/core/models/types';

export const metadata: Metadata = { title: 'Model editor (development)', robots: { index: false, follow: false } };
// Decided per request: the page exists in development and in demo installations only.
export const dynamic = 'force-dynamic';

export default async function DevEditorPage({ searchParams }: { searchParams: Promise<{ t?: string }> }) {
  if (process.env.NODE_ENV === 'production' && !['1', 'true'].includes(process.env.STOCHOS_DEMO ?? '')) notFound();
  const { t } = await searchParams;
  const template: TemplateId = TEMPLATE_IDS.includes(t as TemplateId) ? (t as TemplateId) : 'linear-stack';
  return (
    <div className="min-h-dvh">
      <header className="border-b border-ink-200 bg-white px-4 py-3 sm:px-6">
        <Link href="/" className="inline-flex rounded-md" aria-label="Stochos home">
          <Logo />
        </Link>
      </header>
      <main id="content" className="mx-auto max-w-7xl px-3 py-6 sm:px-6">
        <PageHeader eyebrow="Development" title="Model editor" description="Each template’s example model in the editor. Nothing here is saved." />
        <nav aria-label="Templates" className="mb-4 flex flex-wrap gap-2">
          {TEMPLATE_IDS.map((id) => (
            <Link
              key={id}
              href={`/dev/editor?t=${id}`}
              aria-current={id === template ? 'page' : undefined}
              className={
                id === template
                  ? 'rounded-md bg-accent-700 px-3 py-1.5 text-sm font-medium text-white'
                  : 'rounded-md border border-ink-300 bg-white px-3 py-1.5 text-sm font-medium text-ink-800 hover:bg-ink-50'
              }
            >
              {TEMPLATE_LABELS[id]}
            </Link>
          ))}
        </nav>
        <EditorDemo key={template} template={template} />
      </main>
    </div>
  );
}
