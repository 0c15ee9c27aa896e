// A pass's state as the dashboard shows it; pure so the list, the detail page and the tests agree.

export type PassStatus = 'active' | 'expiring' | 'expired' | 'revoked' | 'key_rotated' | 'suspended' | 'unpublished';

export const EXPIRING_DAYS = 14;

export interface PassStatusInput {
  expiresAt: string;
  revokedAt: string | null;
  revokeReason: 'revoked' | 'key_rotated' | null;
  clientArchivedAt: string | null;
  widgetUnpublishedAt: string | null;
}

export function passStatus(p: PassStatusInput, now = Date.now()): PassStatus {
  if (p.revokedAt) return p.revokeReason === 'key_rotated' ? 'key_rotated' : 'revoked';
  if (Date.parse(p.expiresAt) <= now) return 'expired';
  if (p.clientArchivedAt) return 'suspended';
  if (p.widgetUnpublishedAt) return 'unpublished';
  if (Date.parse(p.expiresAt) - now <= EXPIRING_DAYS * 86_400_000) return 'expiring';
  return 'active';
}

export const PASS_STATUS_LABEL: Record<PassStatus, string> = {
  active: 'Active',
  expiring: 'Expiring soon',
  expired: 'Expired',
  revoked: 'Revoked',
  key_rotated: 'Revoked (key rotated)',
  suspended: 'Suspended (client archived)',
  unpublished: 'Widget taken down',
};

/** Whether a viewer can open the widget with this pass right now. */
export const passWorks = (s: PassStatus) => s === 'active' || s === 'expiring';
/** Renewing makes sense while the pass has not been revoked. */
export const passRenewable = (s: PassStatus) => s !== 'revoked' && s !== 'key_rotated';
