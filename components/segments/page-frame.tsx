import type { ReactNode } from 'react';
import { Logo } from '@/components/ui/logo';

/** A page outside the dashboard (the root not-found and error screens, the docs): the logo home and one main column.
 * No client code: the root error screen uses it, and that boundary is part of the embed page too. */
export function PageFrame({ children }: { children: ReactNode }) {
  return (
    <div className="st-grid flex min-h-dvh flex-col">
      <header className="px-4 py-4 sm:px-8">
        {/* eslint-disable-next-line @next/next/no-html-link-for-pages -- a plain link keeps this frame free of client code */}
        <a href="/" className="inline-flex rounded-md" aria-label="Stochos home">
          <Logo />
        </a>
      </header>
      <main id="content" className="flex-1 px-4 pt-4 pb-16 sm:pt-10">
        {children}
      </main>
    </div>
  );
}
