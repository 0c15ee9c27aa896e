import type { MatrixRow } from './types';

// Operations endpoints: public, they say nothing about any firm.
const everyone = (status: number) => ({ anonymous: status, owner: status, author: status, checker: status, outsider: status });

export const rows: MatrixRow[] = [
  { method: 'GET', route: '/api/ready', prepare: () => ({ path: '/api/ready' }), expect: everyone(200), note: 'readiness for a load balancer: anonymous allowed' },
];
