// JSON shapes of clients and passes as the API returns them; shared with the dashboard's hooks.
import type { PassStatus } from '@/lib/core/embed/status';

export interface ClientView {
  id: string;
  name: string;
  note: string | null;
  allowedOrigins: string[];
  allowedEmailDomains: string[];
  snapshotAnyAddress: boolean;
  keyVersion: number;
  keyRotatedAt: string;
  createdAt: string;
  updatedAt: string;
  archivedAt: string | null;
}

export interface ClientListView extends ClientView {
  activePasses: number;
  totalPasses: number;
  lastViewAt: string | null;
}

export interface PassView {
  id: string;
  clientId: string;
  clientName: string;
  widgetId: string;
  widgetTitle: string;
  status: PassStatus;
  statusLabel: string;
  createdAt: string;
  createdByName: string | null;
  expiresAt: string;
  renewedAt: string | null;
  revokedAt: string | null;
  lastViewAt: string | null;
  counts: { load: number; dial: number; snapshot: number };
  /** The snippet to paste; null once the pass can never work again (revoked or expired). */
  snippet: string | null;
  /** Older snippets of this pass that still work until their own expiry (after a renewal). */
  olderSnippetsLive: number;
}

export interface PassDetailView extends PassView {
  daily: { day: string; load: number; dial: number; snapshot: number }[];
}
