import type { ReactNode } from 'react';
import { cx } from './cx';

export type BannerTone = 'info' | 'warn' | 'danger' | 'success';

const tones: Record<BannerTone, string> = {
  info: 'border-accent-200 border-l-accent-700 bg-accent-50 text-ink-800',
  success: 'border-accent-200 border-l-accent-700 bg-white text-ink-800',
  warn: 'border-warn-600/30 border-l-warn-600 bg-warn-50 text-ink-800',
  danger: 'border-danger-600/30 border-l-danger-700 bg-danger-50 text-ink-800',
};

const iconColour: Record<BannerTone, string> = {
  info: 'text-accent-700',
  success: 'text-accent-700',
  warn: 'text-warn-700',
  danger: 'text-danger-700',
};

function Icon({ tone }: { tone: BannerTone }) {
  const cls = cx('mt-0.5 h-4 w-4 flex-none', iconColour[tone]);
  if (tone === 'info')
    return (
      <svg aria-hidden="true" viewBox="0 0 16 16" className={cls}>
        <circle cx="8" cy="8" r="7" fill="currentColor" />
        <path d="M8 7.2v4.2M8 4.6v.2" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
    );
  if (tone === 'success')
    return (
      <svg aria-hidden="true" viewBox="0 0 16 16" className={cls}>
        <circle cx="8" cy="8" r="7" fill="currentColor" />
        <path d="m4.8 8.2 2.2 2.2 4.2-4.6" fill="none" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
      </svg>
    );
  if (tone === 'warn')
    return (
      <svg aria-hidden="true" viewBox="0 0 16 16" className={cls}>
        <path d="M8 1.5 15 14H1L8 1.5Z" fill="currentColor" />
        <path d="M8 6v3.5M8 11.3v.2" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
      </svg>
    );
  return (
    <svg aria-hidden="true" viewBox="0 0 16 16" className={cls}>
      <path d="M5 1h6l4 4v6l-4 4H5l-4-4V5Z" fill="currentColor" />
      <path d="m5.8 5.8 4.4 4.4m0-4.4-4.4 4.4" stroke="#fff" strokeWidth="1.6" strokeLinecap="round" />
    </svg>
  );
}

export interface BannerProps {
  tone?: BannerTone;
  title?: ReactNode;
  /** Buttons or links on the banner (e.g. "Try again"). */
  action?: ReactNode;
  className?: string;
  children?: ReactNode;
}

/** A message across the page. Danger banners are alerts; the others are polite status messages. */
export function Banner({ tone = 'info', title, action, className, children }: BannerProps) {
  return (
    <div role={tone === 'danger' ? 'alert' : 'status'} className={cx('flex gap-2.5 rounded-md border border-l-4 px-3.5 py-3 text-sm', tones[tone], className)}>
      <Icon tone={tone} />
      <div className="min-w-0 flex-1">
        {title ? <p className="font-semibold text-ink-900">{title}</p> : null}
        {children ? <div className={cx(title ? 'mt-0.5' : undefined, 'text-ink-700 [&_a]:font-medium [&_a]:text-accent-800 [&_a]:underline')}>{children}</div> : null}
        {action ? <div className="mt-2 flex flex-wrap gap-2">{action}</div> : null}
      </div>
    </div>
  );
}
