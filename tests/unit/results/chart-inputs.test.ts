import { describe, expect, it } from 'vitest';
import { exampleCostRange, exampleFormula, exampleLinearStack, runModelSync } from '@/lib/core/engine';
import { panelChartInputs } from '@/lib/core/results/chart-inputs';
import { cumulativeSvg, driversSvg, spreadSvg } from '@/lib/core/charts/svg-string';
import { parseXml } from '../charts/xml-check';

const small = <T extends { settings: object }>(m: T): T => ({ ...m, settings: { ...m.settings, trials: 3000 } });

describe('panel chart inputs (shared by the widget and the PDF)', () => {
  it('stack-up: the gap with its two limits, the mean marker, ppm in the hatched regions, contributors by analytic share', () => {
    const r = runModelSync(small(exampleLinearStack));
    const c = panelChartInputs(r);
    expect(c.output.id).toBe('gap');
    expect(c.spread.limits).toEqual({ lower: 0.05, upper: 0.4 });
    expect(c.spread.markers?.[0]).toMatchObject({ kind: 'mean', value: r.outputs[0].mean });
    expect(c.spread.outLabels?.lower).toMatch(/ppm below$/);
    expect(c.cumulative.percentiles?.map((p) => p.p)).toEqual([0.1, 0.5, 0.8, 0.9]);
    expect(c.drivers.drivers.map((d) => d.id)).toEqual(r.stack!.contributors.map((x) => x.id));
    expect(c.drivers.drivers[0].share).toBe(r.stack!.contributors[0].analyticShare);
  });

  it('cost range: budget as the upper limit with its rank, P10/P50/P80/P90 from the engine, the sum of most likely on the curve', () => {
    const r = runModelSync(small(exampleCostRange));
    const c = panelChartInputs(r);
    expect(c.spread.limits).toEqual({ upper: 600, upperLabel: 'Budget' });
    expect(c.cumulative.limitRanks).toBe(true);
    expect(c.cumulative.percentiles).toEqual([
      { p: 0.1, value: r.cost!.p10 },
      { p: 0.5, value: r.cost!.p50 },
      { p: 0.8, value: r.cost!.p80 },
      { p: 0.9, value: r.cost!.p90 },
    ]);
    expect(c.cumulative.markers).toEqual([{ value: 522, label: 'Base = sum of most likely', kind: 'most-likely-sum' }]);
    expect(c.spread.outLabels?.upper).toMatch(/ over budget$/);
    expect(c.titles.cumulative).toBe('S-curve');
  });

  it('formula: the last output, and every panel renders to a well-formed SVG', () => {
    const r = runModelSync(small(exampleFormula));
    const c = panelChartInputs(r);
    expect(c.output.id).toBe('motor_kw');
    expect(c.spread.limits).toEqual({ lower: null, upper: 37 });
    for (const svg of [spreadSvg({ ...c.spread, width: 520 }), cumulativeSvg({ ...c.cumulative, width: 520 }), driversSvg({ ...c.drivers, width: 520 })]) {
      expect(parseXml(svg).name).toBe('svg');
    }
  });
});
