import type { MatrixRow } from './types';

// The review loop by e-mail: each person's own notification choices, and the checker's count of waiting versions.
export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/me/notifications',
    prepare: () => ({ path: '/api/me/notifications' }),
    expect: { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 },
    note: 'everyone reads only their own choices',
  },
  {
    method: 'PUT',
    route: '/api/me/notifications',
    prepare: () => ({ path: '/api/me/notifications', body: { widget_published: true } }),
    expect: { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 },
    note: 'everyone changes only their own choices',
  },
  {
    method: 'GET',
    route: '/api/reviews/waiting',
    prepare: () => ({ path: '/api/reviews/waiting' }),
    expect: { anonymous: 401, owner: 403, author: 403, checker: 200, outsider: 403 },
    note: 'the outsider is an owner of another firm',
  },
];
