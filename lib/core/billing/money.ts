// Amounts arrive in the currency's minor unit (cents); Intl knows how many decimals each currency has.
export function minorDigits(currency: string): number {
  try {
    return new Intl.NumberFormat('en', { style: 'currency', currency: currency.toUpperCase() }).resolvedOptions().maximumFractionDigits ?? 2;
  } catch {
    return 2;
  }
}

/** "€29.00", "−€12.50": a fixed English locale so e-mails and pages read the same everywhere. */
export function formatMoney(minor: number, currency: string): string {
  const code = currency.toUpperCase();
  const value = minor / 10 ** minorDigits(code);
  try {
    return new Intl.NumberFormat('en-GB', { style: 'currency', currency: code }).format(value).replace('-', '−');
  } catch {
    return `${code} ${value.toFixed(2)}`;
  }
}
