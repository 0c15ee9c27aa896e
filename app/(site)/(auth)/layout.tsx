import Link from 'next/link';
import { Logo } from '@/components/ui/logo';

/** Sign-in, sign-up and invitation pages: one calm column on a hairline grid. */
export default function AuthLayout({ children }: { children: React.ReactNode }) {
  return (
    <div className="st-grid flex min-h-dvh flex-col">
      <header className="px-4 py-4 sm:px-8">
        <Link href="/" className="inline-flex rounded-md" aria-label="Stochos home">
          <Logo />
        </Link>
      </header>
      <main id="content" className="flex flex-1 items-start justify-center px-4 pt-4 pb-16 sm:pt-10">
        <div className="w-full max-w-md">{children}</div>
      </main>
      <footer className="px-4 pb-6 text-center text-xs text-ink-600 sm:px-8">
        Stochos results support, and never replace, engineering judgement, the applicable standards and licensed sign-off.
      </footer>
    </div>
  );
}
