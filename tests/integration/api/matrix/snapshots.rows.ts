import type { MatrixRow } from './types';
import { insertPassRow } from './embed.rows';

// Snapshots: the owner's list is firm-scoped (an outsider sees their own, empty list); the viewer's request
// knows no sessions, so a dashboard cookie opens nothing there (401 without a bearer).
const everyone = (status: number) => ({ anonymous: status, owner: status, author: status, checker: status, outsider: status });

export const rows: MatrixRow[] = [
  {
    method: 'GET',
    route: '/api/snapshots',
    prepare: () => ({ path: '/api/snapshots' }),
    expect: { anonymous: 401, owner: 200, author: 200, checker: 403, outsider: 200 },
  },
  {
    method: 'POST',
    route: '/api/embed/passes/[id]/snapshots',
    prepare: async (c) => ({
      path: `/api/embed/passes/${(await insertPassRow(c.db, c.firmId)).passId}/snapshots`,
      body: { email: 'matrix@client.example', dialValues: { spacer_length: 24.1 } },
    }),
    expect: everyone(401),
    note: 'bearer token only',
  },
];
