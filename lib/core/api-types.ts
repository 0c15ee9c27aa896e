// What the JSON API answers, declared once: the services and queries that build these bodies return these types,
// and the browser client (lib/client/api.ts, the SWR hooks, the embed page) reads them. Types only: nothing here
// runs, so both sides can import it. Model shapes stay in lib/core/models/types.ts and are referred to from here.
import type { NotificationKind } from '@/lib/core/notifications/kinds';
import type { ModelRecord, VersionRecord, VersionSummary, WidgetRecord } from '@/lib/core/models/types';
import type { DatasetSummary } from '@/lib/core/datasets/summary';
import type { FitResult } from '@/lib/core/datasets/fit';
import type { BillingStatus } from '@/lib/core/billing/status';

// ── Errors ────────────────────────────────────────────────────────────────────────────────────────────────────

export type ErrorCode =
  | 'bad_request'
  | 'unauthorized'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'gone'
  | 'payload_too_large'
  | 'unsupported_media_type'
  | 'validation_failed'
  | 'rate_limited'
  | 'unavailable'
  | 'internal';

/** Messages per field path (`"contributors.0.nominal"`); the root is `"_"`. */
export type FieldErrors = Record<string, string[]>;

/**
 * The error body of every route handler. `retryAfter` (seconds) comes with 429 and is also sent as Retry-After;
 * `id` is the logged id of a 500; `title`, where given, is a heading the message starts with (the embed notice).
 */
export interface ErrorBody {
  error: { code: ErrorCode; message: string; fields?: FieldErrors; retryAfter?: number; id?: string; title?: string };
}

// ── People, team and firm ─────────────────────────────────────────────────────────────────────────────────────

export type Role = 'owner' | 'author' | 'checker';
/** Invitations are for seats: the owner is never invited. */
export type InvitedRole = Exclude<Role, 'owner'>;

/** GET /api/me */
export interface Me {
  user: { id: string; name: string; email: string };
  firm: { id: string; name: string };
  role: Role;
  permissions: string[];
}

export interface TeamMember {
  /** The membership id. */
  id: string;
  userId: string;
  name: string;
  email: string;
  role: Role;
  status: 'active' | 'removed';
  lastActiveAt: string | null;
  joinedAt: string;
}

/** A pending invitation as the team page lists it. */
export interface Invitation {
  id: string;
  email: string;
  role: InvitedRole;
  expiresAt: string;
  createdAt: string;
  invitedByName: string | null;
}

export interface SeatUsage {
  allowed: number;
  used: number;
  pendingInvitations: number;
  reason: string;
}

/** GET /api/team. Seats are authors and checkers; the owner and client viewers are free. */
export interface Team {
  members: TeamMember[];
  invitations: Invitation[];
  seats?: SeatUsage;
}

/** GET /api/invitations/[token]: what the invited person sees before accepting. */
export interface InvitationView {
  firmName: string;
  email: string;
  role: Role;
  expiresAt: string;
  existingAccount: boolean;
}

export type Units = 'mm' | 'in' | 'um';
export type PaperSize = 'A4' | 'Letter';

/** GET and PATCH /api/settings */
export interface FirmSettings {
  name: string;
  unitsDefault: Units;
  currencyDefault: string;
  brandColor: string;
  requireCheck: boolean;
  paperSize: PaperSize;
}

export type NotificationPrefs = Record<NotificationKind, boolean>;

/** One version waiting for the signed-in checker (GET /api/reviews/waiting). */
export interface WaitingVersion {
  modelId: string;
  modelTitle: string;
  number: number;
  authorName: string | null;
  note: string | null;
  createdAt: string;
}

export interface AuditEntry {
  id: number;
  at: string;
  action: string;
  targetType: string | null;
  targetId: string | null;
  detail: Record<string, unknown> | null;
  actorName: string | null;
  actorEmail: string | null;
}

/** GET /api/audit, newest first; `nextBefore` asks for the next (older) page. */
export interface AuditPage {
  entries: AuditEntry[];
  nextBefore: number | null;
}

