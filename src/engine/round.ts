/**
 * Display rounding: half-up (away from zero on a tie) to a number of decimals, on the decimal
 * value the user sees, not on the binary double (so 2.675 → 2.68, not 2.67). Results keep full
 * precision everywhere else; only the task pane, the CLI's tables and filled sheets' shown text
 * use this.
 *
 * Method: the shortest decimal that reads back as the double (JavaScript's own number to string,
 * exact by the language definition) is rounded as a string of digits, so no binary arithmetic
 * touches the digits shown. Checked against decimal.js (ROUND_HALF_UP on the same string) in the
 * tests.
 */

/** The digits and the decimal exponent of a finite number's shortest decimal: |x| = 0.d₁d₂… × 10^exp. */
function decimalDigits(x: number): { negative: boolean; digits: string; exp: number } {
  const negative = x < 0;
  const [mantissa, e] = Math.abs(x).toExponential().split('e');
  const digits = mantissa.replace('.', '').replace(/0+$/, '') || '0';
  return { negative, digits, exp: Number(e) + 1 };
}

/** Rounds a finite number half-up to `decimals` places; gives the rounded digits as text. */
function roundedText(x: number, decimals: number): string {
  const { negative, digits, exp } = decimalDigits(x);
  if (digits === '0') return decimals > 0 ? `0.${'0'.repeat(decimals)}` : '0';
  // Digits kept: those before the decimal point (exp) and `decimals` after it.
  const keep = exp + decimals;
  let kept: string;
  if (keep < 0) kept = '';
  else kept = (digits + '0'.repeat(Math.max(0, keep - digits.length))).slice(0, keep);
  const next = keep >= 0 && keep < digits.length ? digits.charCodeAt(keep) - 48 : 0;
  let intDigits = kept;
  if (next >= 5) {
    // Add one at the last kept place, carrying to the left.
    const a = intDigits.split('').map((c) => c.charCodeAt(0) - 48);
    let i = a.length - 1;
    while (i >= 0 && a[i] === 9) a[i--] = 0;
    if (i >= 0) a[i] += 1;
    else a.unshift(1);
    intDigits = a.join('');
  }
  // intDigits is the rounded value × 10^decimals, as an integer of digits (maybe empty: zero).
  intDigits = intDigits.replace(/^0+(?=\d)/, '');
  if (intDigits === '') intDigits = '0';
  const padded = intDigits.padStart(decimals + 1, '0');
  const whole = padded.slice(0, padded.length - decimals);
  const frac = padded.slice(padded.length - decimals);
  const text = decimals > 0 ? `${whole}.${frac}` : whole;
  // As decimal.js writes it: a negative number keeps its sign when it rounds to zero ("-0.00").
  return negative ? `-${text}` : text;
}

export function roundHalfUp(x: number, decimals: number): number {
  if (!Number.isFinite(x)) return x;
  return Number(roundedText(x, decimals));
}

export function formatFixed(x: number, decimals: number): string {
  if (!Number.isFinite(x)) return String(x);
  return roundedText(x, decimals);
}
