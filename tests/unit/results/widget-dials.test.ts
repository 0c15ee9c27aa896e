import { describe, expect, it } from 'vitest';
import { atDefaults, dialDisplay, dialText, initialDialValues, parseDialInput, type DialSpec } from '@/lib/core/widget/dial-values';

const spacer: DialSpec = { id: 'spacer_length', label: 'Spacer sleeve length', unit: 'mm', min: 24.05, max: 24.25, step: 0.01, default: 24.15 };
const budget: DialSpec = { id: 'budget', label: 'Budget', unit: 'kEUR', min: 540, max: 12000, step: 5, default: 600 };

describe('typed dial values', () => {
  it('accepts numbers in range, with a decimal point or comma', () => {
    expect(parseDialInput('24.2', spacer)).toEqual({ ok: true, value: 24.2 });
    expect(parseDialInput(' 24,07 ', spacer)).toEqual({ ok: true, value: 24.07 });
    expect(parseDialInput('24.05', spacer)).toEqual({ ok: true, value: 24.05 });
    expect(parseDialInput('10 000', budget)).toEqual({ ok: true, value: 10000 });
  });

  it('refuses text, empty input and values outside the range, saying what to enter', () => {
    expect(parseDialInput('', spacer)).toEqual({ ok: false, message: 'Enter a number from 24.05 to 24.25 mm.' });
    expect(parseDialInput('abc', spacer)).toEqual({ ok: false, message: '“abc” is not a number. Enter a number from 24.05 to 24.25 mm.' });
    expect(parseDialInput('25', spacer)).toEqual({ ok: false, message: '25.00 is outside the range. Enter a number from 24.05 to 24.25 mm.' });
    expect(parseDialInput('=1+1', spacer).ok).toBe(false);
    expect(parseDialInput('Infinity', spacer).ok).toBe(false);
    expect(parseDialInput('1e400', budget).ok).toBe(false);
  });

  it('prints values with the decimals of the step', () => {
    expect(dialText(spacer, 24.1)).toBe('24.10');
    expect(dialDisplay(budget, 12000)).toBe('12\u00a0000');
    expect(dialText(budget, 12000)).toBe('12000');
  });

  it('starts from the author’s values unless valid values are handed in', () => {
    expect(initialDialValues([spacer, budget])).toEqual({ spacer_length: 24.15, budget: 600 });
    expect(initialDialValues([spacer, budget], { spacer_length: 24.2, budget: 99999 })).toEqual({ spacer_length: 24.2, budget: 600 });
    expect(atDefaults([spacer, budget], { spacer_length: 24.15, budget: 600 })).toBe(true);
    expect(atDefaults([spacer, budget], { spacer_length: 24.16, budget: 600 })).toBe(false);
  });
});
