'use client';

import { useEffect, useState } from 'react';
import { Button, type ButtonSize, type ButtonVariant } from './button';

export interface CopyButtonProps {
  value: string;
  /** Visible label; the accessible name adds `what` when given ("Copy snippet"). */
  label?: string;
  what?: string;
  variant?: ButtonVariant;
  size?: ButtonSize;
  className?: string;
}

async function copyText(text: string): Promise<boolean> {
  try {
    await navigator.clipboard.writeText(text);
    return true;
  } catch {
    // Clipboard API refused (insecure origin, permissions): fall back to a selected textarea.
    const ta = document.createElement('textarea');
    ta.value = text;
    ta.setAttribute('readonly', '');
    ta.style.position = 'fixed';
    ta.style.opacity = '0';
    document.body.appendChild(ta);
    ta.select();
    const ok = document.execCommand('copy');
    ta.remove();
    return ok;
  }
}

export function CopyButton({ value, label = 'Copy', what, variant = 'secondary', size = 'sm', className }: CopyButtonProps) {
  const [state, setState] = useState<'idle' | 'copied' | 'failed'>('idle');

  useEffect(() => {
    if (state === 'idle') return;
    const t = setTimeout(() => setState('idle'), 2000);
    return () => clearTimeout(t);
  }, [state]);

  return (
    <span className="inline-flex items-center gap-2">
      <Button variant={variant} size={size} className={className} onClick={async () => setState((await copyText(value)) ? 'copied' : 'failed')}>
        <svg aria-hidden="true" viewBox="0 0 16 16" className="h-3.5 w-3.5">
          {state === 'copied' ? (
            <path d="m3 8.5 3 3 7-7" fill="none" stroke="currentColor" strokeWidth="1.7" strokeLinecap="round" strokeLinejoin="round" />
          ) : (
            <>
              <rect x="5" y="5" width="9" height="9" rx="1.5" fill="none" stroke="currentColor" strokeWidth="1.4" />
              <path d="M11 3.5V3a1 1 0 0 0-1-1H3a1 1 0 0 0-1 1v7a1 1 0 0 0 1 1h.5" fill="none" stroke="currentColor" strokeWidth="1.4" />
            </>
          )}
        </svg>
        {state === 'copied' ? 'Copied' : label}
        {what ? <span className="sr-only"> {what}</span> : null}
      </Button>
      <span role="status" className="sr-only">
        {state === 'copied' ? 'Copied to the clipboard.' : state === 'failed' ? 'Could not copy. Select the text and copy it by hand.' : ''}
      </span>
      {state === 'failed' ? <span className="text-xs text-danger-700">Copy by hand</span> : null}
    </span>
  );
}
