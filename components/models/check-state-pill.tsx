import { StatusPill, type StatusKind } from '@/components/ui/badge';
import { CHECK_STATE_LABELS } from '@/lib/core/models/templates';
import type { CheckState } from '@/lib/core/models/types';

const KIND: Record<CheckState, StatusKind> = { unchecked: 'waiting', signed_off: 'ok', sent_back: 'warn' };

/** A version's check state: shape and words, never colour alone. */
export function CheckStatePill({ state, className }: { state: CheckState | null; className?: string }) {
  if (!state) return <StatusPill kind="stopped" className={className}>Not saved yet</StatusPill>;
  return (
    <StatusPill kind={KIND[state]} className={className}>
      {CHECK_STATE_LABELS[state]}
    </StatusPill>
  );
}
