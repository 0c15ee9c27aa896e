import type { ReactNode } from 'react';

/** The white panel that holds an auth form, with its page title. */
export function AuthCard({ title, intro, children, footer }: { title: ReactNode; intro?: ReactNode; children: ReactNode; footer?: ReactNode }) {
  return (
    <div className="rounded-xl border border-ink-200 bg-white shadow-[0_1px_2px_rgb(20_28_34/0.06),0_8px_24px_-12px_rgb(20_28_34/0.18)]">
      <div className="px-5 pt-6 pb-6 sm:px-7">
        <h1 className="text-xl font-semibold tracking-tight text-ink-900">{title}</h1>
        {intro ? <div className="mt-1.5 text-sm text-ink-600">{intro}</div> : null}
        <div className="mt-5">{children}</div>
      </div>
      {footer ? <div className="rounded-b-xl border-t border-ink-100 bg-ink-50 px-5 py-3.5 text-sm text-ink-700 sm:px-7">{footer}</div> : null}
    </div>
  );
}
