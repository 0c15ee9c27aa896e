import type { MatrixRow } from './types';
import { insertInvitation, insertMember } from '../../../support/db-direct';

const ownerOnly = { anonymous: 401, owner: 200, author: 403, checker: 403, outsider: 404 };

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/me', prepare: () => ({ path: '/api/me' }), expect: { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 } },
  { method: 'GET', route: '/api/team', prepare: () => ({ path: '/api/team' }), expect: { ...ownerOnly, outsider: 200 }, note: 'outsider sees its own team' },
  {
    method: 'POST',
    route: '/api/team/invitations',
    prepare: (_c, p) => ({ path: '/api/team/invitations', body: { email: `matrix-${p}-${Date.now()}@test-firm.example`, role: 'author' } }),
    expect: { anonymous: 401, owner: 201, author: 403, checker: 403, outsider: 201 },
  },
  {
    method: 'DELETE',
    route: '/api/team/invitations/[id]',
    prepare: (c) => ({ path: `/api/team/invitations/${insertInvitation(c.db, c.firmId).id}` }),
    expect: { ...ownerOnly, owner: 204 },
  },
  {
    method: 'PATCH',
    route: '/api/team/members/[id]',
    prepare: (c) => ({ path: `/api/team/members/${insertMember(c.db, c.firmId, 'author', 'active')}`, body: { role: 'checker' } }),
    expect: ownerOnly,
  },
  {
    method: 'DELETE',
    route: '/api/team/members/[id]',
    prepare: (c) => ({ path: `/api/team/members/${insertMember(c.db, c.firmId, 'author', 'active')}` }),
    expect: { ...ownerOnly, owner: 204 },
  },
  {
    method: 'POST',
    route: '/api/team/members/[id]/reactivate',
    prepare: (c) => ({ path: `/api/team/members/${insertMember(c.db, c.firmId, 'owner', 'removed')}/reactivate` }),
    expect: ownerOnly,
    note: 'a removed owner takes no seat, so seat limits do not interfere',
  },
  {
    method: 'GET',
    route: '/api/invitations/[token]',
    prepare: (c) => ({ path: `/api/invitations/${insertInvitation(c.db, c.firmId).token}` }),
    expect: { anonymous: 200, owner: 200, author: 200, checker: 200, outsider: 200 },
    note: 'public: the token is the credential',
  },
  {
    method: 'POST',
    route: '/api/invitations/accept',
    prepare: (c) => ({ path: '/api/invitations/accept', body: { token: insertInvitation(c.db, c.firmId, 'owner').token, name: 'Matrix Person', password: 'correct horse battery' } }),
    expect: { anonymous: 201, owner: 201, author: 201, checker: 201, outsider: 201 },
    note: 'public: creates the invited account whoever is signed in',
  },
  { method: 'GET', route: '/api/settings', prepare: () => ({ path: '/api/settings' }), expect: { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 } },
  { method: 'PATCH', route: '/api/settings', prepare: () => ({ path: '/api/settings', body: { unitsDefault: 'mm' } }), expect: { ...ownerOnly, outsider: 200 } },
  { method: 'GET', route: '/api/audit', prepare: () => ({ path: '/api/audit' }), expect: { anonymous: 401, owner: 200, author: 403, checker: 200, outsider: 200 } },
  { method: 'GET', route: '/api/dev/mailbox', prepare: () => ({ path: '/api/dev/mailbox' }), expect: { anonymous: 200, owner: 200, author: 200, checker: 200, outsider: 200 }, note: 'loopback and the local mail fake only; 404 otherwise' },
  { method: 'GET', route: '/api/dev/mailbox/[id]', prepare: () => ({ path: '/api/dev/mailbox/no-such-message' }), expect: { anonymous: 404, owner: 404, author: 404, checker: 404, outsider: 404 } },
  { method: 'GET', route: '/api/dev/mailbox/[id]/attachments/[index]', prepare: () => ({ path: '/api/dev/mailbox/no-such-message/attachments/0' }), expect: { anonymous: 404, owner: 404, author: 404, checker: 404, outsider: 404 } },
  { method: 'GET', route: '/api/auth/[...nextauth]', prepare: () => ({ path: '/api/auth/session' }), expect: { anonymous: 200, owner: 200, author: 200, checker: 200, outsider: 200 }, note: 'next-auth: session, csrf, providers' },
  { method: 'POST', route: '/api/auth/[...nextauth]', prepare: () => ({ path: '/api/auth/_log', body: {} }), expect: { anonymous: 200, owner: 200, author: 200, checker: 200, outsider: 200 }, note: 'next-auth: sign-in and sign-out are covered by the foundation tests' },
];
