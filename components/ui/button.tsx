import Link from 'next/link';
import type { ComponentProps, ReactNode } from 'react';
import { cx } from './cx';

export type ButtonVariant = 'primary' | 'secondary' | 'ghost' | 'danger';
export type ButtonSize = 'sm' | 'md';

const base =
  'inline-flex items-center justify-center gap-2 rounded-md font-medium whitespace-nowrap transition-colors select-none ' +
  'disabled:opacity-60 aria-disabled:opacity-60';

const variants: Record<ButtonVariant, string> = {
  primary: 'bg-accent-700 text-white shadow-sm hover:bg-accent-800 active:bg-accent-900',
  secondary: 'border border-ink-300 bg-white text-ink-800 shadow-sm hover:border-ink-400 hover:bg-ink-50',
  ghost: 'text-ink-700 hover:bg-ink-100 hover:text-ink-900',
  danger: 'bg-danger-700 text-white shadow-sm hover:bg-danger-600',
};

const sizes: Record<ButtonSize, string> = {
  sm: 'h-8 px-3 text-sm',
  md: 'h-10 px-4 text-[0.9375rem]',
};

export function buttonClasses(variant: ButtonVariant = 'primary', size: ButtonSize = 'md', className?: string): string {
  return cx(base, variants[variant], sizes[size], className);
}

function Spinner() {
  return (
    <svg aria-hidden="true" viewBox="0 0 16 16" className="h-4 w-4 animate-spin motion-reduce:animate-none">
      <circle cx="8" cy="8" r="6" fill="none" stroke="currentColor" strokeOpacity="0.3" strokeWidth="2" />
      <path d="M14 8a6 6 0 0 0-6-6" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" />
    </svg>
  );
}

export interface ButtonProps extends ComponentProps<'button'> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  /** Shows a spinner, disables the button and (optionally) swaps the label, e.g. "Saving…". */
  pending?: boolean;
  pendingLabel?: ReactNode;
}

/** A button; `type` defaults to "button" so only real submit buttons submit forms. */
export function Button({ variant = 'primary', size = 'md', pending = false, pendingLabel, className, children, disabled, type = 'button', ...rest }: ButtonProps) {
  return (
    <button type={type} className={buttonClasses(variant, size, className)} disabled={disabled || pending} aria-busy={pending || undefined} {...rest}>
      {pending ? <Spinner /> : null}
      {pending && pendingLabel ? pendingLabel : children}
    </button>
  );
}

export interface LinkButtonProps extends Omit<ComponentProps<typeof Link>, 'className'> {
  variant?: ButtonVariant;
  size?: ButtonSize;
  className?: string;
}

/** A link that looks like a button (navigation, not an action). */
export function LinkButton({ variant = 'primary', size = 'md', className, ...rest }: LinkButtonProps) {
  return <Link className={buttonClasses(variant, size, className)} {...rest} />;
}
