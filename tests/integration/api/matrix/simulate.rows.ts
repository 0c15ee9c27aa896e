import type { MatrixRow } from './types';
import { exampleLinearStack } from '../../../../lib/core/engine/examples';

export const rows: MatrixRow[] = [
  {
    method: 'POST',
    route: '/api/v1/simulate',
    prepare: () => ({ path: '/api/v1/simulate', body: { model: { ...exampleLinearStack, settings: { ...exampleLinearStack.settings, trials: 2000 } } } }),
    expect: { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 },
    note: 'also open to a firm API key (tests/integration/api/simulate.test.ts)',
  },
  {
    method: 'GET',
    route: '/api/v1/simulate',
    prepare: () => ({ path: '/api/v1/simulate' }),
    expect: { anonymous: 401, owner: 200, author: 200, checker: 200, outsider: 200 },
    note: "the limits and the caller's own firm's runs in progress (tests/integration/api/simulate-limits.test.ts)",
  },
];
