import Link from 'next/link';
import type { ComponentProps, ReactNode } from 'react';
import { buttonClasses, type ButtonSize, type ButtonVariant } from './button-classes';

export { buttonClasses, type ButtonVariant, type ButtonSize } from './button-classes';

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
