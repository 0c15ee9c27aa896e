import type { ReactNode } from 'react';
import { cx } from './cx';

export interface CardProps {
  title?: ReactNode;
  description?: ReactNode;
  /** Buttons or links at the right of the title row. */
  actions?: ReactNode;
  /** Heading level of the title (defaults to h2). */
  as?: 'h2' | 'h3';
  className?: string;
  bodyClassName?: string;
  id?: string;
  children?: ReactNode;
}

export function Card({ title, description, actions, as: H = 'h2', className, bodyClassName, id, children }: CardProps) {
  // No aria-labelledby on purpose: named regions would add landmark noise, and the heading already names the card.
  return (
    <section id={id} className={cx('rounded-lg border border-ink-200 bg-white shadow-[0_1px_0_rgb(20_28_34/0.04)]', className)}>
      {title || actions ? (
        <header className="flex flex-wrap items-start justify-between gap-3 border-b border-ink-100 px-4 py-3 sm:px-5">
          <div className="min-w-0">
            {title ? (
              <H className="text-[0.9375rem] font-semibold text-ink-900">
                {title}
              </H>
            ) : null}
            {description ? <p className="mt-0.5 text-sm text-ink-600">{description}</p> : null}
          </div>
          {actions ? <div className="flex flex-wrap items-center gap-2">{actions}</div> : null}
        </header>
      ) : null}
      <div className={cx('px-4 py-4 sm:px-5', bodyClassName)}>{children}</div>
    </section>
  );
}
