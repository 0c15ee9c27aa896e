import { cx } from './cx';

// Button looks without React or Next imports, so a plain <a> in a script-free screen can wear them too.
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
