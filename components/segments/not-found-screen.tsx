import type { ReactNode } from 'react';
import { buttonClasses } from '@/components/ui/button-classes';

export interface NotFoundScreenProps {
  title: string;
  children: ReactNode;
  /** Ways on: the first is the main one. */
  links: { href: string; label: string }[];
}

function Drawing() {
  // An empty histogram frame with a dashed limit line: nothing to show here.
  return (
    <svg aria-hidden="true" viewBox="0 0 64 44" className="h-11 w-16 text-ink-400">
      <path d="M4 38h56" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
      <path d="M4 6v32" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round" />
      <path d="M12 38V30h6v8M22 38V22h6v16M32 38V26h6v12" fill="none" stroke="currentColor" strokeWidth="1.5" strokeDasharray="2.5 2" />
      <path d="M50 4v34" stroke="#1f887b" strokeWidth="1.5" strokeDasharray="3 2" />
    </svg>
  );
}

/** What a route segment shows when the thing asked for is not there, with the ways on. Plain links: no script, so
 * the root one adds nothing to the embed page, which sits under the root segment too. */
export function NotFoundScreen({ title, children, links }: NotFoundScreenProps) {
  return (
    <section aria-labelledby="not-found-title" className="st-grid mx-auto flex max-w-2xl flex-col items-center rounded-lg border border-dashed border-ink-300 bg-white px-5 py-10 text-center sm:py-12">
      <Drawing />
      <p className="mt-3 text-xs font-semibold tracking-wide text-accent-700 uppercase">Not found</p>
      <h1 id="not-found-title" className="mt-1 text-xl font-semibold tracking-tight text-ink-900">
        {title}
      </h1>
      <div className="mt-2 max-w-prose space-y-2 text-[0.9375rem] text-ink-600">{children}</div>
      <div className="mt-6 flex flex-wrap justify-center gap-2">
        {links.map((l, i) => (
          <a key={l.href} href={l.href} className={buttonClasses(i === 0 ? 'primary' : 'secondary')}>
            {l.label}
          </a>
        ))}
      </div>
    </section>
  );
}
