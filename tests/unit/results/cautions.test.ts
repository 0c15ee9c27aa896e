import { describe, expect, it } from 'vitest';
import { cautionsFor, lowTrialCaution } from '@/lib/core/cautions';

describe('cautions', () => {
  it('tolerance results name the drawing standards, process data and a qualified review', () => {
    const [own, common] = cautionsFor('linear-stack');
    expect(own.id).toBe('tolerance');
    expect(own.text).toMatch(/ASME Y14\.5/);
    expect(own.text).toMatch(/ISO GPS/);
    expect(own.text).toMatch(/process capability/);
    expect(own.text).toMatch(/safety-critical/);
    expect(common.id).toBe('assumptions');
    expect(common.text).toMatch(/distributions and correlations/);
    expect(common.text).toMatch(/too few trials/);
  });

  it('cost results say decision support, AACE practice, no guarantee and no financial advice', () => {
    const [own] = cautionsFor('cost-range');
    expect(own.id).toBe('cost');
    expect(own.text).toMatch(/decision support/);
    expect(own.text).toMatch(/AACE International/);
    expect(own.text).toMatch(/not a guarantee/);
    expect(own.text).toMatch(/not financial advice/);
  });

  it('formula results carry the general caution', () => {
    expect(cautionsFor('formula').map((c) => c.id)).toEqual(['general', 'assumptions']);
  });

  it('flags a low trial count with the engine’s reason, and only then', () => {
    const ok = { label: 'Gap', trials: 50000, valid: 50000, convergence: { enough: true, verdict: 'Enough trials: …', reasons: ['fine'] } };
    const weak = { label: 'Motor input power', trials: 1000, valid: 1000, convergence: { enough: false, verdict: 'Not enough trials', reasons: ['P95 is known only to ±0.4 kW (95 % interval).'] } };
    expect(lowTrialCaution([ok])).toBeNull();
    const one = lowTrialCaution([weak])!;
    expect(one.id).toBe('low-trials');
    expect(one.text).toBe('Not enough trials: P95 is known only to ±0.4 kW (95 % interval). Treat the percentiles and tail figures as rough, or run the model with more trials.');
    expect(lowTrialCaution([ok, weak])!.text).toMatch(/^Not enough trials for Motor input power: /);
  });
});