export interface ApiKey {
  id: string;
  name: string;
  prefix: string;
  createdAt: string;
  createdByName: string | null;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

// ── Models ────────────────────────────────────────────────────────────────────────────────────────────────────

/** GET /api/models/[id] */
export interface ModelDetail {
  model: ModelRecord;
  versions: VersionSummary[];
  latest: VersionRecord | null;
  widget: WidgetRecord | null;
  requireCheck: boolean;
}

// ── Datasets ──────────────────────────────────────────────────────────────────────────────────────────────────

/** One dataset of the firm's library (GET /api/datasets), without its values. */
export interface DatasetRow {
  id: string;
  name: string;
  unit: string;
  columnName: string;
  fileName: string;
  hash: string;
  sizeBytes: number;
  rowCount: number;
  droppedRows: number[];
  uploadedBy: string | null;
  uploadedByName: string | null;
  createdAt: string;
  useCount: number;
}

export interface DatasetRecord extends DatasetRow {
  values: number[];
}

/** GET /api/datasets/[id] */
export interface DatasetDetail {
  dataset: DatasetRecord;
  summary: DatasetSummary;
  fits: FitResult[] | null;
  fitRefused: string | null;
  criticalValueNote: string;
  usedBy: { id: string; title: string }[];
}

/** POST /api/datasets (multipart) answers 201 with the new dataset's id. */
export interface DatasetCreated {
  id: string;
}

/** POST /api/datasets/[id]/uses: the use recorded, with the hash of the data the model copied. */
export interface DatasetUseRecorded {
  id: string;
  hash: string;
}

// ── Branding ──────────────────────────────────────────────────────────────────────────────────────────────────

/** PUT /api/branding/logo (multipart `file`): the logo as stored, re-encoded as PNG. */
export interface LogoSaved {
  hash: string;
  width: number;
  height: number;
  contentType: string;
  url: string;
}

// ── Development mailbox (the local SMTP fake, GET /api/dev/mailbox) ────────────────────────────────────────────

export interface MailboxAttachment {
  index: number;
  filename: string | null;
  contentType: string;
  size: number;
  contentId: string | null;
}

/** One message the local SMTP fake stored; the mailbox lists them as `{ messages }`, newest first. */
export interface MailboxMessage {
  id: string;
  receivedAt: string;
  date: string | null;
  messageId: string | null;
  from: string | null;
  fromName: string | null;
  to: string[];
  cc: string[];
  envelopeTo: string[];
  subject: string;
  text: string;
  html: string | null;
  attachments: MailboxAttachment[];
  size: number;
}

// ── Billing ─────────────────────────────────────────────────────────────────────────────────────────────────

export interface Plan {
  priceId: string;
  name: string;
  unitAmount: number;
  currency: string;
  interval: string;
}

export interface SeatPreview {
  seats: number;
  currentSeats: number;
  currency: string;
  unitAmount: number | null;
  /** Charged now for the rest of the period (0 when seats go down). */
  dueNow: number;
  /** Net of the proration lines; negative is a credit used against later invoices. */
  prorationTotal: number;
  lines: { description: string; amount: number }[];
  periodEnd: string | null;
  /** What each following month costs at the new quantity. */
  nextPeriodAmount: number | null;
  prorationDate: number;
  quote: string;
}

export interface InvoiceView {
  id: string;
  number: string | null;
  status: 'paid' | 'failed' | 'open' | 'void' | 'uncollectible' | 'draft';
  total: number;
  amountPaid: number;
  amountDue: number;
  currency: string;
  seats: number | null;
  periodStart: string | null;
  periodEnd: string | null;
  createdAt: string;
  hostedInvoiceUrl: string | null;
}

export interface BillingSummary {
  firmName: string;
  provider: 'local fake' | 'stripe';
  status: BillingStatus;
  plan: Omit<Plan, 'priceId'> | null;
  seats: { paid: number | null; allowed: number; used: number; pendingInvitations: number };
  subscription: { id: string; status: string; quantity: number; currentPeriodEnd: string | null; cancelAtPeriodEnd: boolean } | null;
  upcoming: { date: string | null; amount: number; currency: string } | null;
  invoices: InvoiceView[];
  /** Set when the payment provider could not be reached for the live parts (price, next invoice). */
  providerError: string | null;
  limits: { min: number; max: number };
}

// ── Snapshots ───────────────────────────────────────────────────────────────────────────────────────────────

export type SnapshotState = 'queued' | 'rendering' | 'sending' | 'sent' | 'failed';

export interface SnapshotListRow {
  id: string;
  createdAt: string;
  clientId: string;
  clientName: string;
  widgetId: string;
  widgetTitle: string;
  recipient: string;
  state: SnapshotState;
  attempts: number;
  lastError: string | null;
  sentAt: string | null;
}
