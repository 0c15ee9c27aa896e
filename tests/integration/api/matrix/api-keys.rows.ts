import type { MatrixRow } from './types';
import { insertApiKey } from '../../../support/db-direct';

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/api-keys', prepare: () => ({ path: '/api/api-keys' }), expect: { anonymous: 401, owner: 200, author: 403, checker: 403, outsider: 200 } },
  { method: 'POST', route: '/api/api-keys', prepare: () => ({ path: '/api/api-keys', body: { name: 'matrix' } }), expect: { anonymous: 401, owner: 201, author: 403, checker: 403, outsider: 201 } },
  {
    method: 'DELETE',
    route: '/api/api-keys/[id]',
    prepare: (c) => ({ path: `/api/api-keys/${insertApiKey(c.db, c.firmId).id}` }),
    expect: { anonymous: 401, owner: 204, author: 403, checker: 403, outsider: 404 },
  },
];
