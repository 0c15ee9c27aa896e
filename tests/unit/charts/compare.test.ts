import { describe, expect, it } from 'vitest';
import { runModelSync, exampleLinearStack, exampleCostRange } from '@/lib/core/engine';
import { compareCurvesScene, compareSpreadsScene, COMPARE_STYLES } from '@/lib/core/charts/compare';
import { compareFigures, compareInput } from '@/lib/core/results/compare';
import { headlineFigure } from '@/lib/core/results/headline';
import type { SceneNode } from '@/lib/core/charts/scene';

const flat = (nodes: SceneNode[]): SceneNode[] => nodes.flatMap((n) => (n.type === 'group' ? flat(n.children) : [n]));

describe('two views of one model', () => {
  const current = runModelSync(exampleLinearStack, { dialValues: { spacer_length: 24.2 }, samples: 'none' });
  const pinned = runModelSync(exampleLinearStack, { dialValues: { spacer_length: 24.08 }, samples: 'none' });

  it('tells the series apart by line style and legend text, not colour alone', () => {
    expect(COMPARE_STYLES.current.dash).toBeUndefined();
    expect(COMPARE_STYLES.pinned.dash).toBeTruthy();
    for (const scene of [compareCurvesScene(compareInput(pinned, current, 600)), compareSpreadsScene(compareInput(pinned, current, 600))]) {
      const nodes = flat(scene.nodes);
      const paths = nodes.filter((n) => n.type === 'path' && n.stroke && (n.key?.startsWith('curve-') || n.key?.startsWith('step-')));
      expect(paths.map((p) => (p as { dash?: string }).dash ?? 'solid').sort()).toEqual([COMPARE_STYLES.pinned.dash, 'solid'].sort());
      const texts = nodes.filter((n) => n.type === 'text').map((n) => (n as { text: string }).text);
      expect(texts).toContain('Pinned view (dashed line)');
      expect(texts).toContain('Current view (solid line)');
      expect(scene.description).toMatch(/Current view \(solid line/);
      expect(scene.description).toMatch(/Pinned view \(dashed line/);
    }
  });

  it('prints each figure of both views as the headline does, with the signed difference', () => {
    const rows = compareFigures(pinned, current, 'mean');
    expect(rows[0]!.id).toBe('mean');
    expect(rows.map((r) => r.id).sort()).toEqual(['mean', 'ppk', 'ppm', 'sd']);
    for (const r of rows) {
      expect(r.pinned).toBe(headlineFigure(pinned, r.id).value);
      expect(r.current).toBe(headlineFigure(current, r.id).value);
    }
    // Moving the spacer by +0.12 mm moves the mean gap by about that much (a + or − contributor of the loop).
    const mean = rows[0]!;
    const d = current.stack!.monteCarlo.mean! - pinned.stack!.monteCarlo.mean!;
    expect(Math.abs(Math.abs(d) - 0.12)).toBeLessThan(0.01);
    expect(mean.difference.startsWith(d > 0 ? '+' : '\u2212')).toBe(true);
    // A view compared with itself differs by nothing.
    expect(compareFigures(current, current, 'mean').every((r) => r.difference === '—' || r.difference.startsWith('±'))).toBe(true);
  });

  it('a cost range compares its percentiles and the chance of exceeding the budget in percentage points', () => {
    const a = runModelSync(exampleCostRange, { samples: 'none' });
    const b = runModelSync(exampleCostRange, { dialValues: { budget_dial: 720 }, samples: 'none' });
    const rows = compareFigures(a, b, 'exceed-budget');
    expect(rows[0]!.id).toBe('exceed-budget');
    // A higher budget is exceeded less often.
    expect(rows[0]!.difference).toMatch(/^\u2212.* points$/);
    expect(rows.find((r) => r.id === 'p50')!.difference).toMatch(/^±/);
  });
});
