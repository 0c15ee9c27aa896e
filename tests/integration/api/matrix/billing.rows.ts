import type { MatrixRow } from './types';

// Billing is the owner's: authors and checkers get 403, the outsider (owner of another firm) acts on its own firm.
// The matrix firm has no subscription, so seat changes, cancel and resume are refused with 409 for both owners.
const owners = (status: number) => ({ anonymous: 401, owner: status, author: 403, checker: 403, outsider: status });

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/billing', prepare: () => ({ path: '/api/billing' }), expect: owners(200) },
  { method: 'POST', route: '/api/billing/checkout', prepare: () => ({ path: '/api/billing/checkout', body: { seats: 3 } }), expect: owners(201) },
  { method: 'POST', route: '/api/billing/portal', prepare: () => ({ path: '/api/billing/portal', body: {} }), expect: owners(201) },
  { method: 'POST', route: '/api/billing/seats/preview', prepare: () => ({ path: '/api/billing/seats/preview', body: { seats: 4 } }), expect: owners(409), note: 'no subscription yet' },
  { method: 'POST', route: '/api/billing/seats', prepare: () => ({ path: '/api/billing/seats', body: { seats: 4 } }), expect: owners(409), note: 'no subscription yet' },
  { method: 'POST', route: '/api/billing/cancel', prepare: () => ({ path: '/api/billing/cancel', body: {} }), expect: owners(409), note: 'no subscription yet' },
  { method: 'POST', route: '/api/billing/resume', prepare: () => ({ path: '/api/billing/resume', body: {} }), expect: owners(409), note: 'no subscription yet' },
  {
    method: 'POST',
    route: '/api/webhooks/stripe',
    prepare: () => ({ path: '/api/webhooks/stripe', body: { id: 'evt_matrix', type: 'customer.subscription.updated', data: { object: {} } } }),
    expect: { anonymous: 400, owner: 400, author: 400, checker: 400, outsider: 400 },
    note: 'public to Stripe: the signature is the credential, and there is none here',
  },
];
