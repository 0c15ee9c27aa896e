import { describe, expect, it } from 'vitest';
import { scaleLinear } from 'd3-scale';
import {
  decimalsForStep,
  formatCount,
  formatDuration,
  formatFixed,
  formatPercent,
  formatPpm,
  formatValue,
  MINUS,
  NBSP,
  percentileName,
  tickLabels,
} from '@/lib/core/charts/format';
import { axisTitle, coveringDomain, linearAxis, percentAxis } from '@/lib/core/charts/axis';

const S = NBSP;

describe('formatFixed', () => {
  it('groups thousands from five digits with a narrow no-break space', () => {
    expect(formatFixed(1234, 0)).toBe('1234');
    expect(formatFixed(12345, 0)).toBe(`12${S}345`);
    expect(formatFixed(1234567.891, 2)).toBe(`1${S}234${S}567.89`);
  });
  it('writes negatives with a true minus sign and never prints −0', () => {
    expect(formatFixed(-0.25, 2)).toBe(`${MINUS}0.25`);
    expect(formatFixed(-0.0001, 2)).toBe('0.00');
    expect(formatFixed(-0, 1)).toBe('0.0');
  });
  it('names non-finite values instead of printing NaN', () => {
    expect(formatFixed(NaN, 2)).toBe('—');
    expect(formatFixed(Infinity, 2)).toBe('∞');
    expect(formatFixed(-Infinity, 2)).toBe(`${MINUS}∞`);
  });
});

describe('decimalsForStep', () => {
  it('keeps the first significant digit of the step', () => {
    expect(decimalsForStep(1)).toBe(0);
    expect(decimalsForStep(5)).toBe(0);
    expect(decimalsForStep(0.5)).toBe(1);
    expect(decimalsForStep(0.02)).toBe(2);
    expect(decimalsForStep(0.001)).toBe(3);
    expect(decimalsForStep(0.0025)).toBe(3);
    expect(decimalsForStep(200)).toBe(0);
  });
});

describe('formatValue', () => {
  it('puts length units after the number', () => {
    expect(formatValue(0.1234, 'mm')).toBe(`0.1234${S}mm`);
    expect(formatValue(12.5, 'mm', { decimals: 2 })).toBe(`12.50${S}mm`);
    expect(formatValue(-0.031, 'mm', { decimals: 3 })).toBe(`${MINUS}0.031${S}mm`);
  });
  it('puts currency symbols before the number and scales large amounts', () => {
    expect(formatValue(12_400_000, 'EUR')).toBe(`€12.40${S}M`);
    expect(formatValue(12_400_000, '€', { decimals: 1 })).toBe(`€12.4${S}M`);
    expect(formatValue(48_000, 'USD', { decimals: 0 })).toBe(`$48${S}k`);
    expect(formatValue(950, 'GBP', { decimals: 0 })).toBe('£950');
    expect(formatValue(-2_500_000, 'EUR', { decimals: 1 })).toBe(`${MINUS}€2.5${S}M`);
    expect(formatValue(3.2e9, 'USD', { decimals: 1 })).toBe(`$3.2${S}bn`);
  });
  it('reads money in thousands or millions ("kEUR") as currency with its factor', () => {
    expect(formatValue(522, 'kEUR', { decimals: 0 })).toBe(`€522${S}k`);
    expect(formatValue(618.774, 'kEUR')).toBe(`€618.8${S}k`);
    expect(formatValue(1204.5, 'k€', { decimals: 2 })).toBe(`€1.20${S}M`);
    expect(formatValue(3.5, 'MUSD', { decimals: 1 })).toBe(`$3.5${S}M`);
    expect(tickLabels([500, 550, 600, 650], 'kEUR')).toEqual([`€500${S}k`, `€550${S}k`, `€600${S}k`, `€650${S}k`]);
    expect(tickLabels([900, 1000, 1100], 'kEUR')).toEqual([`€0.9${S}M`, `€1.0${S}M`, `€1.1${S}M`]);
    expect(formatValue(12, 'kg', { decimals: 0 })).toBe(`12${S}kg`);
  });

  it('leaves unknown currency codes as a suffix unit, uncompacted', () => {
    expect(formatValue(1_250_000, 'CHF', { decimals: 0 })).toBe(`1${S}250${S}000${S}CHF`);
  });
  it('trims trailing zeros of author-typed values on request', () => {
    expect(formatValue(0.08, 'mm', { significant: 6, trim: true })).toBe(`0.08${S}mm`);
    expect(formatValue(13e6, 'EUR', { significant: 6, trim: true })).toBe(`€13${S}M`);
    expect(formatValue(0.08, 'mm')).toBe(`0.08000${S}mm`);
  });
});

