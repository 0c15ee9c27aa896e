'use client';

import { useEffect, useId, useRef, useState, type ReactNode } from 'react';
import { Button, type ButtonSize, type ButtonVariant } from './button';

export interface ConfirmButtonProps {
  /** The first button's label, e.g. "Remove". */
  children: ReactNode;
  /** The question shown in the confirm step, e.g. "Remove Ada from the firm?" */
  prompt: ReactNode;
  /** The confirming button's label, e.g. "Yes, remove". */
  confirmLabel: ReactNode;
  cancelLabel?: ReactNode;
  pendingLabel?: ReactNode;
  /** Runs on confirm; the step stays open (and the button pending) until it settles. Throw to keep it open. */
  onConfirm: () => unknown | Promise<unknown>;
  variant?: ButtonVariant;
  confirmVariant?: ButtonVariant;
  size?: ButtonSize;
  disabled?: boolean;
  /** Accessible name of the first button when its text alone is ambiguous, e.g. "Remove Ada Fenwick". */
  ariaLabel?: string;
  className?: string;
}

/** A destructive action in two steps: the first click asks, the second acts. Escape or Cancel backs out. */
export function ConfirmButton({
  children,
  prompt,
  confirmLabel,
  cancelLabel = 'Cancel',
  pendingLabel,
  onConfirm,
  variant = 'secondary',
  confirmVariant = 'danger',
  size = 'sm',
  disabled,
  ariaLabel,
  className,
}: ConfirmButtonProps) {
  const [asking, setAsking] = useState(false);
  const [pending, setPending] = useState(false);
  const confirmRef = useRef<HTMLButtonElement>(null);
  const triggerRef = useRef<HTMLButtonElement>(null);
  const promptId = useId();
  const wasAsking = useRef(false);

  useEffect(() => {
    if (asking) confirmRef.current?.focus();
    else if (wasAsking.current) triggerRef.current?.focus();
    wasAsking.current = asking;
  }, [asking]);

  async function confirm() {
    setPending(true);
    try {
      await onConfirm();
      setAsking(false);
    } catch {
      // The caller shows the error; the step stays open so the user can retry or cancel.
    } finally {
      setPending(false);
    }
  }

  if (!asking) {
    return (
      <Button ref={triggerRef} variant={variant} size={size} disabled={disabled} aria-label={ariaLabel} className={className} onClick={() => setAsking(true)}>
        {children}
      </Button>
    );
  }
  return (
    <div
      role="group"
      aria-labelledby={promptId}
      className="inline-flex flex-wrap items-center gap-2 rounded-md bg-danger-50 px-2 py-1.5 ring-1 ring-danger-600/30"
      onKeyDown={(e) => {
        if (e.key === 'Escape' && !pending) {
          e.stopPropagation();
          setAsking(false);
        }
      }}
    >
      <span id={promptId} className="text-sm text-ink-800">
        {prompt}
      </span>
      <Button ref={confirmRef} variant={confirmVariant} size={size} pending={pending} pendingLabel={pendingLabel} onClick={confirm}>
        {confirmLabel}
      </Button>
      <Button variant="ghost" size={size} disabled={pending} onClick={() => setAsking(false)}>
        {cancelLabel}
      </Button>
    </div>
  );
}
