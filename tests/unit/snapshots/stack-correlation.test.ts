import { describe, expect, it } from 'vitest';
import { runModelSync } from '@/lib/core/engine/simulate';
import { snapshotContent } from '@/lib/server/snapshots/content';
import { checked } from '../../support/checked';

const model = checked({
  schema: 'stochos.model/1',
  template: 'linear-stack',
  title: 'Two blocks from one batch',
  unit: 'mm',
  settings: { trials: 2_000, seed: 's' },
  contributors: [
    { id: 'a', name: 'Block A', nominal: 20, plusTol: 0.1, minusTol: 0.1, direction: 1, distribution: { type: 'normal', k: 3 } },
    { id: 'b', name: 'Block B', nominal: 10, plusTol: 0.1, minusTol: 0.1, direction: -1, distribution: { type: 'uniform' } },
  ],
  correlation: { inputs: ['a', 'b'], matrix: [[1, 0.4], [0.4, 1]] },
  limits: { lower: 9.8, upper: 10.2 },
});

describe('snapshot PDF content of a correlated stack', () => {
  it('lists the correlated contributors among the assumptions', () => {
    const c = snapshotContent(model, runModelSync(model), {
      firmName: 'Orrinvale',
      brandColor: '#1f887b',
      paperSize: 'A4',
      widgetTitle: 'Blocks',
      clientName: 'Client',
      requestedAt: '2026-12-03T08:00:00.000Z',
      versionNumber: 1,
      checkState: 'signed_off',
      checkedAt: null,
      checkerName: null,
      authorName: null,
      panels: [],
      headline: 'ppm',
      dialIds: [],
    });
    const t = c.assumptions.find((x) => x.title === 'Correlated contributors');
    expect(t?.rows).toEqual([['Block A', 'Block B', '0.40']]);
  });
});
