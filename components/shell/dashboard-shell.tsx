'use client';

import Link from 'next/link';
import { usePathname } from 'next/navigation';
import { useState, type ReactNode } from 'react';
import { LogoMark } from '@/components/ui/logo';
import { cx } from '@/components/ui/cx';
import { SignOutButton } from '@/components/auth/sign-out-button';
import { NavIconSvg, type NavIcon } from './nav-icons';
import { ReviewCount } from './review-count';

export interface NavItem {
  href: string;
  label: string;
  icon: NavIcon;
}

export interface DashboardShellProps {
  firmName: string;
  userName: string;
  userEmail: string;
  roleLabel: string;
  /** Only the items this member's role may use. */
  nav: readonly NavItem[];
  /** A firm-wide notice above every page (e.g. the billing banner); renders nothing when empty. */
  notice?: ReactNode;
  /** A checker sees the count of versions waiting for them in the header. */
  showReviewCount?: boolean;
  children: ReactNode;
}

/**
 * The signed-in frame: a dark ink rail on wide screens, a top bar with a Menu button below 1024 px.
 * The firm name is one element in both layouts.
 */
export function DashboardShell({ firmName, userName, userEmail, roleLabel, nav, notice, showReviewCount, children }: DashboardShellProps) {
  const pathname = usePathname() ?? ''; // null only on a Pages Router page, which this shell never is
  // The small-screen menu remembers the page it was opened on, so it closes by itself after navigating.
  const [openOn, setOpenOn] = useState<string | null>(null);
  const open = openOn === pathname;

  return (
    <div className="min-h-dvh lg:flex">
      <a
        href="#content"
        className="sr-only z-50 rounded-md bg-white px-3 py-2 text-sm font-medium text-accent-800 shadow focus:not-sr-only focus:fixed focus:top-2 focus:left-2"
      >
        Skip to content
      </a>
      <aside className="st-dark bg-ink-900 text-ink-100 lg:fixed lg:inset-y-0 lg:left-0 lg:flex lg:w-60 lg:flex-col">
        <div className="flex min-h-14 flex-wrap items-center gap-x-3 gap-y-2 px-4 py-2">
          <Link href="/app/models" className="flex min-w-0 items-center gap-2.5 rounded-md">
            <LogoMark />
            <span className="min-w-0">
              <span className="block text-[0.6875rem] leading-tight font-medium tracking-wide text-accent-300 uppercase">Stochos</span>
              <span className="block truncate text-sm leading-tight font-semibold text-white lg:line-clamp-2 lg:whitespace-normal">{firmName}</span>
            </span>
          </Link>
          {showReviewCount ? (
            <span className="ml-auto lg:ml-0 lg:basis-full">
              <ReviewCount />
            </span>
          ) : null}
          <button
            type="button"
            aria-expanded={open}
            aria-controls="dashboard-menu"
            onClick={() => setOpenOn(open ? null : pathname)}
            className={cx(showReviewCount ? 'ml-2' : 'ml-auto', 'inline-flex h-9 items-center gap-1.5 rounded-md px-2.5 text-sm font-medium text-ink-100 ring-1 ring-ink-700 hover:bg-ink-800 lg:hidden')}
          >
            <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4" fill="none" stroke="currentColor" strokeWidth="1.5" strokeLinecap="round">
              {open ? <path d="m4 4 8 8M12 4l-8 8" /> : <path d="M2.5 4.5h11M2.5 8h11M2.5 11.5h11" />}
            </svg>
            Menu
          </button>
        </div>
        <div id="dashboard-menu" className={cx('border-t border-ink-800 lg:flex lg:flex-1 lg:flex-col lg:border-t-0', open ? 'block' : 'hidden')}>
          <nav aria-label="Dashboard" className="px-2 py-3 lg:flex-1">
            <ul className="space-y-0.5">
              {nav.map((item) => {
                const active = pathname === item.href || pathname.startsWith(`${item.href}/`);
                return (
                  <li key={item.href}>
                    <Link
                      href={item.href}
                      aria-current={active ? 'page' : undefined}
                      className={cx(
                        'relative flex items-center gap-2.5 rounded-md px-3 py-2 text-sm font-medium',
                        active ? 'bg-ink-800 text-white' : 'text-ink-300 hover:bg-ink-800/60 hover:text-white',
                      )}
                    >
                      {active ? <span aria-hidden="true" className="absolute inset-y-1.5 left-0 w-[3px] rounded-full bg-accent-400" /> : null}
                      <NavIconSvg name={item.icon} />
                      {item.label}
                    </Link>
                  </li>
                );
              })}
            </ul>
          </nav>
          <div className="border-t border-ink-800 px-4 py-3">
            <p className="truncate text-sm font-medium text-white">{userName}</p>
            <p className="truncate text-xs text-ink-300">{userEmail}</p>
            <p className="mt-1.5 flex items-center justify-between gap-2">
              <span className="inline-flex items-center rounded bg-ink-800 px-1.5 py-0.5 text-xs font-medium text-accent-200 ring-1 ring-ink-700">{roleLabel}</span>
              <SignOutButton className="-mr-2 text-ink-200 hover:bg-ink-800 hover:text-white" />
            </p>
          </div>
        </div>
      </aside>
      <main id="content" tabIndex={-1} className="min-w-0 flex-1 lg:pl-60">
        <div className="mx-auto w-full max-w-6xl px-4 py-6 sm:px-6 lg:px-8 lg:py-8">
          {notice ? <div className="mb-6 empty:hidden">{notice}</div> : null}
          {children}
        </div>
      </main>
    </div>
  );
}
