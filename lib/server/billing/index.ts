// What other areas call: the authoring gate for model-editing routes and the state behind banners.
export { assertAuthoringAllowed, authoringBlockedMessage, billingStatus } from './access';
export type { BillingStatus, BillingKind } from '@/lib/core/billing/status';