describe('percentages, ppm and names', () => {
  it('formats probabilities without rounding 99.97 % up to 100 %', () => {
    expect(formatPercent(0.8)).toBe(`80${S}%`);
    expect(formatPercent(0.0312)).toBe(`3.1${S}%`);
    expect(formatPercent(0.00004)).toBe(`0.004${S}%`);
    expect(formatPercent(0.9997)).toBe(`99.97${S}%`);
    expect(formatPercent(0)).toBe(`0${S}%`);
    expect(formatPercent(1)).toBe(`100${S}%`);
  });
  it('formats ppm with sensible digits', () => {
    expect(formatPpm(0)).toBe(`0${S}ppm`);
    expect(formatPpm(2.7)).toBe(`2.7${S}ppm`);
    expect(formatPpm(0.0573)).toBe(`0.057${S}ppm`);
    // 2699.796 and 45 500.26 ppm outside ±3σ and ±2σ (check-values.md, computed as erfc(k/√2)), shown to the nearest ten.
    expect(formatPpm(2699.796)).toBe(`2700${S}ppm`);
    expect(formatPpm(45500.26)).toBe(`45${S}500${S}ppm`);
  });
  it('names percentiles', () => {
    expect(percentileName(0.8)).toBe('P80');
    expect(percentileName(0.1)).toBe('P10');
    expect(percentileName(0.975)).toBe('P97.5');
    expect(percentileName(0.5)).toBe('P50');
  });
  it('formats counts and durations', () => {
    expect(formatCount(100000)).toBe(`100${S}000`);
    expect(formatDuration(84.4)).toBe(`84${S}ms`);
    expect(formatDuration(1420)).toBe(`1.42${S}s`);
    expect(formatDuration(125_000)).toBe(`2${S}min 05${S}s`);
  });
});

describe('axis ticks with units', () => {
  it('labels money ticks with the symbol and one shared scale', () => {
    const labels = tickLabels([8e6, 9e6, 10e6, 11e6], 'EUR');
    expect(labels).toEqual([`€8${S}M`, `€9${S}M`, `€10${S}M`, `€11${S}M`]);
    expect(tickLabels([8e6, 8.5e6, 9e6], 'EUR')).toEqual([`€8.0${S}M`, `€8.5${S}M`, `€9.0${S}M`]);
  });
  it('gives lengths a common precision from the tick step', () => {
    expect(tickLabels([0.04, 0.06, 0.08], 'mm')).toEqual([`0.04${S}mm`, `0.06${S}mm`, `0.08${S}mm`]);
    expect(tickLabels([0.04, 0.06, 0.08], 'mm', { withUnit: false })).toEqual(['0.04', '0.06', '0.08']);
  });
  it('puts non-money units in the axis title and money units on the ticks', () => {
    const x = scaleLinear().domain([0.03, 0.27]).range([0, 600]);
    const a = linearAxis(x, 8, 'Gap', 'mm');
    expect(a.title).toBe('Gap (mm)');
    expect(a.ticks.every((t) => !t.label.includes('mm'))).toBe(true);
    expect(a.ticks.map((t) => t.label)).toContain('0.10');
    for (const t of a.ticks) expect(t.pos).toBeCloseTo(((t.value - 0.03) / 0.24) * 600, 6);
    const c = linearAxis(scaleLinear().domain([7.9e6, 14.2e6]).range([0, 500]), 6, 'Total cost', 'EUR');
    expect(c.title).toBe('Total cost (EUR)');
    expect(c.ticks.every((t) => t.label.startsWith('€') && t.label.endsWith('M'))).toBe(true);
    expect(axisTitle('Output', '')).toBe('Output');
  });
  it('prints shares as percentages', () => {
    const a = percentAxis(scaleLinear().domain([0, 1]).range([200, 0]), 5, 'Chance of not exceeding');
    expect(a.ticks.map((t) => t.label)).toEqual(['0', '20', '40', '60', '80', '100'].map((v) => `${v}${S}%`));
    expect(a.ticks[0].pos).toBe(200);
    expect(a.ticks[5].pos).toBe(0);
  });
  it('covers every reference value in the x domain', () => {
    const [lo, hi] = coveringDomain([0.1, 0.2, 0.05, 0.31]);
    expect(lo).toBeLessThan(0.05);
    expect(hi).toBeGreaterThan(0.31);
    const [a, b] = coveringDomain([4, 4]);
    expect(a).toBeLessThan(4);
    expect(b).toBeGreaterThan(4);
    expect(coveringDomain([NaN, Infinity])).toEqual([0, 1]);
  });
});
